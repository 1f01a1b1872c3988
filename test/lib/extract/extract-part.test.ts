import { describe, expect, it } from 'vitest';
import { extractPart } from '../../../src/lib/extract/extract-part.ts';
import { parallelResonanceOf } from '../../../src/lib/extract/closed-form.ts';
import type { PartResult, SampleResult } from '../../../src/lib/extract/types.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import type { PartKind } from '../../../src/lib/schema/part.ts';
import { fsOf, linGrid, syntheticPart, type SweepPlan } from './synthetic.ts';

// Invented reference parts (synthetic, IEEE Std 177 model; typical ranges from memory), seeded complex noise.
const FS_X1 = 1e8 / (2 * Math.PI);
const bandwidth = (b: BvdModel['branches'][number]) => 2 * Math.PI * b.fsHz * b.fsHz * b.r1Ohm * b.c1F;

/** Every number in the result is finite (no NaN published). */
function allFinite(x: unknown): boolean {
  if (typeof x === 'number') return Number.isFinite(x);
  if (Array.isArray(x)) return x.every(allFinite);
  if (x && typeof x === 'object') return Object.values(x).every(allFinite);
  return true;
}

/** Check each true branch against the extracted mode at its frequency (issue 3 tolerances). */
function expectRecovered(truth: BvdModel, s: SampleResult, label: string) {
  // fs within 0.1 ppm, fp within 1 ppm, R1 within 1 %, C1 and L1 within 0.5 %, C0 within 1 %
  expect(Math.abs(s.c0F / truth.c0F - 1), `${label} C0`).toBeLessThan(0.01);
  truth.branches.forEach((b, k) => {
    const m = s.modes.find((x) => Math.abs(x.fsHz / b.fsHz - 1) < 1e-4);
    expect(m, `${label} mode ${k}`).toBeDefined();
    if (!m) return;
    const l1 = 1 / ((2 * Math.PI * b.fsHz) ** 2 * b.c1F);
    expect(Math.abs(m.fsHz / b.fsHz - 1) * 1e6, `${label} fs ppm`).toBeLessThan(0.1);
    expect(Math.abs(m.fpHz / parallelResonanceOf(truth, k)! - 1) * 1e6, `${label} fp ppm`).toBeLessThan(1);
    expect(Math.abs(m.r1Ohm / b.r1Ohm - 1), `${label} R1`).toBeLessThan(0.01);
    expect(Math.abs(m.c1F / b.c1F - 1), `${label} C1`).toBeLessThan(0.005);
    expect(Math.abs(m.l1H / l1 - 1), `${label} L1`).toBeLessThan(0.005);
  });
}

interface Case {
  name: string;
  model: BvdModel;
  plans: SweepPlan[];
  noiseDb: number;
  kind?: PartKind;
  datasheet?: { frequencyHz: number; overtone: number };
  /** [overtone, spurious] of the modes in order. */
  modes: Array<[number, boolean]>;
}

