import { describe, expect, it } from 'vitest';
import { fitBvd, type FitBvdResult, type FitSweep } from '../../../src/lib/extract/fit-bvd.ts';
import { createBvdResiduals, type BvdFitPoints } from '../../../src/lib/extract/residuals.ts';
import { admittanceAt, impedanceAt, inductanceOf, qualityOf, type BvdModel } from '../../../src/lib/models/bvd.ts';
import { gaussian, mulberry32 } from '../../support/rng.ts';

// ---------------------------------------------------------------------------------------------
// Reference resonators. Invented synthetic parts (IEEE Std 177 BVD model) and an illustrative
// ceramic example (values from memory: L1 0.385 mH, C1 4.1 pF, C0 20.6 pF, R1 8 Ω).
// ---------------------------------------------------------------------------------------------
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };
const TF1: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
const OT100: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 100e6, r1Ohm: 60, c1F: 1e-15 }] };
const CERAMIC: BvdModel = {
  c0F: 20.6e-12,
  branches: [{ fsHz: 1 / (2 * Math.PI * Math.sqrt(0.385e-3 * 4.1e-12)), r1Ohm: 8, c1F: 4.1e-12 }],
};
// Two-branch reference part: X1 plus L2 = 40 mH, R2 = 150 Ω, C2 = 2.468878 fF (f2 = fs + 100 kHz).
const TWO_BRANCH: BvdModel = {
  c0F: 3e-12,
  branches: [
    { fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 },
    { fsHz: 1e8 / (2 * Math.PI) + 100e3, r1Ohm: 150, c1F: 2.468878e-15 },
  ],
};

const PARTS: Array<[string, BvdModel]> = [
  ['X1', X1],
  ['TF1', TF1],
  ['OT100', OT100],
  ['ceramic', CERAMIC],
];

/**
 * fs tolerance of the noisy recoveries, relative. 0.1 ppm for the quartz parts (bandwidth fs/Q of
 * 20–40 ppm); the ceramic's bandwidth is 825 ppm (Q ≈ 1211), so at −60 dB its fs standard
 * uncertainty alone is ≈ 0.08 ppm and the bound scales to 0.5 ppm (common practice: bound ≥ 5u).
 */
const FS_TOLERANCE: Record<string, number> = { X1: 0.1e-6, TF1: 0.1e-6, OT100: 0.1e-6, ceramic: 0.5e-6 };

interface SynthOptions {
  noiseDb?: number;
  seed?: number;
  addedCapacitanceF?: number;
  addedConnection?: 'parallel' | 'series';
  source?: string;
}

/** Uniform grid from lo to hi, n points. */
function grid(lo: number, hi: number, n: number): Float64Array {
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = lo + ((hi - lo) * i) / (n - 1);
  return f;
}

/** A span covering fs and fp of branch 0 with margin: max(20 bandwidths, 30 % of fp − fs) each side. */
function spanOf(model: BvdModel, n = 1601): Float64Array {
  const b = model.branches[0];
  const fp = b.fsHz * Math.sqrt(1 + b.c1F / model.c0F);
  const bw = b.fsHz / qualityOf(b);
  const pad = Math.max(20 * bw, 0.3 * (fp - b.fsHz));
  return grid(b.fsHz - pad, fp + pad, n);
}

/**
 * Synthetic measurement: part admittance from bvd.ts, a known capacitor across it or in series,
 * fixture Rs + jωLs in series with everything, then complex Gaussian noise of total relative
 * RMS 10^(noiseDb/20) (each component σ/√2 times |Z|).
 */
