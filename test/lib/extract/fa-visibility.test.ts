/**
 * Evidence that a mode's anti-resonance stands above the noise (src/lib/extract/fa-visibility.ts):
 * SNR = √Σ (2·G_fa/σY,i)² over the points within one bandwidth fs/Q of fa, σY = σZ/|Z|².
 *
 * Check values, derived here for the reference resonator X1 (synthetic, not a real part:
 * L1 = 10 mH, C1 = 10 fF, R1 = 20 Ω, C0 = 3 pF, ωs = 1e8 rad/s):
 * - fa = fs·√(1 + C1/C0) makes ω²L1C1 = 1 + C1/C0, so the motional reactance there is exactly
 *   X = (ω²L1C1 − 1)/(ωC1) = 1/(ωC0) and G_fa = R1/(R1² + X²) = ω²C0²R1/(1 + (ωC0R1)²), which is
 *   ω²C0²R1 to 4e-5 (ωC0R1 = 6e-3);
 * - bandwidth fs/Q = 2π·fs²·R1·C1 = 318.3 Hz (Q = 1/(ωs·R1·C1) = 50 000).
 * With the same |Z| and σZ at every point each term is equal, so SNR = √N·2G_fa·|Z|²/σZ:
 * four times the points, twice the evidence; twice the noise, half.
 */
