import { describe, expect, it } from 'vitest';
import {
  c1FromFsFp,
  effectiveCapacitanceOf,
  l1FromFsC1,
  motionalFromAntiresonance,
  parallelResonanceOf,
  zeroPhaseOf,
} from '../../../src/lib/extract/closed-form.ts';
import { admittanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';

// Synthetic reference resonators (invented; IEEE Std 177 model): X1 and OT100.
const FS_X1 = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS_X1, r1Ohm: 20, c1F: 10e-15 }] };
const OT100: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 100e6, r1Ohm: 60, c1F: 1e-15 }] };

describe('parallelResonanceOf', () => {
  it('gives the lossless fp of X1: 15 941 998.065 Hz, fp − fs = 26 503.756 Hz', () => {
    // check X1 (mpmath; IEEE 177 fp = fs·√(1 + C1/C0))
    const fp = parallelResonanceOf(X1, 0)!;
    expect(fp).toBeCloseTo(15_941_998.065, 2);
    expect(fp - FS_X1).toBeCloseTo(26_503.756, 2);
  });

  it('gives fp − fs = 380.566 kHz for the ceramic example', () => {
    // illustrative ceramic example (from memory): fs = 4.005879 MHz
    const fs = 1 / (2 * Math.PI * Math.sqrt(0.385e-3 * 4.1e-12));
    expect(fs).toBeCloseTo(4_005_879, -1);
    const fp = parallelResonanceOf({ c0F: 20.6e-12, branches: [{ fsHz: fs, r1Ohm: 8, c1F: 4.1e-12 }] }, 0)!;
    expect((fp - fs) / 1e3).toBeCloseTo(380.566, 2);
  });

  it('puts the fp of a two-branch model where the lossless susceptance vanishes, between the two modes', () => {
    // two-branch reference model: X1 plus L2 = 40 mH, R2 = 150 Ω, C2 = 2.468878 fF (f2 = fs + 100 kHz)
    const f2 = FS_X1 + 100e3;
    const two: BvdModel = { c0F: 3e-12, branches: [X1.branches[0], { fsHz: f2, r1Ohm: 150, c1F: 2.468878e-15 }] };
    const fp0 = parallelResonanceOf(two, 0)!;
    const fp1 = parallelResonanceOf(two, 1)!;
    expect(fp0).toBeGreaterThan(FS_X1);
    expect(fp0).toBeLessThan(f2);
    expect(fp1).toBeGreaterThan(f2);
    // Independent evaluation with bvd.ts, resistances set to zero (tiny): Im Y ≈ 0 at both roots.
    const lossless: BvdModel = { c0F: 3e-12, branches: two.branches.map((b) => ({ ...b, r1Ohm: 1e-9 })) };
    for (const f of [fp0, fp1]) {
      const b = admittanceAt(lossless, f)[1];
      expect(Math.abs(b) / (2 * Math.PI * f * 3e-12)).toBeLessThan(1e-8);
    }
    // The other branch pulls the main fp down from its single-branch value.
    expect(fp0).toBeLessThan(parallelResonanceOf(X1, 0)!);
  });
});

describe('zeroPhaseOf', () => {
  it('reproduces the exact IEEE 177 zero-phase family of X1', () => {
    // check values (mpmath), X1, exact
    const zp = zeroPhaseOf(X1, 0)!;
    const fp = parallelResonanceOf(X1, 0)!;
    expect(zp.frHz - FS_X1).toBeCloseTo(0.954964, 5);
    expect(zp.faHz - fp).toBeCloseTo(-0.956554, 5);
    expect(zp.rrOhm).toBeCloseTo(20.00072, 5);
    expect(zp.raOhm).toBeCloseTo(553_689.92, 1);
    expect(zp.faHz - zp.frHz).toBeCloseTo(26_501.844, 3);
  });

  it('reproduces the low-M OT100 values: fr − fs = 215.983 Hz, Rr = 60.7877 Ω', () => {
    // check values (mpmath), OT100 (M = 8.84)
    const zp = zeroPhaseOf(OT100, 0)!;
    expect(zp.frHz - 100e6).toBeCloseTo(215.983, 2);
    expect(zp.rrOhm).toBeCloseTo(60.7877, 3);
  });

  it('finds no zero phase when M is below 2', () => {
    // real zero-phase roots exist only if M ≥ 2 (M = 1/(ωs C0 R1); derived from the BVD model)
    const lowM: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 100e6, r1Ohm: 600, c1F: 1e-15 }] }; // M ≈ 0.88
    expect(zeroPhaseOf(lowM, 0)).toBeUndefined();
  });
});