function synth(model: BvdModel, freqHz: Float64Array, o: SynthOptions = {}): FitSweep {
  const n = freqHz.length;
  const zRe = new Float64Array(n);
  const zIm = new Float64Array(n);
  const g = o.noiseDb === undefined ? null : gaussian(o.seed ?? 1);
  const sigma = o.noiseDb === undefined ? 0 : 10 ** (o.noiseDb / 20) / Math.SQRT2;
  for (let i = 0; i < n; i++) {
    const f = freqHz[i];
    const w = 2 * Math.PI * f;
    let [yRe, yIm] = admittanceAt(model, f);
    if (o.addedConnection === 'parallel') yIm += w * o.addedCapacitanceF!;
    const d = yRe * yRe + yIm * yIm;
    let r = yRe / d + (model.rsOhm ?? 0);
    let x = -yIm / d + w * (model.lsH ?? 0);
    if (o.addedConnection === 'series') x -= 1 / (w * o.addedCapacitanceF!);
    if (g) {
      const mag = Math.hypot(r, x);
      r += sigma * mag * g();
      x += sigma * mag * g();
    }
    zRe[i] = r;
    zIm[i] = x;
  }
  return {
    freqHz,
    zRe,
    zIm,
    source: o.source ?? 'synthetic.s1p',
    addedCapacitanceF: o.addedCapacitanceF,
    addedConnection: o.addedConnection,
  };
}

/** Model with every branch and C0 scaled: fs by (1 + dfsPpm·1e-6), R1, C1, C0 by factors. */
function perturb(model: BvdModel, dfsPpm: number, kR: number, kC: number, kC0: number): BvdModel {
  return {
    ...model,
    c0F: model.c0F * kC0,
    branches: model.branches.map((b) => ({ fsHz: b.fsHz * (1 + dfsPpm * 1e-6), r1Ohm: b.r1Ohm * kR, c1F: b.c1F * kC })),
  };
}

const rel = (a: number, b: number): number => Math.abs(a / b - 1);

/** Every number anywhere in the value is finite. */
function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allFinite);
  if (value && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
}

// Start values of poor-start recoveries: fs ±20 ppm, C1 ±20 %, R1 ±30 %, C0 ±5 %.
const STARTS: Array<[number, number, number, number]> = [
  [+20, 1.3, 1.2, 1.05],
  [-20, 0.7, 0.8, 0.95],
  [+20, 0.7, 0.8, 1.05],
  [-20, 1.3, 1.2, 0.95],
];

describe('synthetic data generator', () => {
  it('reproduces the mpmath check impedances of X1 and of the two-branch part', () => {
    // check X1 (mpmath): Z(fs) = 19.99928 − j0.119996 Ω; Z(fs + 1 kHz) = 21.59695 + j130.4481 Ω
    const fs = X1.branches[0].fsHz;
    const z0 = synth(X1, Float64Array.of(fs, fs + 1e3));
    expect(z0.zRe[0]).toBeCloseTo(19.99928, 5);
    expect(z0.zIm[0]).toBeCloseTo(-0.119996, 6);
    expect(z0.zRe[1]).toBeCloseTo(21.59695, 5);
    expect(z0.zIm[1]).toBeCloseTo(130.4481, 4);
    // two-branch check (mpmath): Z(f2) = 149.8309 − j4.990588 Ω
    const f2 = TWO_BRANCH.branches[1].fsHz;
    const z2 = synth(TWO_BRANCH, Float64Array.of(f2));
    expect(z2.zRe[0]).toBeCloseTo(149.8309, 4);
    expect(z2.zIm[0]).toBeCloseTo(-4.990588, 5);
  });
});

describe('fitBvd on noiseless sweeps', () => {
  for (const [name, part] of PARTS) {
    it(`recovers ${name} to 1e-9 relative from starts off by ±20 ppm, ±30 % R1, ±20 % C1, ±5 % C0`, () => {
      const sweep = synth(part, spanOf(part));
      for (const [dfs, kR, kC, kC0] of STARTS) {
        const fit = fitBvd([sweep], perturb(part, dfs, kR, kC, kC0));
        expect(fit.converged, `${name} start ${dfs} ppm: ${fit.reason}`).toBe(true);
        const got = fit.model.branches[0];
        const want = part.branches[0];
        expect(rel(got.fsHz, want.fsHz)).toBeLessThan(1e-12);
        expect(rel(got.r1Ohm, want.r1Ohm)).toBeLessThan(1e-9);
        expect(rel(got.c1F, want.c1F)).toBeLessThan(1e-9);
        expect(rel(inductanceOf(got), inductanceOf(want))).toBeLessThan(1e-9);
        expect(rel(fit.model.c0F, part.c0F)).toBeLessThan(1e-9);
        expect(fit.rmsResidual).toBeLessThan(1e-12);
        expect(fit.points).toBe(1601);
      }
    });
  }
});

