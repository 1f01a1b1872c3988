/**
 * Instrument noise of the synthetic recorder (src/lib/synth/synth-sweep.ts, `recordImpedances`):
 * a floor independent of the signal, E|n|² = 10^(floorDb/10) in units of the recorded quantity
 * (S: unitless; an impedance record's Z: z0Ohm; its Y: 1/z0Ohm), plus a trace term
 * E|n|² = (traceNoise·|x|)², both complex Gaussian split equally over the two components; the
 * older relative-only `noiseDb`, x + |x|·σ·(g1 + j·g2) with σ = 10^(dB/20)/√2; and the seed.
 *
 * Statistics (common practice). Over N points of a constant recorded value, |n|²/E|n|² is
 * exponential (χ²₂/2: mean 1, standard deviation 1), so the empirical mean of |n|² has a
 * relative standard error 1/√N; one component's mean square has √(2/N) (χ²₁). With N = 20 000
 * these are 0.71 % and 1.0 %; the tolerances are 4 standard errors.
 */
import { describe, expect, it } from 'vitest';
import { recordImpedances, synthesizeSweep, type RecordOptions } from '../../../src/lib/synth/synth-sweep.ts';
import { formatSynthFile } from '../../../src/lib/synth/synth-file.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';

const N = 20_000;
const FREQ = Float64Array.from({ length: N }, (_, i) => 1e6 + i);
const SE_MEAN = 1 / Math.sqrt(N); // relative SE of mean |n|²
const SE_COMPONENT = Math.sqrt(2 / N); // relative SE of one component's mean square

interface C {
  re: number;
  im: number;
}
const Z: C = { re: 30, im: 40 }; // |Z| = 50 Ω

/** Noise statistics of entry k of a record of the constant value x. */
function stats(opts: RecordOptions, z: C, k: number, x: C) {
  const rec = recordImpedances(FREQ, new Array(N).fill(z), opts);
  const re = rec.network.re[k];
  const im = rec.network.im[k];
  let s2 = 0;
  let sRe2 = 0;
  let sIm2 = 0;
  let sRe = 0;
  let sIm = 0;
  let sReIm = 0;
  for (let i = 0; i < N; i++) {
    const a = re[i] - x.re;
    const b = im[i] - x.im;
    s2 += a * a + b * b;
    sRe2 += a * a;
    sIm2 += b * b;
    sRe += a;
    sIm += b;
    sReIm += a * b;
  }
  return { meanSq: s2 / N, re2: sRe2 / N, im2: sIm2 / N, meanRe: sRe / N, meanIm: sIm / N, reIm: sReIm / N, rec };
}

/** Expect empirical/expected within k standard errors (relative). */
function within(got: number, want: number, se: number, k = 4) {
  expect(Math.abs(got / want - 1)).toBeLessThan(k * se);
}

const gammaOf = (z: C, z0: number): C => {
  const nr = z.re - z0;
  const dr = z.re + z0;
  const d = dr * dr + z.im * z.im;
  return { re: (nr * dr + z.im * z.im) / d, im: (z.im * dr - nr * z.im) / d };
};
const inv = (z: C): C => {
  const d = z.re * z.re + z.im * z.im;
  return { re: z.re / d, im: -z.im / d };
};
const abs2 = (z: C) => z.re * z.re + z.im * z.im;

describe('floor: E|n|² = 10^(floorDb/10) in units of the recorded quantity', () => {
  const cases: Array<{ label: string; opts: RecordOptions; k: number; x: C; unit: number }> = [
    {
      label: 'reflection S11 (unitless)',
      opts: { fixture: 'reflection', floorDb: -40 },
      k: 0,
      x: gammaOf(Z, 50),
      unit: 1,
    },
    {
      label: 'series-through S21 (unitless)',
      opts: { fixture: 'series-thru', floorDb: -60 },
      k: 2,
      x: { re: (100 * 130) / (130 ** 2 + 40 ** 2), im: (-100 * 40) / (130 ** 2 + 40 ** 2) },
      unit: 1,
    },
    {
      label: 'impedance Z record, z0Ohm 50: Ω of the 50 Ω range',
      opts: { fixture: 'impedance', parameter: 'Z', floorDb: -40 },
      k: 0,
      x: Z,
      unit: 50,
    },
    {
      label: 'impedance Z record, z0Ohm 1000',
      opts: { fixture: 'impedance', parameter: 'Z', z0Ohm: 1000, floorDb: -40 },
      k: 0,
      x: Z,
      unit: 1000,
    },
    {
      label: 'impedance Y record, z0Ohm 50: S of 1/50 Ω',
      opts: { fixture: 'impedance', parameter: 'Y', floorDb: -40 },
      k: 0,
      x: inv(Z),
      unit: 1 / 50,
    },
  ];
  for (const c of cases) {
    it(c.label, () => {
      const s = stats({ ...c.opts, seed: 7 }, Z, c.k, c.x);
      const want = 10 ** (c.opts.floorDb! / 10) * c.unit ** 2;
      within(s.meanSq, want, SE_MEAN);
      // equal split over the components, zero mean, no correlation (complex circular Gaussian)
      within(s.re2, want / 2, SE_COMPONENT);
      within(s.im2, want / 2, SE_COMPONENT);
      const sdC = Math.sqrt(want / 2);
      expect(Math.abs(s.meanRe)).toBeLessThan((4 * sdC) / Math.sqrt(N));
      expect(Math.abs(s.meanIm)).toBeLessThan((4 * sdC) / Math.sqrt(N));
      expect(Math.abs(s.reIm / (want / 2))).toBeLessThan(4 / Math.sqrt(N));
    });
  }

  it('the floor does not depend on the signal: the same E|n|² at |S11| = 0.03 and |S11| = 0.97', () => {
    const near = { re: 51, im: 2 }; // Γ ≈ 0.022
    const far = { re: 1, im: 3000 }; // Γ ≈ 0.999
    const a = stats({ fixture: 'reflection', floorDb: -50, seed: 3 }, near, 0, gammaOf(near, 50));
    const b = stats({ fixture: 'reflection', floorDb: -50, seed: 4 }, far, 0, gammaOf(far, 50));
    within(a.meanSq, 1e-5, SE_MEAN);
    within(b.meanSq, 1e-5, SE_MEAN);
  });
});

