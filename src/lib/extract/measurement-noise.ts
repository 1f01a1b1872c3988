/**
 * Noise of what the instrument recorded, estimated from each sweep's own data, and the
 * standard deviation it gives every impedance point.
 *
 * A receiver adds a floor independent of the signal and a trace noise proportional to it, so
 * the recorded quantity M (S11, S21, or Z/Y of an impedance analyser) carries, per real and
 * imaginary component, σ_M² = floor² + (trace·|M|)². Through the fixture conversion that
 * becomes σ_Z = |dZ/dM|·σ_M at each point (the sweep's map, src/lib/sweep/recorded.ts). Near the
 * anti-resonance of a reflection record, for example, |dZ/dS11| = |Z + Z0|²/(2·Z0) reaches
 * 10¹⁰ Ω, and a point there says almost nothing about Z; weighting by 1/σ_Z lets the fit use
 * each point for what it holds.
 *
 * Two estimates, both fitting the two variances to squared deviations e with mean
 * 2·(floor² + trace²·|M|²) (two components), by iteratively reweighted least squares for an
 * exponentially distributed e (the maximum-likelihood fit of a variance model to χ²₂ data):
 * - before any fit, from normalised second differences of M over frequency (they remove any
 *   locally linear trend; near a resonance the curve's own bend dominates, so deviations far
 *   above the current model are set aside as signal, not noise);
 * - after a fit, from the residuals carried back into M through the sweep's map, with the
 *   leverage of each point accounted for (fit-bvd.ts). This is the estimate the published uncertainties
 *   rest on.
 */
import { recordedOf, type ImpedanceSweep } from '../sweep/sweep.ts';
import { dZdMAbs, recordedFor, type RecordedQuantity } from '../sweep/recorded.ts';
import { select } from './sweep-noise.ts';

/** Noise of one sweep's recorded quantity, per real and imaginary component. */
export interface RecordedNoise {
  /** Additive floor, in units of the recorded quantity. */
  floor: number;
  /** Proportional trace noise, relative to |M|. */
  trace: number;
  /** Where the estimate came from. */
  from: 'differences' | 'residuals';
}

/**
 * Smallest relative noise assumed, of |M| and of the sweep's largest |M|: noiseless
 * (computed) data would otherwise give a zero σ. 1e-12 is far above double rounding
 * (2.2e-16) yet far below any instrument.
 */
export const MIN_RELATIVE_NOISE = 1e-12;

/**
 * Second differences more than this many times the current noise model are signal (a
 * resonance's bend), not noise. For χ²₂ data (exponential) the chance of a noise deviation
 * this large is e^−40 per point: none is lost in practice.
 */
const SIGNAL_FACTOR = 40;

/** IRLS rounds of the variance fit (it converges in a few). */
const VARIANCE_FIT_ROUNDS = 12;

/** The variance fit stops when both variances move by less than this fraction. */
const VARIANCE_TOLERANCE = 1e-3;

/**
 * σ_M² = floor² + trace²·|M|² fitted to e with E[e] = 2σ_M²: returns the two variances (a, b).
 * Maximum likelihood for exponential e (deviance Σ y/μ + ln μ, y = e/2, μ = a + b·|M|²) by
 * iteratively reweighted least squares (weights 1/μ²), each step projected onto a, b ≥ their
 * smallest values and accepted only when the deviance falls (else halved). The start takes a
 * from the quarter of the points with the smallest |M| and b from the quarter with the largest,
 * each as median/ln 2 (the median of an exponential is its mean·ln 2).
 */