function cases(): Case[] {
  const out: Case[] = [];
  {
    // X1, 16 MHz-class AT fundamental; narrow + 10 pF across (load anti-resonance) + wide
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
    const fL = FS_X1 * Math.sqrt(1 + 10e-15 / 13e-12);
    out.push({
      name: 'X1 at −60 dB with a parallel load',
      model,
      noiseDb: -60,
      modes: [[1, false]],
      plans: [
        { file: 'n.s1p', freqHz: linGrid(FS_X1 - 1600, FS_X1 + 1600, 1601) },
        { file: 'cl10.s1p', freqHz: linGrid(fL - 1600, fL + 1600, 1601), addedCF: 10e-12, connection: 'parallel' },
        { file: 'w.s1p', freqHz: linGrid(0.995 * FS_X1, 1.005 * FS_X1, 5001) },
      ],
    });
  }
  {
    // 4 MHz HC-49/U-class fundamental (typical ranges, from memory)
    const c1 = 19.8e-15;
    const fs = fsOf(80e-3, c1);
    const b = { fsHz: fs, r1Ohm: 50, c1F: c1 };
    const bw = bandwidth(b);
    out.push({
      name: '4 MHz fundamental at −70 dB',
      model: { c0F: 5e-12, branches: [b] },
      noiseDb: -70,
      modes: [[1, false]],
      plans: [
        { file: 'n.s1p', freqHz: linGrid(fs - 6 * bw, fs + 6 * bw, 1601) },
        { file: 'w.s1p', freqHz: linGrid(0.996 * fs, 1.004 * fs, 5001) },
      ],
    });
  }
  {
    // 25 MHz 3225-class fundamental with an 8 pF series load (L1 = 1/((2πfs)²C1): 4 fF → 10.1321 mH)
    const fs = fsOf(10.1321e-3, 4e-15);
    const b = { fsHz: fs, r1Ohm: 25, c1F: 4e-15 };
    const bw = bandwidth(b);
    const fL = fs * Math.sqrt(1 + 4e-15 / 10e-12);
    out.push({
      name: '25 MHz fundamental at −80 dB with a series load',
      model: { c0F: 2e-12, branches: [b] },
      noiseDb: -80,
      modes: [[1, false]],
      plans: [
        { file: 'n.s1p', freqHz: linGrid(fs - 6 * bw, fs + 6 * bw, 1601) },
        { file: 'ser8.s1p', freqHz: linGrid(fL - 6 * bw, fL + 6 * bw, 1601), addedCF: 8e-12, connection: 'series' },
        { file: 'w.s1p', freqHz: linGrid(0.997 * fs, 1.003 * fs, 5001) },
      ],
    });
  }
  {
    // TF1, 32.768 kHz tuning fork
    const model: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
    out.push({
      name: 'TF1 tuning fork at −70 dB',
      model,
      noiseDb: -70,
      kind: 'quartz-tuning-fork',
      modes: [[1, false]],
      plans: [
        { file: 'n.csv', freqHz: linGrid(32768 - 4, 32768 + 4, 801) },
        { file: 'w.csv', freqHz: linGrid(32_600, 32_900, 5001) },
      ],
    });
  }
  {
    // Third-overtone part with its fundamental present: 10 MHz plate, n = 3 at 3.0084·f1 (stiffening estimate, from memory)
    const f1 = 10e6;
    const f3 = 3.0084 * f1;
    const b1 = { fsHz: f1, r1Ohm: 10, c1F: 20e-15 };
    const b3 = { fsHz: f3, r1Ohm: 40, c1F: 2.222222e-15 };
    const [bw1, bw3] = [bandwidth(b1), bandwidth(b3)];
    out.push({
      name: 'third-overtone part at −70 dB',
      model: { c0F: 4e-12, branches: [b1, b3] },
      noiseDb: -70,
      datasheet: { frequencyHz: 30.084e6, overtone: 3 },
      modes: [
        [1, false],
        [3, false],
      ],
      plans: [
        { file: 'n1.s1p', freqHz: linGrid(f1 - 6 * bw1, f1 + 6 * bw1, 801) },
        { file: 'w1.s1p', freqHz: linGrid(0.99 * f1, 1.01 * f1, 2001) },
        { file: 'n3.s1p', freqHz: linGrid(f3 - 6 * bw3, f3 + 6 * bw3, 1601) },
        { file: 'w3.s1p', freqHz: linGrid(0.998 * f3, 1.002 * f3, 5001) },
      ],
    });
  }
  {
    // Illustrative ceramic resonator (values from memory): L1 0.385 mH, C1 4.1 pF, C0 20.6 pF, R1 8 Ω
    const fs = fsOf(0.385e-3, 4.1e-12);
    const b = { fsHz: fs, r1Ohm: 8, c1F: 4.1e-12 };
    const bw = bandwidth(b);
    out.push({
      name: 'ceramic resonator at −65 dB',
      model: { c0F: 20.6e-12, branches: [b] },
      noiseDb: -65,
      kind: 'ceramic',
      modes: [[1, false]],
      plans: [
        { file: 'n.s1p', freqHz: linGrid(fs - 6 * bw, fs + 6 * bw, 1601) },
        { file: 'w.s1p', freqHz: linGrid(3.5e6, 4.6e6, 5001) },
      ],
    });
  }
  {
    // Spurious mode: two-branch reference part, L2 40 mH, R2 150 Ω, C2 2.468878 fF at fs + 100 kHz
    const f2 = FS_X1 + 100e3;
    const model: BvdModel = {
      c0F: 3e-12,
      branches: [
        { fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 },
        { fsHz: f2, r1Ohm: 150, c1F: 2.468878e-15 },
      ],
    };
    out.push({
      name: 'X1 with a spurious mode at −70 dB',
      model,
      noiseDb: -70,
      modes: [
        [1, false],
        [1, true],
      ],
      plans: [
        { file: 'n.s1p', freqHz: linGrid(FS_X1 - 1600, FS_X1 + 1600, 1601) },
        { file: 'n2.s1p', freqHz: linGrid(f2 - 3000, f2 + 3000, 1601) },
        { file: 'w.s1p', freqHz: linGrid(FS_X1 - 50e3, FS_X1 + 150e3, 5001) },
      ],
    });
  }
  return out;
}

