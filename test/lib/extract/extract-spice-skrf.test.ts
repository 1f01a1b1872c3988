/**
 * Outside check, end to end through files: a part's impedance simulated by SPICE (eecircuit-engine
 * in every run; Debian ngspice as well where installed), turned into a reflection (S11, Z0 50 Ω)
 * and a series-through (S11 S21 S12 S22, two 50 Ω ports) record by scikit-rf, with seeded
 * instrument noise, written as Touchstone files by scikit-rf (test/fixtures/spice-skrf/
 * write_touchstone.py), then read by the project's own reader, converted by its fixture code
 * and extracted. Neither the model code (bvd.ts), the netlist writer nor the synthetic
 * generator stands between the truth and the files.
 *
 * Part (invented, a 16 MHz AT-cut-like fundamental; values typical of the kind, common practice):
 * R1 10 Ω, C1 5 fF, C0 2 pF, fs 16 MHz (L1 = 1/((2π·fs)²·C1) ≈ 19.79 mH), plus a spurious branch
 * 0.3 % above fs and 10 dB weaker (R 10·10^(10/20) Ω, C 5 fF/10^(10/20): the same bandwidth).
 *
 * Noise (numpy, in write_touchstone.py): on every recorded S entry an additive circular complex
 * Gaussian floor 70 dB below the source (E|n|² = 1e-7) plus a proportional trace noise of
 * 1e-4 RMS of |S|, seeded.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { extractPart } from '../../../src/lib/extract/extract-part.ts';
import type { ExtractSweepInput } from '../../../src/lib/extract/extract-part.ts';
import type { ModeResult, SampleResult } from '../../../src/lib/extract/types.ts';
import { networkToImpedance } from '../../../src/lib/fixture/to-impedance.ts';
import { parseTouchstone } from '../../../src/lib/io/touchstone.ts';
import type { Fixture, Part } from '../../../src/lib/schema/part.ts';
import {
  engineImpedance,
  impedanceDeck,
  ngspiceImpedance,
  type AcSweep,
  type ImpedanceRow,
} from '../../support/spice.ts';
import { DEBIAN_PYTHON, requireTool } from '../../support/tools.ts';

const WRITER = fileURLToPath(new URL('../../fixtures/spice-skrf/write_touchstone.py', import.meta.url));

/** One series R–L–C branch of the circuit. */
interface Branch {
  r: number;
  l: number;
  c: number;
}

const FS = 16e6;
const C1 = 5e-15;
const R1 = 10;
const C0 = 2e-12;
const SPUR_DB = 10;
const SPUR_FS = FS * 1.003;
const lFor = (fs: number, c: number) => 1 / ((2 * Math.PI * fs) ** 2 * c);

/** The circuit's element values: the truth every check below is measured against. */
const CIRCUIT = {
  c0: C0,
  branches: [
    { r: R1, l: lFor(FS, C1), c: C1 },
    { r: R1 * 10 ** (SPUR_DB / 20), l: lFor(SPUR_FS, C1 / 10 ** (SPUR_DB / 20)), c: C1 / 10 ** (SPUR_DB / 20) },
  ] as Branch[],
};

const e = (x: number) => x.toExponential(16);

/** Hand-written circuit (C0 across the part, one series R–L–C per mode): node `in` to ground is the part. */
function circuitText(): string {
  const lines = [`C0 in 0 ${e(CIRCUIT.c0)}`];
  CIRCUIT.branches.forEach((b, k) =>
    lines.push(`RM${k} in m${k} ${e(b.r)}`, `LM${k} m${k} n${k} ${e(b.l)}`, `CM${k} n${k} 0 ${e(b.c)}`),
  );
  return lines.join('\n');
}

/** Series resonance of a branch, Hz: 1/(2π√(LC)). */
const seriesResonance = (b: Branch) => 1 / (2 * Math.PI * Math.sqrt(b.l * b.c));

/**
 * Lossless parallel resonance of the circuit just above the main branch (all resistances zero):
 * the zero of B(f) = ωC0 + Σ ωCk/(1 − (f/fk)²) between the main and the spurious series
 * resonance, found by bisection on the offset from the main fs (no cancellation near it).
 */