function fitVariances(
  m2: Float64Array,
  e: Float64Array,
  use: Uint8Array | null,
  start?: { a: number; b: number },
): { a: number; b: number } {
  let count = 0;
  for (let i = 0; i < m2.length; i++) if (!use || use[i]) count++;
  if (count === 0) return { a: 0, b: 0 };
  const xs = new Float64Array(count);
  const ys = new Float64Array(count);
  let maxM2 = 0;
  for (let i = 0, j = 0; i < m2.length; i++) {
    if (use && !use[i]) continue;
    xs[j] = m2[i];
    ys[j] = e[i] / 2;
    if (m2[i] > maxM2) maxM2 = m2[i];
    j++;
  }
  const aMin = MIN_RELATIVE_NOISE * MIN_RELATIVE_NOISE * Math.max(maxM2, Number.MIN_VALUE);
  const bMin = MIN_RELATIVE_NOISE * MIN_RELATIVE_NOISE;
  let a: number;
  let b: number;
  if (start) {
    a = Math.max(start.a, aMin);
    b = Math.max(start.b, bMin);
  } else {
    const q = Math.max(0, (count >> 2) - 1);
    const lowM = select(Float64Array.from(xs), q);
    const highM = select(Float64Array.from(xs), count - 1 - q);
    const low: number[] = [];
    const high: number[] = [];
    for (let j = 0; j < count; j++) {
      if (xs[j] <= lowM) low.push(ys[j]);
      if (xs[j] >= highM) high.push(ys[j] / Math.max(xs[j], Number.MIN_VALUE));
    }
    const median = (v: number[]) => select(Float64Array.from(v), v.length >> 1);
    a = Math.max(median(low) / Math.LN2, aMin);
    b = Math.max(median(high) / Math.LN2, bMin);
  }
  const deviance = (va: number, vb: number): number => {
    let d = 0;
    for (let j = 0; j < count; j++) {
      const mu = va + vb * xs[j];
      d += ys[j] / mu + Math.log(mu);
    }
    return d;
  };
  let dev = deviance(a, b);
  for (let round = 0; round < VARIANCE_FIT_ROUNDS; round++) {
    let s00 = 0;
    let s01 = 0;
    let s11 = 0;
    let t0 = 0;
    let t1 = 0;
    for (let j = 0; j < count; j++) {
      const x = xs[j];
      const y = ys[j];
      const mu = a + b * x;
      const w = 1 / (mu * mu);
      s00 += w;
      s01 += w * x;
      s11 += w * x * x;
      t0 += w * y;
      t1 += w * x * y;
    }
    const det = s00 * s11 - s01 * s01;
    let na = det > 0 ? (s11 * t0 - s01 * t1) / det : t0 / s00;
    let nb = det > 0 ? (s00 * t1 - s01 * t0) / det : 0;
    // Projection onto the smallest values: refit the other with this one held.
    if (na < aMin) {
      na = aMin;
      nb = (t1 - aMin * s01) / s11;
    }
    if (nb < bMin) {
      nb = bMin;
      na = Math.max((t0 - bMin * s01) / s00, aMin);
    }
    let step = 1;
    let accepted = false;
    for (let h = 0; h < 30; h++) {
      const ta = Math.max(a + step * (na - a), aMin);
      const tb = Math.max(b + step * (nb - b), bMin);
      const td = deviance(ta, tb);
      if (td <= dev) {
        const settled = Math.abs(ta - a) <= VARIANCE_TOLERANCE * ta && Math.abs(tb - b) <= VARIANCE_TOLERANCE * tb;
        a = ta;
        b = tb;
        dev = td;
        accepted = !settled;
        break;
      }
      step /= 2;
    }
    if (!accepted) break;
  }
  return { a, b };
}

/** Largest |M|² of the points in use. */
function maxOf(m2: Float64Array): number {
  let max = 0;
  for (let i = 0; i < m2.length; i++) if (m2[i] > max) max = m2[i];
  return max;
}

function squaredMagnitudes(rec: RecordedQuantity): Float64Array {
  const n = rec.re.length;
  const m2 = new Float64Array(n);
  for (let i = 0; i < n; i++) m2[i] = rec.re[i] * rec.re[i] + rec.im[i] * rec.im[i];
  return m2;
}

function toNoise(v: { a: number; b: number }, m2: Float64Array, from: RecordedNoise['from']): RecordedNoise {
  const minFloor = MIN_RELATIVE_NOISE * Math.sqrt(maxOf(m2));
  return {
    floor: Math.max(Math.sqrt(Math.max(v.a, 0)), minFloor),
    trace: Math.max(Math.sqrt(Math.max(v.b, 0)), MIN_RELATIVE_NOISE),
    from,
  };
}

/**
 * Noise of the recorded quantity from its second differences (before any fit).
 * d_k = (h₋·M_{k+1} − (h₋ + h₊)·M_k + h₊·M_{k−1}) / √(h₋² + (h₋ + h₊)² + h₊²), with the
 * steps h₋ = f_k − f_{k−1}, h₊ = f_{k+1} − f_k: zero for a straight line whatever the steps,
 * and of the same spread as the noise of one point.
 */
