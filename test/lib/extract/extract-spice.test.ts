/**
 * Outside check: sweeps simulated by SPICE (eecircuit-engine in every run; Debian ngspice as well
 * where installed), seeded noise added afterwards, then extracted. The circuit is written here
 * by hand (C0 across the part, one series R–L–C per mode: the usual SPICE crystal model), so
 * neither the model code (bvd.ts) nor the netlist writer stands between the truth and the
 * simulated data.
 */
import { describe, expect, it } from 'vitest';
import { extractPart } from '../../../src/lib/extract/extract-part.ts';
import { parallelResonanceOf } from '../../../src/lib/extract/closed-form.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import type { Part } from '../../../src/lib/schema/part.ts';
import type { ImpedanceSweep } from '../../../src/lib/sweep/sweep.ts';
import {
  engineImpedance,
  impedanceDeck,
  ngspiceImpedance,
  type AcSweep,
  type ImpedanceRow,
} from '../../support/spice.ts';
import { requireTool } from '../../support/tools.ts';
import { gaussian } from '../../support/rng.ts';

const e = (x: number) => x.toExponential(16);

/**
 * Hand-written circuit: node `in` to ground is the part. Every node has a DC path through the
 * branch elements, so no extra resistor is added (one across C1 would add G/(ωC1)² in series:
 * 2.6 kΩ for a fork with 1e15 Ω).
 */
function circuit(m: BvdModel): string {
  const lines = [`C0 in 0 ${e(m.c0F)}`];
  m.branches.forEach((b, k) => {
    const l = 1 / ((2 * Math.PI * b.fsHz) ** 2 * b.c1F);
    lines.push(`RM${k} in m${k} ${e(b.r1Ohm)}`, `LM${k} m${k} n${k} ${e(l)}`, `CM${k} n${k} 0 ${e(b.c1F)}`);
  });
  return lines.join('\n');
}

function toSweep(rows: ImpedanceRow[], source: string, noiseDb: number, seed: number): ImpedanceSweep {
  const g = gaussian(seed);
  const sigma = 10 ** (noiseDb / 20) / Math.SQRT2;
  const n = rows.length;
  const s: ImpedanceSweep = { freqHz: new Float64Array(n), zRe: new Float64Array(n), zIm: new Float64Array(n), source };
  rows.forEach(([f, r, x], i) => {
    const m = Math.hypot(r, x);
    s.freqHz[i] = f;
    s.zRe[i] = r + sigma * m * g();
    s.zIm[i] = x + sigma * m * g();
  });
  return s;
}

interface SpiceCase {
  name: string;
  model: BvdModel;
  sweeps: Array<[string, AcSweep]>;
  kind: Part['kind'];
}

const FS = 1e8 / (2 * Math.PI);
const CASES: SpiceCase[] = [
  {
    // Two-branch reference part: X1 plus L2 = 40 mH, R2 = 150 Ω, C2 = 2.468878 fF at fs + 100 kHz
    name: 'X1 with its spurious branch',
    model: {
      c0F: 3e-12,
      branches: [
        { fsHz: FS, r1Ohm: 20, c1F: 10e-15 },
        { fsHz: FS + 100e3, r1Ohm: 150, c1F: 2.468878e-15 },
      ],
    },
    sweeps: [
      ['n.s1p', { startHz: FS - 1600, stopHz: FS + 1600, points: 801 }],
      ['w.s1p', { startHz: FS - 50e3, stopHz: FS + 150e3, points: 5001 }],
    ],
    kind: 'quartz-at',
  },
  {
    // Reference tuning fork TF1 (invented), 32.768 kHz
    name: 'TF1',
    model: { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] },
    sweeps: [
      ['n.csv', { startHz: 32764, stopHz: 32772, points: 801 }],
      ['w.csv', { startHz: 32600, stopHz: 32900, points: 3001 }],
    ],
    kind: 'quartz-tuning-fork',
  },
];

function extract(c: SpiceCase, rows: ImpedanceRow[][]) {
  const part: Part = {
    id: 'SPICE-1',
    title: 'spice-simulated part (synthetic)',
    kind: c.kind,
    samples: [{ id: 'A', sweeps: c.sweeps.map(([file]) => ({ file, fixture: 'impedance' })) }],
  };
  const inputs = c.sweeps.map(([file], i) => ({
    sampleId: 'A',
    ref: part.samples[0].sweeps[i],
    file,
    impedance: toSweep(rows[i], file, -70, 40 + i),
  }));
  return extractPart(part, inputs).samples[0];
}

function expectRecovered(c: SpiceCase, s: ReturnType<typeof extract>) {
  // issue 3 tolerances: fs 0.1 ppm, fp 1 ppm, R1 1 %, C1 and L1 0.5 %, C0 1 %
  expect(s.modes).toHaveLength(c.model.branches.length);
  expect(Math.abs(s.c0F / c.model.c0F - 1)).toBeLessThan(0.01);
  c.model.branches.forEach((b, k) => {
    const m = s.modes[k];
    expect(Math.abs(m.fsHz / b.fsHz - 1) * 1e6).toBeLessThan(0.1);
    expect(Math.abs(m.fpHz / parallelResonanceOf(c.model, k)! - 1) * 1e6).toBeLessThan(1);
    expect(Math.abs(m.r1Ohm / b.r1Ohm - 1)).toBeLessThan(0.01);
    expect(Math.abs(m.c1F / b.c1F - 1)).toBeLessThan(0.005);
    expect(Math.abs(m.l1H * (2 * Math.PI * b.fsHz) ** 2 * b.c1F - 1)).toBeLessThan(0.005);
  });
}

describe('extraction of SPICE-simulated sweeps', () => {
  for (const c of CASES) {
    it(`recovers ${c.name} from eecircuit-engine sweeps`, async () => {
      const rows: ImpedanceRow[][] = [];
      for (const [file, sw] of c.sweeps)
        rows.push(await engineImpedance(impedanceDeck(`${c.name} ${file}`, circuit(c.model), sw)));
      expectRecovered(c, extract(c, rows));
    });
  }

  const haveNgspice = requireTool('ngspice');
  for (const c of CASES) {
    it.skipIf(!haveNgspice)(`recovers ${c.name} from Debian ngspice sweeps`, () => {
      const rows = c.sweeps.map(([file, sw]) =>
        ngspiceImpedance(impedanceDeck(`${c.name} ${file}`, circuit(c.model), sw, 'z.out')),
      );
      expectRecovered(c, extract(c, rows));
    });
  }
});