describe('fitBvd on noisy sweeps', () => {
  for (const [name, part] of PARTS) {
    for (const noiseDb of [-60, -80]) {
      it(`recovers ${name} at ${noiseDb} dB noise within ${FS_TOLERANCE[name] * 1e6} ppm (fs), 1 % (R1, C0), 0.5 % (C1, L1)`, () => {
        const sweep = synth(part, spanOf(part), { noiseDb, seed: 1000 - noiseDb });
        const fit = fitBvd([sweep], perturb(part, 20, 1.3, 0.8, 1.05));
        expect(fit.converged, fit.reason).toBe(true);
        const got = fit.model.branches[0];
        const want = part.branches[0];
        expect(Math.abs(got.fsHz - want.fsHz) / want.fsHz).toBeLessThan(FS_TOLERANCE[name]);
        expect(rel(got.r1Ohm, want.r1Ohm)).toBeLessThan(0.01);
        expect(rel(got.c1F, want.c1F)).toBeLessThan(0.005);
        expect(rel(inductanceOf(got), inductanceOf(want))).toBeLessThan(0.005);
        expect(rel(fit.model.c0F, part.c0F)).toBeLessThan(0.01);
        // The residual RMS estimates the noise level that was put in (common practice).
        expect(fit.rmsResidual / 10 ** (noiseDb / 20)).toBeGreaterThan(0.9);
        expect(fit.rmsResidual / 10 ** (noiseDb / 20)).toBeLessThan(1.1);
      });
    }
  }

  for (const [name, part] of [PARTS[0], PARTS[3]]) {
    it(`gives honest standard uncertainties for ${name}: over 40 seeded trials at −60 dB the error is within 3u in ≥ 95 % for every quantity`, () => {
      const freq = spanOf(part);
      const want = part.branches[0];
      const truth = {
        fsHz: want.fsHz,
        r1Ohm: want.r1Ohm,
        c1F: want.c1F,
        l1H: inductanceOf(want),
        q: qualityOf(want),
        c0F: part.c0F,
      };
      const keys = Object.keys(truth) as Array<keyof typeof truth>;
      const within3 = Object.fromEntries(keys.map((k) => [k, 0])) as Record<keyof typeof truth, number>;
      const z2 = Object.fromEntries(keys.map((k) => [k, 0])) as Record<keyof typeof truth, number>;
      const trials = 40;
      for (let t = 0; t < trials; t++) {
        const fit = fitBvd([synth(part, freq, { noiseDb: -60, seed: 7000 + t })], perturb(part, 5, 1.1, 0.95, 1.02));
        expect(fit.converged, fit.reason).toBe(true);
        const b = fit.model.branches[0];
        const u = fit.uncertainty.branches[0];
        const got = {
          fsHz: b.fsHz,
          r1Ohm: b.r1Ohm,
          c1F: b.c1F,
          l1H: inductanceOf(b),
          q: qualityOf(b),
          c0F: fit.model.c0F,
        };
        const unc = { ...u, c0F: fit.uncertainty.c0F };
        for (const k of keys) {
          expect(unc[k]).toBeGreaterThan(0);
          const z = (got[k] - truth[k]) / unc[k];
          if (Math.abs(z) <= 3) within3[k]++;
          z2[k] += z * z;
        }
      }
      for (const k of keys) {
        expect(within3[k], k).toBeGreaterThanOrEqual(Math.ceil(0.95 * trials));
        // Nor are the uncertainties inflated: the RMS z-score is near 1 (χ² with 40 degrees of
        // freedom: √(χ²/40) lies in 0.7…1.3 with probability > 99 %).
        const rmsZ = Math.sqrt(z2[k] / trials);
        expect(rmsZ, k).toBeGreaterThan(0.7);
        expect(rmsZ, k).toBeLessThan(1.3);
      }
    });
  }
});

