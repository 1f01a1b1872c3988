/**
 * What an instrument recorded at each point, and the map from it to the device impedance.
 *
 * Every fixture conversion from the one recorded quantity that carries the receiver's noise
 * (S11, S21, Z or Y) is a bilinear (Möbius) map Z = (a·M + b)/(c·M + d), and so is every
 * open/short(/load) compensation of Z; a composition of such maps is one again. Keeping the four
 * complex coefficients per point lets the extraction evaluate the map, its inverse and its
 * derivative dZ/dM = (ad − bc)/(cM + d)² at any M: at the measured value before a fit, at the
 * model's value after one (so a point's weight does not depend on its own noise).
 */
import type { Complex } from './complex.ts';

/** Coefficients a, b, c, d of Z = (aM + b)/(cM + d). */
export type Bilinear = [Complex, Complex, Complex, Complex];

/** The recorded quantity of a sweep and its map to Z. */
export interface RecordedQuantity {
  name: 'S11' | 'S21' | 'Z' | 'Y';
  /** Recorded value per point (unitless for S, Ω for Z, S for Y). */
  re: Float64Array;
  im: Float64Array;
  /** Per point, [aRe, aIm, bRe, bIm, cRe, cIm, dRe, dIm] of Z = (aM + b)/(cM + d). */
  map: Float64Array;
}

/** Z = M: the map of a record that holds the impedance itself. */
export const IDENTITY: Bilinear = [
  { re: 1, im: 0 },
  { re: 0, im: 0 },
  { re: 0, im: 0 },
  { re: 1, im: 0 },
];

/** Store a map for point i. */
export function setMap(map: Float64Array, i: number, m: Bilinear): void {
  const o = 8 * i;
  for (let k = 0; k < 4; k++) {
    map[o + 2 * k] = m[k].re;
    map[o + 2 * k + 1] = m[k].im;
  }
}

/** The map of point i. */
export function mapAt(rec: RecordedQuantity, i: number): Bilinear {
  const o = 8 * i;
  const g = rec.map;
  return [
    { re: g[o], im: g[o + 1] },
    { re: g[o + 2], im: g[o + 3] },
    { re: g[o + 4], im: g[o + 5] },
    { re: g[o + 6], im: g[o + 7] },
  ];
}

/** Outer ∘ inner: Z = outer(inner(M)), as one map (the product of the 2×2 matrices). */
export function compose(outer: Bilinear, inner: Bilinear): Bilinear {
  const [p, q, r, s] = outer;
  const [a, b, c, d] = inner;
  return [add(mul(p, a), mul(q, c)), add(mul(p, b), mul(q, d)), add(mul(r, a), mul(s, c)), add(mul(r, b), mul(s, d))];
}

/** A record that holds Z itself: M = Z, identity map. */
export function impedanceRecord(zRe: Float64Array, zIm: Float64Array): RecordedQuantity {
  const n = zRe.length;
  const map = new Float64Array(8 * n);
  for (let i = 0; i < n; i++) setMap(map, i, IDENTITY);
  return { name: 'Z', re: zRe, im: zIm, map };
}

/** |dZ/dM| of point i at the recorded value m: |ad − bc|/|cM + d|². */
export function dZdMAbs(rec: RecordedQuantity, i: number, mRe: number, mIm: number): number {
  const o = 8 * i;
  const g = rec.map;
  const detRe = g[o] * g[o + 6] - g[o + 1] * g[o + 7] - (g[o + 2] * g[o + 4] - g[o + 3] * g[o + 5]);
  const detIm = g[o] * g[o + 7] + g[o + 1] * g[o + 6] - (g[o + 2] * g[o + 5] + g[o + 3] * g[o + 4]);
  const denRe = g[o + 4] * mRe - g[o + 5] * mIm + g[o + 6];
  const denIm = g[o + 4] * mIm + g[o + 5] * mRe + g[o + 7];
  return Math.hypot(detRe, detIm) / (denRe * denRe + denIm * denIm);
}

/** The recorded value that gives impedance z at point i: M = (dZ − b)/(a − cZ). */
export function recordedFor(rec: RecordedQuantity, i: number, z: Complex): Complex {
  const [a, b, c, d] = mapAt(rec, i);
  return div(sub(mul(d, z), b), sub(a, mul(c, z)));
}

function add(x: Complex, y: Complex): Complex {
  return { re: x.re + y.re, im: x.im + y.im };
}
function sub(x: Complex, y: Complex): Complex {
  return { re: x.re - y.re, im: x.im - y.im };
}
function mul(x: Complex, y: Complex): Complex {
  return { re: x.re * y.re - x.im * y.im, im: x.re * y.im + x.im * y.re };
}
function div(x: Complex, y: Complex): Complex {
  const d = y.re * y.re + y.im * y.im;
  return { re: (x.re * y.re + x.im * y.im) / d, im: (x.im * y.re - x.re * y.im) / d };
}
