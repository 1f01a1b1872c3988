/**
 * Curve decimation for plots: keep at most `maxPoints` points while preserving the shape.
 * The points are split into equal index buckets, and each bucket keeps its minimum and maximum
 * (in index order), so a narrow resonance dip or peak is never lost; the first and last points
 * and any indices the caller names (e.g. the resonance extremum) are always kept.
 */
import type { Curve } from './types.ts';

/** Default point budget per curve. */
export const MAX_CURVE_POINTS = 320;

/**
 * Indices to keep from `y` (length n): first, last, per-bucket min and max, and `keep`.
 * Non-finite values are skipped. The result is sorted and has at most `maxPoints` + keep.length entries.
 */
export function decimateIndices(y: ArrayLike<number>, maxPoints = MAX_CURVE_POINTS, keep: number[] = []): number[] {
  const n = y.length;
  if (n <= maxPoints) {
    const all: number[] = [];
    for (let i = 0; i < n; i++) if (Number.isFinite(y[i])) all.push(i);
    return all;
  }
  const chosen = new Set<number>();
  for (const k of keep) if (k >= 0 && k < n && Number.isFinite(y[k])) chosen.add(k);
  const buckets = Math.max(1, Math.floor((maxPoints - 2 - chosen.size) / 2));
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    let lo = -1;
    let hi = -1;
    for (let i = start; i < end; i++) {
      const v = y[i];
      if (!Number.isFinite(v)) continue;
      if (lo < 0 || v < y[lo]) lo = i;
      if (hi < 0 || v > y[hi]) hi = i;
    }
    if (lo >= 0) chosen.add(lo);
    if (hi >= 0) chosen.add(hi);
  }
  for (const edge of [0, n - 1]) if (Number.isFinite(y[edge])) chosen.add(edge);
  return [...chosen].sort((a, b) => a - b);
}

/** Round to `digits` significant digits (keeps JSON and SVG small); non-finite stays as is. */
export function roundSig(v: number, digits: number): number {
  if (!Number.isFinite(v) || v === 0) return v;
  return Number(v.toPrecision(digits));
}

export interface DecimateOptions {
  maxPoints?: number;
  /** Indices always kept. */
  keep?: number[];
  /** Significant digits kept in x and y (x needs many: resonances sit at ppm offsets). */
  xDigits?: number;
  yDigits?: number;
}

/** Decimate one curve given as parallel arrays; see {@link decimateIndices}. */
export function decimateCurve(x: ArrayLike<number>, y: ArrayLike<number>, opts: DecimateOptions = {}): Curve {
  const idx = decimateIndices(y, opts.maxPoints ?? MAX_CURVE_POINTS, opts.keep ?? []);
  const xd = opts.xDigits ?? 12;
  const yd = opts.yDigits ?? 5;
  return { x: idx.map((i) => roundSig(x[i], xd)), y: idx.map((i) => roundSig(y[i], yd)) };
}