describe('fitBvd with two branches', () => {
  const freq = grid(TWO_BRANCH.branches[0].fsHz - 10e3, TWO_BRANCH.branches[1].fsHz + 10e3, 5001);

  it('fits the two-branch reference part with both branches free (noiseless, 1e-9)', () => {
    const start: BvdModel = {
      c0F: 3e-12 * 1.03,
      branches: [
        { fsHz: TWO_BRANCH.branches[0].fsHz * (1 + 10e-6), r1Ohm: 26, c1F: 11e-15 },
        { fsHz: TWO_BRANCH.branches[1].fsHz * (1 - 10e-6), r1Ohm: 120, c1F: 2.2e-15 },
      ],
    };
    const fit = fitBvd([synth(TWO_BRANCH, freq)], start);
    expect(fit.converged, fit.reason).toBe(true);
    for (let k = 0; k < 2; k++) {
      const got = fit.model.branches[k];
      const want = TWO_BRANCH.branches[k];
      expect(rel(got.fsHz, want.fsHz)).toBeLessThan(1e-12);
      expect(rel(got.r1Ohm, want.r1Ohm)).toBeLessThan(1e-9);
      expect(rel(got.c1F, want.c1F)).toBeLessThan(1e-9);
    }
    expect(rel(fit.model.c0F, TWO_BRANCH.c0F)).toBeLessThan(1e-9);
    expect(fit.parameterNames).toEqual([
      'branches[0].fsOffsetPpm',
      'branches[0].lnR1Ohm',
      'branches[0].lnC1F',
      'branches[1].fsOffsetPpm',
      'branches[1].lnR1Ohm',
      'branches[1].lnC1F',
      'lnC0F',
    ]);
  });

  it('fits only the branches named free and keeps the others exactly', () => {
    const start: BvdModel = {
      c0F: 3e-12 * 1.03,
      branches: [TWO_BRANCH.branches[0], { fsHz: TWO_BRANCH.branches[1].fsHz * (1 + 5e-6), r1Ohm: 180, c1F: 2.6e-15 }],
    };
    const fit = fitBvd([synth(TWO_BRANCH, freq, { noiseDb: -70, seed: 5 })], start, { freeBranches: [1] });
    expect(fit.converged, fit.reason).toBe(true);
    expect(fit.model.branches[0]).toEqual(TWO_BRANCH.branches[0]);
    expect(fit.uncertainty.branches[0]).toEqual({ fsHz: 0, r1Ohm: 0, c1F: 0, l1H: 0, q: 0 });
    expect(rel(fit.model.branches[1].r1Ohm, 150)).toBeLessThan(0.01);
    expect(rel(fit.model.branches[1].c1F, 2.468878e-15)).toBeLessThan(0.005);
    expect(fit.uncertainty.branches[1].r1Ohm).toBeGreaterThan(0);
  });
});

