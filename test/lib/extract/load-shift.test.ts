import { describe, expect, it } from 'vitest';
import {
  c1FromLoadShift,
  loadFrequency,
  lossFactor,
  solveThreeLoad,
  solveTwoLoad,
  type LoadPoint,
} from '../../../src/lib/extract/load-shift.ts';
import { zeroPhaseOf } from '../../../src/lib/extract/closed-form.ts';
import { impedanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';

// Reference resonator X1 (invented; IEEE Std 177 model).
const FS = 1e8 / (2 * Math.PI);
const C1 = 10e-15;
const C0 = 3e-12;
const X1: BvdModel = { c0F: C0, branches: [{ fsHz: FS, r1Ohm: 20, c1F: C1 }] };

/** Lower zero phase of X1 in series with CL, by bisection on Im(Z + 1/(jωCL)) (independent of load-shift.ts). */
function seriesLoadResonance(clF: number): number {
  let lo = FS;
  let hi = loadFrequency(FS, C1, C0, clF) + 50;
  const imz = (f: number) => impedanceAt(X1, f)[1] - 1 / (2 * Math.PI * f * clF);
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (lo + hi);
    if (imz(m) < 0) lo = m;
    else hi = m;
  }
  return 0.5 * (lo + hi);
}

/** Upper zero phase of X1 with CL across it (zero phase of the model with C0 + CL). */
function parallelLoadAntiresonance(clF: number): number {
  return zeroPhaseOf({ c0F: C0 + clF, branches: X1.branches }, 0)!.faHz;
}

describe('load-capacitance shift', () => {
  it('solves two lossless loads exactly: C1 = 10.000000 fF, C0 = 3.000000 pF', () => {
    // check X1 (mpmath; lossless fL at 10 and 20 pF as data), exact 1/u line
    const loads: LoadPoint[] = [10e-12, 20e-12].map((clF) => ({
      clF,
      connection: 'parallel',
      fLHz: loadFrequency(FS, C1, C0, clF),
    }));
    const r = solveTwoLoad(FS, loads)!;
    expect(r.c1F * 1e15).toBeCloseTo(10, 6);
    expect(r.c0F * 1e12).toBeCloseTo(3, 6);
  });

  it('recovers fs, C1 and C0 from three lossless loads (8, 12, 20 pF)', () => {
    // three loads also give fs (derived from the BVD model)
    const loads: LoadPoint[] = [8e-12, 12e-12, 20e-12].map((clF) => ({
      clF,
      connection: 'series',
      fLHz: loadFrequency(FS, C1, C0, clF),
    }));
    const r = solveThreeLoad(loads)!;
    expect(r.fsHz).toBeCloseTo(FS, 4);
    expect(r.c1F * 1e15).toBeCloseTo(10, 6);
    expect(r.c0F * 1e12).toBeCloseTo(3, 6);
  });

  it('is exact with R1 for a capacitor across the part, where the lossless form is 0.07 % off', () => {
    // fL is the zero phase of the loaded part (IEC 60444-11 term); loss correction derived in load-shift.ts
    const fL = parallelLoadAntiresonance(10e-12);
    const load: LoadPoint = { clF: 10e-12, connection: 'parallel', fLHz: fL };
    const exact = c1FromLoadShift({ fsHz: FS, load, c0F: C0, r1Ohm: 20 })!;
    expect(Math.abs(exact / C1 - 1)).toBeLessThan(1e-9);
    const lossless = c1FromLoadShift({ fsHz: FS, load, c0F: C0 })!;
    expect(Math.abs(lossless / C1 - 1)).toBeGreaterThan(3e-4);
  });

  it('is exact with R1 for a capacitor in series with the part', () => {
    // with R1 (derived from the BVD model), fL is the lower zero phase of crystal + series CL
    const fL = seriesLoadResonance(10e-12);
    const exact = c1FromLoadShift({
      fsHz: FS,
      load: { clF: 10e-12, connection: 'series', fLHz: fL },
      c0F: C0,
      r1Ohm: 20,
    })!;
    expect(Math.abs(exact / C1 - 1)).toBeLessThan(1e-8);
  });

  it('gives loss factor 1 without R1 and one within 0.1 % of 1 for X1 with its 20 Ω', () => {
    // κ = ω(C0 + CL)X equals 1 for R1 = 0 (both connections, lossless fL);
    // the correction is of order (ω(C0 + CL)R1)² ≈ 4e-4 here
    expect(lossFactor(16e6, 0, C0, 10e-12, 'series')).toBe(1);
    expect(lossFactor(16e6, 0, C0, 10e-12, 'parallel')).toBe(1);
    for (const c of ['parallel', 'series'] as const) {
      const k = lossFactor(16e6, 20, C0, 10e-12, c)!;
      expect(k).not.toBe(1);
      expect(Math.abs(k - 1)).toBeLessThan(1e-3);
    }
  });

  it('solves mixed lossy loads (part alone, across, in series) exactly, C0 not needed', () => {
    // exact two-load variant (derived from the BVD model); the part's own anti-resonance is a load of 0 F across it
    const loads: LoadPoint[] = [
      { clF: 0, connection: 'parallel', fLHz: zeroPhaseOf(X1, 0)!.faHz },
      { clF: 10e-12, connection: 'parallel', fLHz: parallelLoadAntiresonance(10e-12) },
      { clF: 20e-12, connection: 'series', fLHz: seriesLoadResonance(20e-12) },
    ];
    const two = solveTwoLoad(FS, loads, 20)!;
    expect(Math.abs(two.c1F / C1 - 1)).toBeLessThan(1e-7);
    expect(Math.abs(two.c0F / C0 - 1)).toBeLessThan(1e-7);
    const three = solveThreeLoad(loads, 20)!;
    expect(Math.abs(three.fsHz - FS)).toBeLessThan(1e-3);
    expect(Math.abs(three.c1F / C1 - 1)).toBeLessThan(1e-6);
  });

  it('needs two different loads', () => {
    expect(
      solveTwoLoad(FS, [{ clF: 10e-12, connection: 'parallel', fLHz: loadFrequency(FS, C1, C0, 10e-12) }]),
    ).toBeUndefined();
  });
});