describe('trace: E|n|² = (traceNoise·|x|)²', () => {
  it('reflection S11, |x| = |Γ(30 + j40 Ω)|', () => {
    const x = gammaOf(Z, 50);
    const s = stats({ fixture: 'reflection', traceNoise: 1e-3, seed: 5 }, Z, 0, x);
    within(s.meanSq, 1e-6 * abs2(x), SE_MEAN);
    within(s.re2, 0.5e-6 * abs2(x), SE_COMPONENT);
  });

  it('impedance Z record: relative to |Z| = 50 Ω, independent of z0Ohm', () => {
    for (const z0Ohm of [50, 1000]) {
      const s = stats({ fixture: 'impedance', z0Ohm, traceNoise: 2e-3, seed: 6 }, Z, 0, Z);
      within(s.meanSq, (2e-3 * 50) ** 2, SE_MEAN);
    }
  });

  it('floor and trace add in quadrature: 10^(dB/10) + (trace·|x|)²', () => {
    const x = gammaOf(Z, 50);
    const s = stats({ fixture: 'reflection', floorDb: -60, traceNoise: 2e-3, seed: 8 }, Z, 0, x);
    within(s.meanSq, 1e-6 + 4e-6 * abs2(x), SE_MEAN);
  });

  it('2-port records: every entry gets its own draw (S21 and S12 noises uncorrelated)', () => {
    const rec = recordImpedances(FREQ, new Array(N).fill(Z), { fixture: 'series-thru', floorDb: -40, seed: 9 });
    const x21 = { re: (100 * 130) / (130 ** 2 + 40 ** 2), im: (-100 * 40) / (130 ** 2 + 40 ** 2) };
    let cross = 0;
    for (let i = 0; i < N; i++) cross += (rec.network.re[1][i] - x21.re) * (rec.network.re[2][i] - x21.re);
    // correlation coefficient of two independent samples: SE 1/√N
    expect(Math.abs(cross / N / 0.5e-4)).toBeLessThan(4 / Math.sqrt(N));
  });

  it('a negative trace is refused', () => {
    expect(() => recordImpedances(FREQ.slice(0, 3), [Z, Z, Z], { fixture: 'reflection', traceNoise: -1e-3 })).toThrow(
      /trace/,
    );
  });
});

describe('noiseDb: the older relative-only form x + |x|·σ·(g1 + j·g2), σ = 10^(dB/20)/√2', () => {
  it('E|n|² = |x|²·10^(dB/10)', () => {
    const x = gammaOf(Z, 50);
    const s = stats({ fixture: 'reflection', noiseDb: -50, seed: 10 }, Z, 0, x);
    within(s.meanSq, abs2(x) * 1e-5, SE_MEAN);
    expect(s.rec.noiseDb).toBe(-50);
  });

  it('relative only: a zero recorded value stays exactly zero (Z = Z0 gives S11 = 0); a floor does not', () => {
    const z0 = { re: 50, im: 0 };
    const only = recordImpedances(FREQ.slice(0, 100), new Array(100).fill(z0), {
      fixture: 'reflection',
      noiseDb: -40,
      seed: 2,
    });
    expect(only.network.re[0].every((v) => v === 0)).toBe(true);
    expect(only.network.im[0].every((v) => v === 0)).toBe(true);
    const floor = recordImpedances(FREQ.slice(0, 100), new Array(100).fill(z0), {
      fixture: 'reflection',
      floorDb: -40,
      seed: 2,
    });
    expect(floor.network.re[0].some((v) => v !== 0)).toBe(true);
  });

  it('combined with a floor and a trace, the three variances add', () => {
    const x = gammaOf(Z, 50);
    const s = stats({ fixture: 'reflection', noiseDb: -50, floorDb: -55, traceNoise: 3e-3, seed: 12 }, Z, 0, x);
    within(s.meanSq, abs2(x) * 1e-5 + 10 ** -5.5 + 9e-6 * abs2(x), SE_MEAN);
  });
});

describe('seeded noise', () => {
  const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };
  const spec = {
    model: X1,
    fixture: 'series-thru' as const,
    grid: { kind: 'centered' as const, centerHz: 1e8 / (2 * Math.PI), spanHz: 5000, points: 201 },
    floorDb: -70,
    traceNoise: 1e-3,
  };
  const file = (seed?: number) => {
    const s = synthesizeSweep({ ...spec, seed });
    return formatSynthFile(s, { kind: 'touchstone', version: 1, format: 'RI' });
  };

  it('the same seed gives the same file, byte for byte; the default seed is 1', () => {
    expect(file(17)).toBe(file(17));
    expect(file()).toBe(file(1));
  });

  it('another seed gives other noise (but the same noiseless data)', () => {
    const a = synthesizeSweep({ ...spec, seed: 17 });
    const b = synthesizeSweep({ ...spec, seed: 18 });
    expect(file(17)).not.toBe(file(18));
    expect(Array.from(a.network.re[2])).not.toEqual(Array.from(b.network.re[2]));
    expect(Array.from(a.impedance.zRe)).toEqual(Array.from(b.impedance.zRe));
  });
});