describe('joint fit over several sweeps', () => {
  const freq = spanOf(X1);
  const narrow = (o: SynthOptions = {}) => synth(X1, freq, { ...o, source: 'x1-narrow.s1p' });
  // Known capacitors: 10 pF across the part, 12 pF in series (load-capacitance practice).
  const parallel = (o: SynthOptions = {}) =>
    synth(X1, freq, { ...o, addedCapacitanceF: 10e-12, addedConnection: 'parallel', source: 'x1-par10p.s1p' });
  const series = (o: SynthOptions = {}) =>
    synth(X1, grid(X1.branches[0].fsHz - 8e3, X1.branches[0].fsHz + 40e3, 1601), {
      ...o,
      addedCapacitanceF: 12e-12,
      addedConnection: 'series',
      source: 'x1-ser12p.s1p',
    });

  it('explains a plain, a parallel-loaded and a series-loaded sweep with one parameter set (noiseless, 1e-9)', () => {
    const fit = fitBvd([narrow(), parallel(), series()], perturb(X1, -20, 1.3, 1.2, 0.95));
    expect(fit.converged, fit.reason).toBe(true);
    expect(fit.points).toBe(3 * 1601);
    const got = fit.model.branches[0];
    expect(rel(got.fsHz, X1.branches[0].fsHz)).toBeLessThan(1e-12);
    expect(rel(got.r1Ohm, 20)).toBeLessThan(1e-9);
    expect(rel(got.c1F, 10e-15)).toBeLessThan(1e-9);
    expect(rel(fit.model.c0F, 3e-12)).toBeLessThan(1e-9);
  });

  it('removes the added capacitor: a parallel-loaded sweep alone yields the C0 of the part, not C0 + CL', () => {
    const fit = fitBvd([parallel({ noiseDb: -70, seed: 3 })], perturb(X1, 10, 1.2, 0.9, 1.03));
    expect(fit.converged, fit.reason).toBe(true);
    expect(rel(fit.model.c0F, 3e-12)).toBeLessThan(0.01);
    expect(rel(fit.model.branches[0].c1F, 10e-15)).toBeLessThan(0.005);
  });

  it('removes the series capacitor: a series-loaded sweep alone yields the part', () => {
    const fit = fitBvd([series({ noiseDb: -70, seed: 4 })], perturb(X1, 10, 1.2, 0.9, 1.03));
    expect(fit.converged, fit.reason).toBe(true);
    expect(rel(fit.model.c0F, 3e-12)).toBeLessThan(0.01);
    expect(rel(fit.model.branches[0].c1F, 10e-15)).toBeLessThan(0.005);
    expect(Math.abs(fit.model.branches[0].fsHz / X1.branches[0].fsHz - 1)).toBeLessThan(0.1e-6);
  });

  it('is at least as certain about C1 and C0 as the plain sweep alone (noisy, −60 dB)', () => {
    const start = perturb(X1, 5, 1.1, 0.95, 1.02);
    const alone = fitBvd([narrow({ noiseDb: -60, seed: 11 })], start);
    const joint = fitBvd(
      [narrow({ noiseDb: -60, seed: 11 }), parallel({ noiseDb: -60, seed: 12 }), series({ noiseDb: -60, seed: 13 })],
      start,
    );
    expect(alone.converged && joint.converged).toBe(true);
    expect(joint.uncertainty.branches[0].c1F).toBeLessThan(alone.uncertainty.branches[0].c1F);
    expect(joint.uncertainty.c0F).toBeLessThan(alone.uncertainty.c0F);
  });

  it('gives a sweep with weight w the influence of w copies of it', () => {
    const start = perturb(X1, 5, 1.1, 0.95, 1.02);
    const a = narrow({ noiseDb: -60, seed: 21 });
    const b = parallel({ noiseDb: -60, seed: 22 });
    const weighted = fitBvd([a, { ...b, weight: 2 }], start);
    const copied = fitBvd([a, b, b], start);
    expect(weighted.converged && copied.converged).toBe(true);
    expect(rel(weighted.model.branches[0].c1F, copied.model.branches[0].c1F)).toBeLessThan(1e-9);
    expect(rel(weighted.model.c0F, copied.model.c0F)).toBeLessThan(1e-9);
  });
});