describe('C1 and L1 closed forms', () => {
  it('C1 = C0((fp/fs)² − 1) is exact with the lossless fp and 2.6 % low for OT100 with the zero-phase pair', () => {
    // check values (mpmath): exact 10.000000 fF (X1); (fr, fa) pair gives 9.999278 fF (X1) and 0.974074 fF (OT100)
    expect(c1FromFsFp(FS_X1, parallelResonanceOf(X1, 0)!, 3e-12) * 1e15).toBeCloseTo(10, 9);
    const zx = zeroPhaseOf(X1, 0)!;
    expect(c1FromFsFp(zx.frHz, zx.faHz, 3e-12) * 1e15).toBeCloseTo(9.999278, 5);
    const zo = zeroPhaseOf(OT100, 0)!;
    expect(c1FromFsFp(zo.frHz, zo.faHz, 3e-12) * 1e15).toBeCloseTo(0.974074, 5);
  });

  it('L1 = 1/((2πfs)²C1) gives the consistency values 16.4911 mH, 10.1321 mH, 2.690611 fF', () => {
    // consistency check (mpmath): 16 MHz with 6 fF → 16.4911 mH; 25 MHz with 4 fF → 10.1321 mH;
    // 433.92 MHz SAW with 50 µH → C1 = 2.690611 fF (same formula, L and C exchanged)
    expect(l1FromFsC1(16e6, 6e-15) * 1e3).toBeCloseTo(16.4911, 3);
    expect(l1FromFsC1(25e6, 4e-15) * 1e3).toBeCloseTo(10.1321, 3);
    expect(l1FromFsC1(433.92e6, 50e-6) * 1e15).toBeCloseTo(2.690611, 5);
  });

  it('recovers C1 exactly from the measured upper zero phase when R1 is taken into account', () => {
    // exact zero-phase quadratic ωC0(R1² + X²) = X (derived from the BVD model)
    const fa = zeroPhaseOf(X1, 0)!.faHz;
    const exact = motionalFromAntiresonance({ fsHz: FS_X1, faHz: fa, r1Ohm: 20, shuntCF: 3e-12 })!;
    expect(exact.c1F / 10e-15 - 1).toBeLessThan(1e-9);
    expect(exact.l1H / 10e-3 - 1).toBeLessThan(1e-9);
    // Ignoring R1 is the lossless C0((fa/fs)² − 1): low by (fp² − fa²)/(fp² − fs²) ≈ 3.6e-5,
    // with fp − fa = 0.956554 Hz and fp − fs = 26 503.756 Hz (mpmath check values).
    const lossless = motionalFromAntiresonance({ fsHz: FS_X1, faHz: fa, r1Ohm: 0, shuntCF: 3e-12 })!;
    expect(lossless.c1F).toBeCloseTo(c1FromFsFp(FS_X1, fa, 3e-12), 25);
    const fp = 15_941_998.065;
    expect(1 - lossless.c1F / 10e-15).toBeCloseTo((0.956554 * (2 * fp - 0.956554)) / (26_503.756 * (fp + FS_X1)), 9);
  });
});

describe('effectiveCapacitanceOf', () => {
  it('gives the X1 check values of Ceff', () => {
    // check values (mpmath): Ceff(0.9fs) = 3.052632 pF, Ceff(1.1fs) = 2.952381 pF, Ceff(0.5fs) = 3.013333 pF, Ceff(0.01fs) = 3.010001 pF
    const c = (x: number) => effectiveCapacitanceOf(X1, x * FS_X1) * 1e12;
    expect(c(0.9)).toBeCloseTo(3.052632, 6);
    expect(c(1.1)).toBeCloseTo(2.952381, 6);
    expect(c(0.5)).toBeCloseTo(3.013333, 6);
    expect(c(0.01)).toBeCloseTo(3.010001, 6);
  });

  it('matches Im Y/ω of the lossy model away from resonance', () => {
    // BVD model (bvd.ts) against the lossless Ceff form; R1 changes it by (R1/X)² ≈ 1e-9 at 0.9 fs
    const f = 0.9 * FS_X1;
    const b = admittanceAt(X1, f)[1];
    expect(b / (2 * Math.PI * f) / effectiveCapacitanceOf(X1, f) - 1).toBeLessThan(1e-8);
  });
});
