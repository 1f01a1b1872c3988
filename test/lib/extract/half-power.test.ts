import { describe, expect, it } from 'vitest';
import { halfPower } from '../../../src/lib/extract/half-power.ts';
import { fitConductancePeak } from '../../../src/lib/extract/conductance-peak.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { linGrid, synthSweep } from './synthetic.ts';

// Reference resonator X1 (invented; IEEE Std 177 model): fs = 1e8/2π Hz, R1 20 Ω, L1 10 mH, C1 10 fF, C0 3 pF.
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };

function gOf(model: BvdModel, f: Float64Array, noiseDb?: number, seed = 1) {
  const s = partAlone(synthSweep(model, f, { noiseDb, seed }));
  const yAbs = s.gS.map((g, i) => Math.hypot(g, s.bS[i]));
  let peak = 0;
  for (let i = 1; i < f.length; i++) if (s.gS[i] > s.gS[peak]) peak = i;
  return { ...s, yAbs, peak };
}

describe('halfPower', () => {
  it('finds the X1 half-power points f− = 15 915 335.155 Hz and f+ = 15 915 653.465 Hz', () => {
    // check X1 (mpmath): f+ = 15 915 653.465 Hz, f− = 15 915 335.155 Hz, Δf = 318.30989 Hz, √(f+f−) = fs
    const f = linGrid(FS - 1600, FS + 1600, 1601);
    const d = gOf(X1, f);
    const r = halfPower(f, d.gS, d.peak);
    expect(r.ok).toBe(true);
    expect(r.fLowHz).toBeCloseTo(15_915_335.155, 3);
    expect(r.fHighHz).toBeCloseTo(15_915_653.465, 3);
    expect(r.bandwidthHz).toBeCloseTo(318.30989, 4);
    expect(r.fsHz).toBeCloseTo(FS, 4);
    expect(r.l1H / 10e-3 - 1).toBeLessThan(1e-6);
    expect(Math.abs(r.c1F / 10e-15 - 1)).toBeLessThan(1e-6);
    expect(r.q).toBeCloseTo(50_000, 0);
  });

  it('stays within 0.1 % on L1 with only 8 points per bandwidth (quadratic interpolation of 1/G)', () => {
    // half-power relations (derived from the BVD model); sampling at 40 Hz steps (common practice limit ≥ 10 points)
    const f = linGrid(FS - 2000, FS + 2000, 101);
    const d = gOf(X1, f);
    const r = halfPower(f, d.gS, d.peak);
    expect(r.ok).toBe(true);
    expect(Math.abs(r.l1H / 10e-3 - 1)).toBeLessThan(1e-3);
  });

  it('reports a half-power point outside the sweep instead of a number', () => {
    const f = linGrid(FS - 100, FS + 1600, 801);
    const d = gOf(X1, f);
    const r = halfPower(f, d.gS, d.peak);
    expect(r.ok).toBe(false);
    expect(r.reason).toBe('lower half-power point lies below the sweep start');
  });
});

describe('fitConductancePeak', () => {
  it('recovers fs, R1 and L1 of X1 exactly from noiseless data', () => {
    // Gmax = 1/R1 exactly at fs; L1 = R1/(2πΔf) (derived from the BVD model)
    const f = linGrid(FS - 1600, FS + 1600, 1601);
    const d = gOf(X1, f);
    const r = fitConductancePeak(f, d.gS, d.yAbs, d.peak);
    expect(r.ok).toBe(true);
    expect(Math.abs(r.fsHz - FS)).toBeLessThan(1e-6);
    expect(r.r1Ohm).toBeCloseTo(20, 9);
    expect(r.l1H).toBeCloseTo(10e-3, 11);
    expect(r.bandwidthHz).toBeCloseTo(318.30989, 4);
  });

  it('gives uncertainties that cover the true values on noisy data (−60 dB)', () => {
    // seeded synthetic sweeps; 3 standard uncertainties as the coverage criterion (common practice)
    const f = linGrid(FS - 1600, FS + 1600, 801);
    let covered = 0;
    const trials = 20;
    for (let seed = 1; seed <= trials; seed++) {
      const d = gOf(X1, f, -60, seed);
      const r = fitConductancePeak(f, d.gS, d.yAbs, d.peak);
      const u = r.uncertainty!;
      if (
        Math.abs(r.fsHz - FS) < 3 * u.fsHz &&
        Math.abs(r.r1Ohm - 20) < 3 * u.r1Ohm &&
        Math.abs(r.c1F - 10e-15) < 3 * u.c1F
      )
        covered++;
    }
    expect(covered).toBeGreaterThanOrEqual(18);
  });

  it('refuses a vertex that lies away from the sampled peak', () => {
    // A flat conductance (no resonance): nothing to fit.
    const f = linGrid(1e6, 1.1e6, 11);
    const g = new Float64Array(11).fill(1e-6);
    const r = fitConductancePeak(f, g, g, 5);
    expect(r.ok).toBe(false);
  });
});