describe('fitBvd options', () => {
  it('fits fixture Rs and Ls when asked (check fixture: Rs 0.5 Ω, Ls 5 nH)', () => {
    const truth: BvdModel = { ...X1, rsOhm: 0.5, lsH: 5e-9 };
    const wide = grid(14e6, 18e6, 1601);
    const fit = fitBvd(
      [synth(truth, spanOf(truth)), synth(truth, wide)],
      perturb({ ...X1, rsOhm: 0, lsH: 0 }, 5, 1.1, 0.9, 1.02),
      {
        fitRs: true,
        fitLs: true,
      },
    );
    expect(fit.converged, fit.reason).toBe(true);
    expect(fit.model.rsOhm).toBeCloseTo(0.5, 6);
    expect(fit.model.lsH! / 5e-9).toBeCloseTo(1, 6);
    expect(rel(fit.model.branches[0].r1Ohm, 20)).toBeLessThan(1e-6);
    expect(fit.uncertainty.rsOhm).toBeDefined();
    expect(fit.uncertainty.lsH).toBeDefined();
    expect(fit.parameterNames?.slice(-2)).toEqual(['rsOhm', 'lsNh']);
  });

  it('keeps Rs, Ls and Cp of the start model fixed by default and accounts for them', () => {
    const truth: BvdModel = { ...X1, rsOhm: 0.5, lsH: 5e-9, cpF: 0.4e-12 };
    const fit = fitBvd([synth(truth, spanOf(truth))], perturb(truth, 5, 1.1, 0.9, 1.02));
    expect(fit.converged, fit.reason).toBe(true);
    expect(fit.model.rsOhm).toBe(0.5);
    expect(fit.model.lsH).toBe(5e-9);
    expect(fit.model.cpF).toBe(0.4e-12);
    expect(rel(fit.model.c0F, 3e-12)).toBeLessThan(1e-9);
    expect(fit.uncertainty.rsOhm).toBeUndefined();
  });

  it('fits C0 alone when no branch is free, and keeps C0 when fitC0 is false', () => {
    const sweep = synth(X1, spanOf(X1));
    const onlyC0 = fitBvd([sweep], { ...X1, c0F: 3.3e-12 }, { freeBranches: [] });
    expect(onlyC0.converged, onlyC0.reason).toBe(true);
    expect(rel(onlyC0.model.c0F, 3e-12)).toBeLessThan(1e-9);
    const noC0 = fitBvd([sweep], { ...perturb(X1, 5, 1.1, 0.9, 1), c0F: 3e-12 }, { fitC0: false });
    expect(noC0.converged, noC0.reason).toBe(true);
    expect(noC0.model.c0F).toBe(3e-12);
    expect(noC0.uncertainty.c0F).toBe(0);
    expect(rel(noC0.model.branches[0].c1F, 10e-15)).toBeLessThan(1e-9);
  });

  it('uses only points within windowHz of a free branch', () => {
    const sweep = synth(X1, spanOf(X1));
    const fit = fitBvd([sweep], perturb(X1, 5, 1.1, 0.9, 1.02), { windowHz: 3e3 });
    const expected = Array.from(sweep.freqHz).filter(
      (f) => Math.abs(f - X1.branches[0].fsHz * (1 + 5e-6)) <= 3e3,
    ).length;
    expect(fit.points).toBe(expected);
    expect(fit.converged, fit.reason).toBe(true);
    expect(rel(fit.model.branches[0].r1Ohm, 20)).toBeLessThan(1e-9);
  });

  it('reports the covariance of the fitted parameters, symmetric with positive diagonal', () => {
    const fit = fitBvd([synth(X1, spanOf(X1), { noiseDb: -60, seed: 2 })], perturb(X1, 5, 1.1, 0.9, 1.02));
    const c = fit.covariance!;
    expect(c.length).toBe(4);
    for (let i = 0; i < 4; i++) {
      expect(c[i][i]).toBeGreaterThan(0);
      for (let j = 0; j < 4; j++) expect(c[i][j]).toBe(c[j][i]);
    }
    // fs offset in ppm: its standard deviation is the fs uncertainty in ppm of the start fs.
    const fs0 = X1.branches[0].fsHz * (1 + 5e-6);
    expect(Math.sqrt(c[0][0]) * fs0 * 1e-6).toBeCloseTo(fit.uncertainty.branches[0].fsHz, 12);
  });
});