describe('extractPart recovers seeded synthetic reference parts', () => {
  for (const c of cases()) {
    it(`recovers ${c.name} within the issue tolerances`, () => {
      const { part, inputs } = syntheticPart(c.model, c.plans, {
        noiseDb: c.noiseDb,
        seed: 11,
        kind: c.kind,
        datasheet: c.datasheet,
      });
      const result = extractPart(part, inputs);
      const s = result.samples[0];
      expect(s.modes.map((m) => [m.overtone, m.spurious])).toEqual(c.modes);
      expectRecovered(c.model, s, c.name);
      expect(s.fit.converged).toBe(true);
      expect(s.warnings).toEqual([]);
      expect(allFinite(result)).toBe(true);
      for (const m of s.modes)
        for (const cc of m.crossCheck) expect(cc.verdict, `${cc.quantity} ${cc.message ?? ''}`).not.toBe('disagree');
    });
  }

  it("reports the spurious mode's strength from the resistance ratio", () => {
    // strength 20·log10(Rspur/Rmain) = 20·log10(150/20) = 17.50 dB (derived from the circuit)
    const c = cases().find((x) => x.name.includes('spurious'))!;
    const { part, inputs } = syntheticPart(c.model, c.plans, { noiseDb: c.noiseDb, seed: 3 });
    const spur = extractPart(part, inputs).samples[0].modes[1];
    expect(spur.resistanceRatio).toBeCloseTo(7.5, 2);
    expect(spur.strengthDb).toBeCloseTo(17.501, 2);
  });
});

describe('extractPart reports spurious modes down to 40 dB below the main mode', () => {
  // two-branch reference part with R2 raised: X1 plus a branch of L2 = 40 mH (C2 = 2.468878 fF)
  // at fs + 100 kHz; strength 20·log10(R2/R1) (derived from the circuit); the rule of screen-modes.ts
  function spurious(r2Ohm: number) {
    const f2 = FS_X1 + 100e3;
    const b2 = { fsHz: f2, r1Ohm: r2Ohm, c1F: 2.468878e-15 };
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }, b2] };
    const bw2 = bandwidth(b2);
    const { part, inputs } = syntheticPart(
      model,
      [
        { file: 'n.s1p', freqHz: linGrid(FS_X1 - 1600, FS_X1 + 1600, 1601) },
        { file: 'n2.s1p', freqHz: linGrid(f2 - 6 * bw2, f2 + 6 * bw2, 1601) },
        { file: 'w.s1p', freqHz: linGrid(FS_X1 - 50e3, FS_X1 + 150e3, 5001) },
      ],
      { noiseDb: -80, seed: 5 },
    );
    return { model, s: extractPart(part, inputs).samples[0] };
  }

  it('reports one 39.55 dB down (R2 = 1.9 kΩ)', () => {
    const { s } = spurious(1900);
    expect(s.modes.map((m) => [m.overtone, m.spurious])).toEqual([
      [1, false],
      [1, true],
    ]);
    expect(s.modes[1].strengthDb).toBeCloseTo(20 * Math.log10(1900 / 20), 1);
    expect(s.warnings).toEqual([]);
  });

  it('leaves out one 43.52 dB down (R2 = 3 kΩ) with a note, yet fits the main mode and C0 with it in the model', () => {
    const { model, s } = spurious(3000);
    expect(s.modes.map((m) => [m.overtone, m.spurious])).toEqual([[1, false]]);
    expect(s.diagnostics.map((d) => d.message)).toContain(
      'spurious mode near 16.015494 MHz: not reported, 43.5 dB below the main mode (r1 3.00e+3 Ω against 20.0 Ω; reported down to 40 dB)',
    );
    expect(s.fit.converged).toBe(true);
    expect(s.warnings).toEqual([]);
    expectRecovered({ ...model, branches: [model.branches[0]] }, s, 'X1 beside a weak spurious mode');
  });
});