function losslessParallelResonance(): number {
  const [main, spur] = CIRCUIT.branches;
  const f1 = seriesResonance(main);
  const f2 = seriesResonance(spur);
  const b = (d: number) => {
    const f = f1 + d;
    const w = 2 * Math.PI * f;
    let s = w * CIRCUIT.c0;
    for (const br of CIRCUIT.branches) {
      const fk = seriesResonance(br);
      const off = d - (fk - f1); // f − fk
      s += (w * br.c) / (-(off * (f + fk)) / (fk * fk));
    }
    return s;
  };
  let lo = 1e-9 * f1; // just above fs: B → −∞
  let hi = (f2 - f1) * (1 - 1e-9); // just below the spurious fs: B → +∞
  expect(b(lo)).toBeLessThan(0);
  expect(b(hi)).toBeGreaterThan(0);
  for (let i = 0; i < 200 && hi - lo > 1e-9; i++) {
    const mid = (lo + hi) / 2;
    if (b(mid) < 0) lo = mid;
    else hi = mid;
  }
  return f1 + (lo + hi) / 2;
}

const FP = losslessParallelResonance();
const CIRCUIT_SPUR_FS = seriesResonance(CIRCUIT.branches[1]);
const BANDWIDTH = 2 * Math.PI * FS * FS * R1 * C1; // fs/Q ≈ 80 Hz

/** Sweeps: narrow around fs and around fp (±6 bandwidths), and a wide one over both modes. */
const SWEEPS: Array<[string, AcSweep]> = [
  ['fs', { startHz: FS - 6 * BANDWIDTH, stopHz: FS + 6 * BANDWIDTH, points: 401 }],
  ['fa', { startHz: FP - 6 * BANDWIDTH, stopHz: FP + 6 * BANDWIDTH, points: 401 }],
  ['wide', { startHz: FS - 30e3, stopHz: SPUR_FS + 20e3, points: 4001 }],
];

/** Instrument noise added by the writer script (see the module comment). */
const NOISE = { z0Ohm: 50, floorDb: -70, traceNoise: 1e-4 };