import { describe, expect, it } from 'vitest';
import { antiResonanceEvidence, FA_VISIBLE_SNR, type NoisySweep } from '../../../src/lib/extract/fa-visibility.ts';
import { admittanceAt, impedanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';

const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const FA = FS * Math.sqrt(1 + 10e-15 / 3e-12);
const WA = 2 * Math.PI * FA;
const G_FA = WA * WA * 9e-24 * 20; // ω²C0²R1, first order (module comment)
const BW = 2 * Math.PI * FS * FS * 20 * 10e-15; // fs/Q

/** A sweep of `n` points evenly over fa ± halfSpan, with constant Z and σZ (so every term is equal). */
function flatSweep(
  n: number,
  halfSpanHz: number,
  sigmaZOhm: number,
  z = { re: 1e3, im: -2e4 },
  source = 'flat',
): NoisySweep {
  const f = Float64Array.from({ length: n }, (_, i) => FA - halfSpanHz + (2 * halfSpanHz * i) / (n - 1));
  return {
    source,
    freqHz: f,
    zRe: new Float64Array(n).fill(z.re),
    zIm: new Float64Array(n).fill(z.im),
    sigmaZOhm: new Float64Array(n).fill(sigmaZOhm),
  };
}

describe('antiResonanceEvidence', () => {
  it("check values: bandwidth 318.3 Hz; the model's G at fa is ω²C0²R1/(1 + (ωC0R1)²)", () => {
    expect(BW).toBeCloseTo(318.31, 2);
    expect(admittanceAt(X1, FA)[0] / (G_FA / (1 + (WA * 3e-12 * 20) ** 2))).toBeCloseTo(1, 9);
  });

  it('equals √N·2G_fa·|Z|²/σZ for N equal points within the bandwidth (4e-5, the first-order G_fa)', () => {
    const z2 = 1e3 ** 2 + 2e4 ** 2;
    for (const n of [2, 9, 25]) {
      const e = antiResonanceEvidence(X1, 0, FA, [flatSweep(n, 0.9 * BW, 50)])!;
      expect(e.source).toBe('flat');
      expect(e.snr / ((Math.sqrt(n) * 2 * G_FA * z2) / 50)).toBeCloseTo(1, 4);
    }
  });

  it('scales as √N with the number of points within a bandwidth of fa', () => {
    const a = antiResonanceEvidence(X1, 0, FA, [flatSweep(9, 0.9 * BW, 50)])!.snr;
    const b = antiResonanceEvidence(X1, 0, FA, [flatSweep(36, 0.9 * BW, 50)])!.snr;
    const c = antiResonanceEvidence(X1, 0, FA, [flatSweep(81, 0.9 * BW, 50)])!.snr;
    expect(b / a).toBeCloseTo(2, 10);
    expect(c / a).toBeCloseTo(3, 10);
  });

  it('scales inversely with σZ', () => {
    const a = antiResonanceEvidence(X1, 0, FA, [flatSweep(21, 0.9 * BW, 50)])!.snr;
    const b = antiResonanceEvidence(X1, 0, FA, [flatSweep(21, 0.9 * BW, 100)])!.snr;
    const c = antiResonanceEvidence(X1, 0, FA, [flatSweep(21, 0.9 * BW, 5)])!.snr;
    expect(a / b).toBeCloseTo(2, 10);
    expect(c / a).toBeCloseTo(10, 10);
  });

  it('only points within one bandwidth of fa count', () => {
    // 11 points within ±0.99·BW, then points at ±1.01·BW and ±3·BW with a thousandth of the noise
    const inner = flatSweep(11, 0.99 * BW, 50);
    const outer = [-3 * BW, -1.01 * BW, 1.01 * BW, 3 * BW].map((d) => FA + d);
    const f = Float64Array.from([...inner.freqHz, ...outer].sort((x, y) => x - y));
    const n = f.length;
    const sigma = Float64Array.from(f, (x) => (Math.abs(x - FA) > BW ? 0.05 : 50));
    const s: NoisySweep = {
      source: 's',
      freqHz: f,
      zRe: new Float64Array(n).fill(1e3),
      zIm: new Float64Array(n).fill(-2e4),
      sigmaZOhm: sigma,
    };
    const e = antiResonanceEvidence(X1, 0, FA, [s])!.snr;
    expect(e / antiResonanceEvidence(X1, 0, FA, [inner])!.snr).toBeCloseTo(1, 12);
  });

  it('with no point within a bandwidth, the nearest point alone is the evidence', () => {
    const f = Float64Array.of(FA - 5 * BW, FA + 2 * BW, FA + 9 * BW);
    const s: NoisySweep = {
      source: 's',
      freqHz: f,
      zRe: Float64Array.of(1, 1e3, 1),
      zIm: Float64Array.of(0, -2e4, 0),
      sigmaZOhm: Float64Array.of(1, 50, 1),
    };
    const e = antiResonanceEvidence(X1, 0, FA, [s])!.snr;
    expect(e / ((2 * G_FA * (1e3 ** 2 + 2e4 ** 2)) / 50)).toBeCloseTo(1, 4);
  });

  it('realistic model impedance: 4× the points across fa ± bandwidth gives ~2× the evidence (Riemann sums, 2 %)', () => {
    const sweep = (n: number): NoisySweep => {
      const f = Float64Array.from({ length: n }, (_, i) => FA - 0.999 * BW + (1.998 * BW * i) / (n - 1));
      const zRe = new Float64Array(n);
      const zIm = new Float64Array(n);
      f.forEach((x, i) => {
        [zRe[i], zIm[i]] = impedanceAt(X1, x);
      });
      return { source: `n${n}`, freqHz: f, zRe, zIm, sigmaZOhm: new Float64Array(n).fill(1e3) };
    };
    const a = antiResonanceEvidence(X1, 0, FA, [sweep(51)])!.snr;
    const b = antiResonanceEvidence(X1, 0, FA, [sweep(204)])!.snr;
    expect(b / a).toBeGreaterThan(1.96);
    expect(b / a).toBeLessThan(2.04);
  });

  it('the best sweep wins; sweeps not reaching fa are skipped; none reaching fa gives undefined', () => {
    const quiet = flatSweep(11, 0.9 * BW, 5, undefined, 'quiet');
    const noisy = flatSweep(11, 0.9 * BW, 500, undefined, 'noisy');
    const below = {
      ...flatSweep(11, 0.9 * BW, 0.001, undefined, 'below'),
      freqHz: Float64Array.from({ length: 11 }, (_, i) => FS + i),
    };
    expect(antiResonanceEvidence(X1, 0, FA, [noisy, below, quiet])!.source).toBe('quiet');
    expect(antiResonanceEvidence(X1, 0, FA, [below])).toBeUndefined();
    expect(antiResonanceEvidence(X1, 1, FA, [quiet])).toBeUndefined(); // no branch 1
    expect(antiResonanceEvidence(X1, 0, 0, [quiet])).toBeUndefined();
  });

  it('the visibility threshold: 10 (fa then fixed to about a tenth of a bandwidth)', () => {
    expect(FA_VISIBLE_SNR).toBe(10);
    // σZ for which 11 equal points give exactly the threshold: σ = √11·2G_fa·|Z|²/10
    const z2 = 1e3 ** 2 + 2e4 ** 2;
    const sigma = (Math.sqrt(11) * 2 * G_FA * z2) / 10;
    expect(antiResonanceEvidence(X1, 0, FA, [flatSweep(11, 0.9 * BW, sigma)])!.snr).toBeCloseTo(10, 3);
  });
});