describe('analytic jacobian', () => {
  /** Flatten sweeps the way fitBvd does (all points). */
  function flatten(sweeps: FitSweep[]): BvdFitPoints {
    const n = sweeps.reduce((s, w) => s + w.freqHz.length, 0);
    const p: BvdFitPoints = {
      freqHz: new Float64Array(n),
      zRe: new Float64Array(n),
      zIm: new Float64Array(n),
      weight: new Float64Array(n),
      parallelCapF: new Float64Array(n),
      seriesCapF: new Float64Array(n),
    };
    let j = 0;
    for (const s of sweeps) {
      for (let i = 0; i < s.freqHz.length; i++, j++) {
        p.freqHz[j] = s.freqHz[i];
        p.zRe[j] = s.zRe[i];
        p.zIm[j] = s.zIm[i];
        p.weight[j] = s.weight ?? 1;
        p.parallelCapF[j] = s.addedConnection === 'parallel' ? s.addedCapacitanceF! : 0;
        p.seriesCapF[j] = s.addedConnection === 'series' ? s.addedCapacitanceF! : 0;
      }
    }
    return p;
  }

  const cases: Array<[string, { freeBranches: number[]; fitC0: boolean; fitRs: boolean; fitLs: boolean }]> = [
    [
      'every parameter free (two branches, C0, Rs, Ls)',
      { freeBranches: [0, 1], fitC0: true, fitRs: true, fitLs: true },
    ],
    ['one branch free, C0 and the other branch fixed', { freeBranches: [1], fitC0: false, fitRs: false, fitLs: false }],
  ];
  for (const [label, free] of cases) {
    it(`equals central finite differences to 1e-5 relative: ${label}`, () => {
      const truth: BvdModel = { ...TWO_BRANCH, rsOhm: 0.3, lsH: 4e-9, cpF: 0.2e-12 };
      const f = grid(TWO_BRANCH.branches[0].fsHz - 5e3, TWO_BRANCH.branches[1].fsHz + 5e3, 401);
      const sweeps = [
        synth(truth, f, { noiseDb: -50, seed: 8 }),
        {
          ...synth(truth, f, { noiseDb: -50, seed: 9, addedCapacitanceF: 8e-12, addedConnection: 'parallel' }),
          weight: 0.7,
        },
        synth(truth, f, { noiseDb: -50, seed: 10, addedCapacitanceF: 15e-12, addedConnection: 'series' }),
      ];
      // Evaluate away from the optimum, so no term of the Jacobian vanishes by accident.
      const start: BvdModel = {
        ...perturb(truth, 3, 1.2, 0.9, 1.04),
        rsOhm: 0.6,
        lsH: 2e-9,
      };
      const problem = createBvdResiduals(flatten(sweeps), start, free);
      const m = problem.residualCount;
      const n = problem.parameterCount;
      const x = Float64Array.from(problem.x0);
      const rnd = mulberry32(77);
      for (let p = 0; p < n; p++) x[p] += (rnd() - 0.5) * (problem.map.names[p].endsWith('Ppm') ? 2 : 0.05);
      const r = new Float64Array(m);
      const jac = new Float64Array(m * n);
      expect(problem.residualsAndJacobian(x, r, jac)).toBe(true);
      const rp = new Float64Array(m);
      const rm = new Float64Array(m);
      for (let p = 0; p < n; p++) {
        const h = 1e-6 * Math.max(1, Math.abs(x[p]));
        const xp = Float64Array.from(x);
        const xm = Float64Array.from(x);
        xp[p] += h;
        xm[p] -= h;
        expect(problem.residuals(xp, rp)).toBe(true);
        expect(problem.residuals(xm, rm)).toBe(true);
        let colMax = 0;
        let errMax = 0;
        for (let i = 0; i < m; i++) {
          const fd = (rp[i] - rm[i]) / (2 * h);
          colMax = Math.max(colMax, Math.abs(jac[p * m + i]));
          errMax = Math.max(errMax, Math.abs(fd - jac[p * m + i]));
        }
        expect(colMax, problem.map.names[p]).toBeGreaterThan(0);
        expect(errMax / colMax, problem.map.names[p]).toBeLessThan(1e-5);
      }
    });
  }

  it('residuals are the relative impedance residuals to first order', () => {
    // |r| = |Zmeas − Zmod|/|Zmeas|·(1 + O(residual)) — module comment of residuals.ts.
    const f = spanOf(X1, 201);
    const sweep = synth(X1, f, { noiseDb: -60, seed: 31 });
    const problem = createBvdResiduals(flatten([sweep]), X1, {
      freeBranches: [0],
      fitC0: true,
      fitRs: false,
      fitLs: false,
    });
    const r = new Float64Array(problem.residualCount);
    problem.residuals(problem.x0, r);
    for (let i = 0; i < f.length; i++) {
      const [zr, zi] = impedanceAt(X1, f[i]);
      const exact = Math.hypot(sweep.zRe[i] - zr, sweep.zIm[i] - zi) / Math.hypot(sweep.zRe[i], sweep.zIm[i]);
      expect(Math.abs(Math.hypot(r[2 * i], r[2 * i + 1]) / exact - 1)).toBeLessThan(1e-2);
    }
  });
});