const dir = mkdtempSync(join(tmpdir(), 'motional-spice-skrf-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** scikit-rf writes the reflection and series-through records of the simulated sweeps into a fresh folder. */
function writeRecords(tag: string, rows: ImpedanceRow[][], seed: number): string {
  const out = join(dir, tag);
  const input = join(dir, `${tag}.json`);
  const sweeps = SWEEPS.map(([name], i) => ({
    name,
    freqHz: rows[i].map((r) => r[0]),
    zRe: rows[i].map((r) => r[1]),
    zIm: rows[i].map((r) => r[2]),
  }));
  writeFileSync(input, JSON.stringify({ ...NOISE, seed, sweeps }));
  const summary = JSON.parse(
    execFileSync(DEBIAN_PYTHON, [WRITER, input, out], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
      timeout: 120_000,
    }),
  ) as { files: string[]; skrf: string };
  expect(summary.files).toEqual(SWEEPS.flatMap(([name]) => [`${name}-refl.s1p`, `${name}-thru.s2p`]));
  return out;
}

const SAMPLES: Array<{ id: string; fixture: Fixture; suffix: string }> = [
  { id: 'R', fixture: 'reflection', suffix: '-refl.s1p' },
  { id: 'T', fixture: 'series-thru', suffix: '-thru.s2p' },
];

/** Read the files with the project's reader, convert per fixture, extract one sample per record. */
function extractFiles(folder: string): { part: Part; samples: SampleResult[] } {
  const part: Part = {
    id: 'SPICE-SKRF-1',
    title: 'SPICE-simulated invented 16 MHz part, Touchstone by scikit-rf (synthetic)',
    kind: 'quartz-at',
    samples: SAMPLES.map((s) => ({
      id: s.id,
      sweeps: SWEEPS.map(([name]) => ({ file: name + s.suffix, fixture: s.fixture })),
    })),
  };
  const inputs: ExtractSweepInput[] = [];
  part.samples.forEach((sample, si) => {
    sample.sweeps.forEach((ref) => {
      const network = parseTouchstone(readFileSync(join(folder, ref.file), 'utf8'), ref.file);
      expect(network.parameter).toBe('S');
      expect(network.ports).toBe(SAMPLES[si].fixture === 'reflection' ? 1 : 2);
      expect(network.z0Ohm.every((z) => z === 50)).toBe(true);
      inputs.push({
        sampleId: sample.id,
        ref,
        file: ref.file,
        impedance: networkToImpedance(network, ref.fixture, ref.file),
      });
    });
  });
  return { part, samples: extractPart(part, inputs).samples };
}

/** Error against the circuit, in relative terms and in reported standard uncertainties. */
interface Check {
  quantity: string;
  value: number;
  truth: number;
  u: number;
}

function checksOf(s: SampleResult, m: ModeResult): Check[] {
  const main = CIRCUIT.branches[0];
  return [
    { quantity: 'fsHz', value: m.fsHz, truth: seriesResonance(main), u: m.uncertainty.fsHz },
    { quantity: 'r1Ohm', value: m.r1Ohm, truth: main.r, u: m.uncertainty.r1Ohm },
    { quantity: 'c1F', value: m.c1F, truth: main.c, u: m.uncertainty.c1F },
    { quantity: 'l1H', value: m.l1H, truth: main.l, u: m.uncertainty.l1H },
    { quantity: 'c0F', value: s.c0F, truth: CIRCUIT.c0, u: m.uncertainty.c0F },
    { quantity: 'fpHz', value: m.fpHz, truth: FP, u: m.uncertainty.fpHz },
  ];
}

/**
 * Check values: the circuit's own element values (fs = 1/(2π√(L1C1)), R1, C1, L1, C0) and its
 * lossless parallel resonance (solved above); the data come from SPICE (eecircuit-engine or
 * Debian ngspice) and scikit-rf. Accuracy bounds: fs 0.1 ppm, R1 1 %, C1 and L1 0.5 %, C0 1 %
 * (the project's recovery tolerances, as in extract-spice.test.ts); every error within 3
 * reported standard uncertainties, fp only against that (reflection and series-through records
 * hide fa in the noise floor, so fp is inferred from C1/C0).
 */
function expectRecovered(label: string, samples: SampleResult[]): void {
  for (const s of samples) {
    const main = s.modes.filter((m) => !m.spurious);
    expect(main, `${label} sample ${s.sample}: one main mode`).toHaveLength(1);
    const m = main[0];
    const checks = checksOf(s, m);
    const line = checks
      .map(
        (c) =>
          `${c.quantity} err ${((c.value / c.truth - 1) * (c.quantity.endsWith('Hz') ? 1e6 : 100)).toPrecision(3)}${c.quantity.endsWith('Hz') ? ' ppm' : ' %'} z ${((c.value - c.truth) / c.u).toFixed(2)}`,
      )
      .join('; ');
    const spurText = s.modes
      .filter((x) => x.spurious)
      .map(
        (x) =>
          `spurious fs err ${((x.fsHz / CIRCUIT_SPUR_FS - 1) * 1e6).toPrecision(3)} ppm z ${((x.fsHz - CIRCUIT_SPUR_FS) / x.uncertainty.fsHz).toFixed(2)}, R z ${((x.r1Ohm - CIRCUIT.branches[1].r) / x.uncertainty.r1Ohm).toFixed(2)}, ${x.strengthDb?.toFixed(3)} dB`,
      )
      .join(', ');
    console.log(
      `${label} sample ${s.sample} (${s.sample === 'R' ? 'reflection' : 'series-through'}): ${line}; u rel ${checks.map((c) => `${c.quantity} ${(c.u / c.truth).toExponential(2)}`).join(' ')}; ${spurText}`,
    );
    const rel = (q: string) => {
      const c = checks.find((x) => x.quantity === q)!;
      return Math.abs(c.value / c.truth - 1);
    };
    expect(rel('fsHz') * 1e6, `${label} ${s.sample} fs ppm`).toBeLessThan(0.1);
    expect(rel('r1Ohm'), `${label} ${s.sample} R1`).toBeLessThan(0.01);
    expect(rel('c1F'), `${label} ${s.sample} C1`).toBeLessThan(0.005);
    expect(rel('l1H'), `${label} ${s.sample} L1`).toBeLessThan(0.005);
    expect(rel('c0F'), `${label} ${s.sample} C0`).toBeLessThan(0.01);
    for (const c of checks) {
      expect(c.u, `${label} ${s.sample} u(${c.quantity})`).toBeGreaterThan(0);
      expect(Math.abs(c.value - c.truth), `${label} ${s.sample} ${c.quantity}: |error| ≤ 3u`).toBeLessThanOrEqual(
        3 * c.u,
      );
    }
    // The spurious branch of the circuit: found, at its series resonance and with its resistance
    // within 3 reported standard uncertainties, strength 10 dB (20·log10(R2/R1)) within 0.1 dB.
    const spurious = s.modes.filter((x) => x.spurious);
    expect(spurious, `${label} ${s.sample}: one spurious mode`).toHaveLength(1);
    const sp = spurious[0];
    const spur = CIRCUIT.branches[1];
    expect(Math.abs(sp.fsHz - CIRCUIT_SPUR_FS), `${label} ${s.sample} spurious fs`).toBeLessThanOrEqual(
      3 * sp.uncertainty.fsHz,
    );
    expect(Math.abs(sp.r1Ohm - spur.r), `${label} ${s.sample} spurious R`).toBeLessThanOrEqual(
      3 * sp.uncertainty.r1Ohm,
    );
    expect(Math.abs(sp.strengthDb! - SPUR_DB), `${label} ${s.sample} spurious strength`).toBeLessThan(0.1);
  }
}

/**
 * Impedance of the circuit straight from its element values (C0 ∥ Σ series R–L–C), Ω — to check
 * that a simulator's rows are the circuit, independently of the extraction.
 */
function circuitImpedance(f: number): [number, number] {
  const w = 2 * Math.PI * f;
  let yRe = 0;
  let yIm = w * CIRCUIT.c0;
  for (const b of CIRCUIT.branches) {
    const x = w * b.l - 1 / (w * b.c);
    const d = b.r * b.r + x * x;
    yRe += b.r / d;
    yIm -= x / d;
  }
  const d = yRe * yRe + yIm * yIm;
  return [yRe / d, -yIm / d];
}

/** Every simulated row equals the circuit's impedance to `tol` of |Z| (and frequencies are the sweep's). */
function expectRowsAreCircuit(rows: ImpedanceRow[][], tol: number): void {
  rows.forEach((rs, i) => {
    const sw = SWEEPS[i][1];
    expect(rs).toHaveLength(sw.points);
    expect(Math.abs(rs[0][0] / sw.startHz - 1)).toBeLessThan(1e-12);
    expect(Math.abs(rs[rs.length - 1][0] / sw.stopHz - 1)).toBeLessThan(1e-12);
    let worst = 0;
    for (const [f, re, im] of rs) {
      const [r, x] = circuitImpedance(f);
      worst = Math.max(worst, Math.hypot(re - r, im - x) / Math.hypot(r, x));
    }
    expect(worst, `${SWEEPS[i][0]}: largest relative difference from the circuit`).toBeLessThan(tol);
  });
}

let engineRows: Promise<ImpedanceRow[][]> | undefined;
/** eecircuit-engine rows of every sweep, simulated once per run. */
function simulateOnEngine(): Promise<ImpedanceRow[][]> {
  engineRows ??= (async () => {
    const rows: ImpedanceRow[][] = [];
    for (const [name, sw] of SWEEPS)
      rows.push(await engineImpedance(impedanceDeck(`spice-skrf ${name}`, circuitText(), sw)));
    return rows;
  })();
  return engineRows;
}

describe('extraction of SPICE-simulated sweeps written as Touchstone by scikit-rf', () => {
  const haveSkrf = requireTool('scikit-rf');
  const haveNgspice = requireTool('ngspice');

  it('the circuit: main fs 16 MHz, spurious 0.3 % above, fp between them', () => {
    expect(Math.abs(seriesResonance(CIRCUIT.branches[0]) / FS - 1)).toBeLessThan(1e-15);
    // One branch alone: fs·√(1 + C1/C0) ≈ fs + 20 kHz. Below its own resonance the spurious
    // branch acts as C2/(1 − (f/f2)²) ≈ 0.39 pF across the part and pulls fp down to ≈ fs + 16.6 kHz.
    expect(FP).toBeGreaterThan(FS + 16e3);
    expect(FP).toBeLessThan(FS * Math.sqrt(1 + C1 / C0));
  });

  // Runs in every `npm test`, with or without scikit-rf: the simulated rows are the circuit.
  it('eecircuit-engine simulates the circuit (rows equal its impedance to 1e-9)', async () => {
    expectRowsAreCircuit(await simulateOnEngine(), 1e-9);
  });

  it.skipIf(!haveSkrf)(
    'recovers the circuit from eecircuit-engine sweeps, reflection and series-through records',
    async () => {
      expectRecovered('eecircuit-engine', extractFiles(writeRecords('engine', await simulateOnEngine(), 7001)).samples);
    },
  );

  it.skipIf(!haveSkrf || !haveNgspice)(
    'recovers the circuit from Debian ngspice sweeps, reflection and series-through records',
    () => {
      const rows = SWEEPS.map(([name, sw]) =>
        ngspiceImpedance(impedanceDeck(`spice-skrf ${name}`, circuitText(), sw, 'z.out')),
      );
      // wrdata writes 15 significant digits.
      expectRowsAreCircuit(rows, 1e-9);
      expectRecovered('ngspice', extractFiles(writeRecords('ngspice', rows, 7002)).samples);
    },
  );
});