describe('extractPart uncertainties are honest', () => {
  // Seeded trials: the true value lies within 3 standard uncertainties in ≥ 95 % of trials
  // (for a normal error 99.7 %; issue 3 asks ≥ 95 %).
  const keys = ['fsHz', 'fpHz', 'r1Ohm', 'c1F', 'l1H', 'q', 'c0F'] as const;
  function coverage(
    model: BvdModel,
    plans: (seed: number) => SweepPlan[],
    noiseDb: number,
    trials: number,
    kind?: PartKind,
  ) {
    const b = model.branches[0];
    const truth: Record<(typeof keys)[number], number> = {
      fsHz: b.fsHz,
      fpHz: parallelResonanceOf(model, 0)!,
      r1Ohm: b.r1Ohm,
      c1F: b.c1F,
      l1H: 1 / ((2 * Math.PI * b.fsHz) ** 2 * b.c1F),
      q: 1 / (2 * Math.PI * b.fsHz * b.r1Ohm * b.c1F),
      c0F: model.c0F,
    };
    const inside = Object.fromEntries(keys.map((k) => [k, 0])) as Record<(typeof keys)[number], number>;
    for (let seed = 1; seed <= trials; seed++) {
      const { part, inputs } = syntheticPart(model, plans(seed), { noiseDb, seed: 1000 + seed, kind });
      const s = extractPart(part, inputs).samples[0];
      const m = s.modes[0];
      for (const k of keys) {
        const v = k === 'c0F' ? s.c0F : m[k];
        if (Math.abs(v - truth[k]) <= 3 * m.uncertainty[k]) inside[k]++;
      }
    }
    return inside;
  }

  it('for X1 over 40 trials at −65 dB (narrow, loaded, wide sweeps)', () => {
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
    const fL = FS_X1 * Math.sqrt(1 + 10e-15 / 13e-12);
    const inside = coverage(
      model,
      () => [
        { file: 'n.s1p', freqHz: linGrid(FS_X1 - 1600, FS_X1 + 1600, 401) },
        { file: 'cl.s1p', freqHz: linGrid(fL - 1600, fL + 1600, 401), addedCF: 10e-12 },
        { file: 'w.s1p', freqHz: linGrid(0.997 * FS_X1, 1.003 * FS_X1, 801) },
      ],
      -65,
      40,
    );
    for (const [k, n] of Object.entries(inside)) expect(n, k).toBeGreaterThanOrEqual(38);
  });

  it('for a ceramic resonator over 40 trials at −60 dB', () => {
    const fs = fsOf(0.385e-3, 4.1e-12);
    const model: BvdModel = { c0F: 20.6e-12, branches: [{ fsHz: fs, r1Ohm: 8, c1F: 4.1e-12 }] };
    const bw = bandwidth(model.branches[0]);
    const inside = coverage(
      model,
      () => [
        { file: 'n.s1p', freqHz: linGrid(fs - 6 * bw, fs + 6 * bw, 401) },
        { file: 'w.s1p', freqHz: linGrid(3.6e6, 4.5e6, 1001) },
      ],
      -60,
      40,
      'ceramic',
    );
    for (const [k, n] of Object.entries(inside)) expect(n, k).toBeGreaterThanOrEqual(38);
  });
});