export function noiseFromDifferences(sweep: ImpedanceSweep): RecordedNoise {
  const rec = recordedOf(sweep);
  const f = sweep.freqHz;
  const n = f.length;
  const all = squaredMagnitudes(rec);
  if (n < 3) return toNoise({ a: 0, b: 0 }, all, 'differences');
  const m2 = new Float64Array(n - 2);
  const e = new Float64Array(n - 2);
  for (let k = 1; k < n - 1; k++) {
    const hm = f[k] - f[k - 1];
    const hp = f[k + 1] - f[k];
    const norm = Math.sqrt(hm * hm + (hm + hp) * (hm + hp) + hp * hp);
    const dRe = (hm * rec.re[k + 1] - (hm + hp) * rec.re[k] + hp * rec.re[k - 1]) / norm;
    const dIm = (hm * rec.im[k + 1] - (hm + hp) * rec.im[k] + hp * rec.im[k - 1]) / norm;
    e[k - 1] = Number.isFinite(dRe) && Number.isFinite(dIm) ? dRe * dRe + dIm * dIm : 0;
    m2[k - 1] = all[k];
  }
  // Start from the lower half of the deviations (robust to the resonance), then set aside
  // what stands far above the model and refit.
  const use = new Uint8Array(e.length);
  const median = select(Float64Array.from(e), e.length >> 1);
  for (let i = 0; i < e.length; i++) use[i] = e[i] <= median ? 1 : 0;
  let v = fitVariances(m2, e, use);
  v = { a: v.a / LOWER_HALF_MEAN, b: v.b / LOWER_HALF_MEAN };
  for (let round = 0; round < 3; round++) {
    let kept = 0;
    for (let i = 0; i < e.length; i++) {
      const mu = 2 * (v.a + v.b * m2[i]);
      use[i] = mu > 0 && e[i] <= SIGNAL_FACTOR * mu ? 1 : 0;
      kept += use[i];
    }
    if (kept < 3) break;
    v = fitVariances(m2, e, use, v);
  }
  return toNoise(v, all, 'differences');
}

/**
 * Mean of an exponential variable below its median, as a fraction of its mean: with median
 * μ·ln 2, E[e | e ≤ median] = 2·μ·(1 − ½(1 + ln 2)) = μ·(1 − ln 2).
 */
const LOWER_HALF_MEAN = 1 - Math.LN2;

/** Noise of a sweep from a fit, and the fitted model at each point. */
export interface NoiseFromFit {
  noise: RecordedNoise;
  /** The recorded value the model predicts at each point (the map's inverse of Zmod). */
  modelM: { re: Float64Array; im: Float64Array };
  /** The model's impedance at each point, Ω. */
  modelZ: { re: Float64Array; im: Float64Array };
}

/**
 * Noise of the recorded quantity from a fit's residuals. The model's impedance Zmod = Zmeas − ΔZ
 * is carried back through the sweep's map to the recorded value it predicts, M_mod, and the
 * variance model is fitted to δM = Mmeas − M_mod against |M_mod|, not the measured |M|: where
 * the signal sits in the floor the measured |M| is itself noise and would pass the floor off
 * as trace noise.
 * @param measured the sweep's measured impedance, Ω
 * @param residuals Zmeas − Zmod per point, Ω, with each point's leverage factor (fit-bvd.ts),
 *   so that |δM|²·factor has expected value 2σ_M²
 */
export function noiseFromResiduals(
  rec: RecordedQuantity,
  measured: { zRe: Float64Array; zIm: Float64Array },
  residuals: { re: Float64Array; im: Float64Array; leverageFactor: Float64Array },
): NoiseFromFit {
  const n = residuals.re.length;
  const modelM = { re: new Float64Array(n), im: new Float64Array(n) };
  const modelZ = { re: new Float64Array(n), im: new Float64Array(n) };
  const m2 = new Float64Array(n);
  const e = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const z = { re: measured.zRe[i] - residuals.re[i], im: measured.zIm[i] - residuals.im[i] };
    let m = recordedFor(rec, i, z);
    if (!Number.isFinite(m.re) || !Number.isFinite(m.im)) m = { re: rec.re[i], im: rec.im[i] };
    modelZ.re[i] = z.re;
    modelZ.im[i] = z.im;
    modelM.re[i] = m.re;
    modelM.im[i] = m.im;
    m2[i] = m.re * m.re + m.im * m.im;
    const dRe = rec.re[i] - m.re;
    const dIm = rec.im[i] - m.im;
    e[i] = (dRe * dRe + dIm * dIm) * residuals.leverageFactor[i];
  }
  return { noise: toNoise(fitVariances(m2, e, null), m2, 'residuals'), modelM, modelZ };
}

/**
 * Standard deviation of each impedance point (per component), Ω: |dZ/dM|·√(floor² + trace²·|M|²),
 * both at the recorded value M.
 * @param at M per point to evaluate at (default the measured values; after a fit, the model's)
 */
export function impedanceSigmaOhm(
  rec: RecordedQuantity,
  noise: RecordedNoise,
  at?: { re: Float64Array; im: Float64Array },
): Float64Array {
  const n = rec.re.length;
  const out = new Float64Array(n);
  const a = noise.floor * noise.floor;
  const b = noise.trace * noise.trace;
  const mRe = at ? at.re : rec.re;
  const mIm = at ? at.im : rec.im;
  for (let i = 0; i < n; i++) {
    const mag2 = mRe[i] * mRe[i] + mIm[i] * mIm[i];
    out[i] = dZdMAbs(rec, i, mRe[i], mIm[i]) * Math.sqrt(a + b * mag2);
  }
  return out;
}