describe('fitBvd failures are results', () => {
  const expectCleanFailure = (fit: FitBvdResult, start: BvdModel): void => {
    expect(fit.converged).toBe(false);
    expect(fit.reason.length).toBeGreaterThan(0);
    expect(fit.model).toEqual(start);
    expect(allFinite(fit)).toBe(true);
  };

  it('does not converge on pure complex noise', () => {
    const f = spanOf(X1);
    const g = gaussian(99);
    const zRe = Float64Array.from(f, () => 1000 * g());
    const zIm = Float64Array.from(f, () => 1000 * g());
    const start = perturb(X1, 5, 1.1, 0.9, 1.02);
    const fit = fitBvd([{ freqHz: f, zRe, zIm, source: 'noise.s1p' }], start);
    expectCleanFailure(fit, start);
  });

  it('does not converge on a capacitor without resonance', () => {
    const f = spanOf(X1);
    const sweep = synth({ c0F: 3e-12, branches: [] }, f, { noiseDb: -70, seed: 5 });
    const start = perturb(X1, 5, 1.1, 0.9, 1.02);
    const fit = fitBvd([sweep], start);
    expectCleanFailure(fit, start);
    expect(fit.reason).toMatch(/^branches\[0\]: /);
  });

  it("names the branch the data do not determine, and no branch when the failure is not one branch's", () => {
    // X1 data (−60 dB) with a start that adds a second branch 20 kHz above fs that the sweep does not show
    const f = grid(X1.branches[0].fsHz - 3000, X1.branches[0].fsHz + 30_000, 3001);
    const sweep = synth(X1, f, { noiseDb: -60, seed: 3 });
    const start: BvdModel = {
      ...perturb(X1, 0.2, 1.05, 1.01, 1.01),
      branches: [
        ...perturb(X1, 0.2, 1.05, 1.01, 1.01).branches,
        { fsHz: X1.branches[0].fsHz + 20e3, r1Ohm: 1e4, c1F: 1e-15 },
      ],
    };
    const both = fitBvd([sweep], start);
    expectCleanFailure(both, start);
    expect(both.failedBranch).toBe(1);
    expect(both.reason).toMatch(/^branches\[1\]: /);
    const short = fitBvd([sweep], start, { maxIterations: 1 });
    expect(short.converged).toBe(false);
    expect(short.failedBranch).toBeUndefined();
  });

  it('reports running out of iterations', () => {
    const start = perturb(X1, 20, 1.3, 0.8, 1.05);
    const fit = fitBvd([synth(X1, spanOf(X1))], start, { maxIterations: 1 });
    expectCleanFailure(fit, start);
    expect(fit.reason).toBe('no convergence in 1 iterations');
    expect(fit.iterations).toBe(1);
  });

  it('rejects bad input with a terse reason instead of throwing', () => {
    const f = spanOf(X1, 11);
    const good = synth(X1, f);
    const cases: Array<[FitSweep[], BvdModel, object, string]> = [
      [[], X1, {}, 'no sweeps to fit'],
      [
        [{ ...good, zIm: good.zIm.subarray(1) }],
        X1,
        {},
        'synthetic.s1p: frequency and impedance arrays differ in length',
      ],
      [
        [{ ...good, zRe: Float64Array.from(good.zRe, (v, i) => (i === 3 ? NaN : v)) }],
        X1,
        {},
        'synthetic.s1p: point 3: impedance NaN',
      ],
      [
        [{ ...good, freqHz: Float64Array.from(f, (v, i) => (i === 2 ? -1 : v)) }],
        X1,
        {},
        'synthetic.s1p: point 2: frequency -1 Hz: expected a positive number',
      ],
      [[{ ...good, weight: 0 }], X1, {}, 'synthetic.s1p: weight 0: expected a positive number'],
      [
        [{ ...good, addedCapacitanceF: 1e-12 }],
        X1,
        {},
        'synthetic.s1p: added capacitor connection undefined: expected parallel or series',
      ],
      [[good], { ...X1, branches: [{ ...X1.branches[0], r1Ohm: -20 }] }, {}, 'initial branches[0]'],
      [[good], { ...X1, c0F: NaN }, {}, 'initial c0F NaN: expected a positive number'],
      [[good], X1, { freeBranches: [3] }, 'free branch 3: expected an index 0…0'],
      [[good], X1, { freeBranches: [], fitC0: false }, 'no free parameters'],
      [
        [{ ...good, freqHz: f.subarray(0, 2), zRe: good.zRe.subarray(0, 2), zIm: good.zIm.subarray(0, 2) }],
        X1,
        {},
        '2 points (4 residuals) for 4 parameters: need more residuals than parameters',
      ],
    ];
    for (const [sweeps, start, options, reason] of cases) {
      const fit = fitBvd(sweeps, start, options);
      expect(fit.converged).toBe(false);
      expect(fit.reason).toContain(reason);
      expect(fit.model).toEqual(start);
      expect(fit.model).not.toBe(start);
    }
  });
});