describe('extractPart diagnostics', () => {
  it("flags modes above instrumentMaxFrequency with the extract JSON's instrument-range warning", () => {
    // 40 MHz fundamental and its third overtone at 120.3 MHz; instrument trusted to 100 MHz
    const b1 = { fsHz: 40e6, r1Ohm: 24, c1F: 2.8e-15 };
    const b3 = { fsHz: 120.3e6, r1Ohm: 72, c1F: 0.33e-15 };
    const model: BvdModel = { c0F: 1.3e-12, branches: [b1, b3] };
    const { part, inputs } = syntheticPart(
      model,
      [
        { file: 'a1-narrow.s1p', freqHz: linGrid(40e6 - 4000, 40e6 + 4000, 801) },
        { file: 'a1-wide.csv', freqHz: linGrid(120.2e6, 120.4e6, 4001) },
      ],
      { noiseDb: -70, seed: 5, instrumentMaxHz: 100e6 },
    );
    const s = extractPart(part, inputs).samples[0];
    expect(s.modes.map((m) => [m.overtone, m.flagged === true])).toEqual([
      [1, false],
      [3, true],
    ]);
    expect(s.warnings).toContain(
      'sweep a1-wide.csv: above instrumentMaxFrequency from 100 MHz; modes there are flagged',
    );
  });

  it('gives the clear no-resonance error, no modes and no invented numbers', () => {
    const model: BvdModel = { c0F: 5e-12, branches: [{ fsHz: 4.2e6, r1Ohm: 50, c1F: 20e-15 }] };
    const { part, inputs } = syntheticPart(model, [{ file: 'a1.s1p', freqHz: linGrid(3.97e6, 4.03e6, 801) }], {
      noiseDb: -70,
    });
    const result = extractPart(part, inputs);
    const s = result.samples[0];
    expect(s.modes).toEqual([]);
    expect(s.warnings).toContain(
      'sweep a1.s1p: no resonance: capacitive only between 3.97 and 4.03 MHz; sweep across the expected resonance, and check the fixture and the frequency unit',
    );
    expect(s.diagnostics.filter((d) => d.severity === 'error').map((d) => d.code)).toEqual([
      'no-resonance',
      'no-resonance',
    ]);
    expect(allFinite(result)).toBe(true);
  });

  it('refuses an addedCapacitance larger than the whole shunt capacitance: an error, no C0 and no modes', () => {
    // X1 (invented reference resonator, IEEE Std 177 model) measured alone, the record claiming 10 pF added in
    // parallel: the part alone would have C0 = 3 − 10 = −7 pF (parallel C adds, derived from the circuit)
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
    const { part, inputs } = syntheticPart(
      model,
      [{ file: 'x1.s1p', freqHz: linGrid(0.9995 * FS_X1, 1.0025 * FS_X1, 2001) }],
      { noiseDb: -80, seed: 6 },
    );
    inputs[0].ref.addedCapacitanceF = 10e-12;
    inputs[0].ref.addedConnection = 'parallel';
    const result = extractPart(part, inputs);
    const s = result.samples[0];
    expect(s.modes).toEqual([]);
    expect(s.c0F).toBe(0);
    expect(s.warnings).toContain(
      'C0 of the part alone would be −7.00 pF after removing addedCapacitance 10.0 pF of sweep x1.s1p; check addedCapacitance and addedConnection',
    );
    expect(allFinite(result)).toBe(true);
  });

  it('warns about too few points across the resonance, and widens the fs uncertainty to the step when very few', () => {
    // ≥ 10 points per bandwidth (common practice); X1 bandwidth 318.31 Hz, 80 Hz steps give 4
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
    const run = (points: number) => {
      const { part, inputs } = syntheticPart(
        model,
        [{ file: 'coarse.s1p', freqHz: linGrid(0.997 * FS_X1, 1.003 * FS_X1, points) }],
        { noiseDb: -70, seed: 2 },
      );
      return extractPart(part, inputs).samples[0];
    };
    const four = run(1195); // 80 Hz steps
    expect(
      four.warnings.some((w) =>
        /^mode near 15\.915494 MHz: only 4\.0 points per resonance bandwidth \(318 Hz\)/.test(w),
      ),
    ).toBe(true);
    expect(four.modes[0].uncertainty.fsHz).toBeLessThan(1);
    expect(Math.abs(four.modes[0].fsHz - FS_X1)).toBeLessThan(3 * four.modes[0].uncertainty.fsHz);
    const sparse = run(478); // 200 Hz steps: 1.6 points per bandwidth
    expect(sparse.modes[0].uncertainty.fsHz).toBeGreaterThanOrEqual(200 / Math.sqrt(12));
    expect(Math.abs(sparse.modes[0].fsHz - FS_X1)).toBeLessThan(3 * sparse.modes[0].uncertainty.fsHz);
  });

  it('describes the reference conditions and fits fs against temperature and R1 against drive', () => {
    // Tuning fork, parabola β = −0.034 ppm/°C² (from memory), turnover 25 °C; R1 falling with drive
    const base: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
    const at = (t: number, r1 = 35e3): BvdModel => ({
      c0F: 1.2e-12,
      branches: [{ fsHz: 32768 * (1 - 0.034e-6 * (t - 25) ** 2), r1Ohm: r1, c1F: 3e-15 }],
    });
    const grid = (t: number) => {
      const f = 32768 * (1 - 0.034e-6 * (t - 25) ** 2);
      return linGrid(f - 4, f + 4, 801);
    };
    const plans: SweepPlan[] = [
      { file: 't25.csv', freqHz: grid(25), temperatureC: 25, driveW: 0.05e-6, model: at(25) },
      { file: 'w25.csv', freqHz: linGrid(32_600, 32_900, 3001), temperatureC: 25, driveW: 0.05e-6, model: at(25) },
      ...[-40, -10, 60, 85].map((t) => ({
        file: `t${t}.csv`,
        freqHz: grid(t),
        temperatureC: t,
        driveW: 0.05e-6,
        model: at(t),
      })),
      { file: 'd1.csv', freqHz: grid(25), temperatureC: 25, driveW: 1e-6, model: at(25, 30e3) },
    ];
    const { part, inputs } = syntheticPart(base, plans, {
      noiseDb: -70,
      seed: 8,
      kind: 'quartz-tuning-fork',
      datasheet: { frequencyHz: 32768 },
    });
    const s = extractPart(part, inputs).samples[0];
    expect(s.temperatureC).toBe(25);
    expect(s.driveW).toBe(0.05e-6);
    expect(s.modes[0].r1Ohm / 35e3 - 1).toBeLessThan(0.01);
    expect(s.otherConditions.map((o) => o.sweep)).toEqual(['t-40.csv', 't-10.csv', 't60.csv', 't85.csv', 'd1.csv']);
    const t = s.temperature!;
    expect(t.form).toBe('parabola');
    expect(t.t0C).toBeCloseTo(25, 1);
    expect(t.coeffs[1] * 1e6).toBeCloseTo(-0.034, 3);
    expect(t.spanPpm).toBeCloseTo(143.65, 0); // −143.65 ppm at −40 °C (mpmath)
    expect(s.drive!.resistanceRatio).toBeCloseTo(35 / 30, 2);
    expect(s.warnings).toEqual([]);
  });
});

