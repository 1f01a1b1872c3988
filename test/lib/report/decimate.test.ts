import { describe, expect, it } from 'vitest';
import { decimateCurve, decimateIndices } from '../../../src/lib/report/decimate.ts';
import { impedanceOver } from '../../../src/lib/models/bvd.ts';
import { X1 } from '../../site/fixture.ts';

describe('decimateCurve', () => {
  // Reference resonator X1 (IEEE Std 177 BVD model): minimum |Z| near fs = 15 915 494.309 Hz; check values
  // (mpmath) Z(fs) = 19.99928 − j0.119996 Ω, |Z|min = 19.999280 Ω.
  it('keeps the resonance minimum of |Z| of a dense sweep', () => {
    const n = 20_001;
    const fs = X1.branches[0].fsHz;
    const f = Float64Array.from({ length: n }, (_, i) => fs - 20e3 + (40e3 * i) / (n - 1));
    const { zRe, zIm } = impedanceOver(X1, f);
    const mag = Array.from(zRe, (r, i) => Math.hypot(r, zIm[i]));
    const min = Math.min(...mag);
    const c = decimateCurve(f, mag, { maxPoints: 300 });
    expect(c.x.length).toBeLessThanOrEqual(300);
    expect(Math.min(...c.y)).toBeCloseTo(min, 3);
    // Between the true minimum 19.99928 Ω (at fm, off the grid) and |Z(fs)| = 19.99964 Ω, shown to 5 digits.
    expect(Math.abs(Math.min(...c.y) - 19.9995)).toBeLessThanOrEqual(0.0012);
    expect(Math.max(...c.y)).toBeCloseTo(Math.max(...mag), -1);
    const at = c.x[c.y.indexOf(Math.min(...c.y))];
    expect(Math.abs(at - fs)).toBeLessThan(3);
  });

  it('keeps first, last and named points, in order, within the budget', () => {
    const y = Array.from({ length: 1000 }, (_, i) => Math.sin(i / 7));
    const idx = decimateIndices(y, 100, [500]);
    expect(idx[0]).toBe(0);
    expect(idx[idx.length - 1]).toBe(999);
    expect(idx).toContain(500);
    expect(idx.length).toBeLessThanOrEqual(101);
    expect([...idx].sort((a, b) => a - b)).toEqual(idx);
  });

  it('returns short curves unchanged and drops non-finite values', () => {
    expect(decimateCurve([1, 2, 3], [1, Number.NaN, 3])).toEqual({ x: [1, 3], y: [1, 3] });
  });
});