describe('extractPart output', () => {
  it('keeps every key of the extract JSON and per-sample results per sample', () => {
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
    const { part, inputs } = syntheticPart(
      model,
      [{ file: 'w.s1p', freqHz: linGrid(0.995 * FS_X1, 1.005 * FS_X1, 5001) }],
      { noiseDb: -70 },
    );
    const r: PartResult = extractPart(part, inputs);
    expect(r.part).toBe('SYN-1');
    const s = r.samples[0];
    expect(Object.keys(s)).toEqual(expect.arrayContaining(['sample', 'c0F', 'modes', 'warnings']));
    expect(Object.keys(s.modes[0])).toEqual(
      expect.arrayContaining(['overtone', 'spurious', 'fsHz', 'fpHz', 'r1Ohm', 'l1H', 'c1F', 'q', 'uncertainty']),
    );
    expect(Object.keys(s.modes[0].uncertainty)).toEqual(expect.arrayContaining(['fsHz', 'r1Ohm', 'l1H', 'c1F', 'c0F']));
    // fp of the part alone: fs·√(1 + C1/C0) for a single mode (IEEE Std 177's fp; the `fpHz` of `extract --json`)
    const m = s.modes[0];
    expect(m.fpHz / (m.fsHz * Math.sqrt(1 + m.c1F / s.c0F)) - 1).toBeLessThan(1e-12);
  });
});
