/**
 * Small complex-number helpers for the sweep conversions (S/Z/Y, fixture formulas,
 * compensation). Values are plain `{ re, im }` objects; the functions never mutate.
 * Angles are in radians unless the name says `Deg`.
 */

/** A complex number. */
export interface Complex {
  re: number;
  im: number;
}

/** Make a complex number. */
export function complex(re: number, im = 0): Complex {
  return { re, im };
}

/** a + b */
export function cAdd(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

/** a − b */
export function cSub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

/** a · b */
export function cMul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** a · k for real k */
export function cScale(a: Complex, k: number): Complex {
  return { re: a.re * k, im: a.im * k };
}

/**
 * a / b, scaled (Smith's algorithm) so that large or small magnitudes do not overflow.
 * Division by zero gives non-finite parts; callers check with {@link cIsFinite}.
 */
export function cDiv(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    if (b.re === 0) return { re: a.re / 0, im: a.im / 0 };
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

/** 1 / a */
export function cInv(a: Complex): Complex {
  return cDiv(ONE, a);
}

/** −a */
export function cNeg(a: Complex): Complex {
  return { re: -a.re, im: -a.im };
}

/** |a| */
export function cAbs(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** Argument of a, radians in (−π, π]. */
export function cArg(a: Complex): number {
  return Math.atan2(a.im, a.re);
}

/** √a, principal branch. */
export function cSqrt(a: Complex): Complex {
  const m = cAbs(a);
  const re = Math.sqrt((m + a.re) / 2);
  const im = Math.sqrt((m - a.re) / 2);
  return { re, im: a.im < 0 ? -im : im };
}

/** Complex number from magnitude and angle in degrees. */
export function cFromPolarDeg(mag: number, angleDeg: number): Complex {
  const [c, s] = cosSinDeg(angleDeg);
  return { re: mag * c, im: mag * s };
}

/** True when both parts are finite. */
export function cIsFinite(a: Complex): boolean {
  return Number.isFinite(a.re) && Number.isFinite(a.im);
}

/**
 * Cosine and sine of an angle in degrees, exact at multiples of 90° (so that a
 * Touchstone angle of 90 gives a purely imaginary value, not 6e-17 + 1j).
 */
export function cosSinDeg(angleDeg: number): [number, number] {
  const r = angleDeg % 360;
  if (r === 0) return [1, 0];
  if (r === 90 || r === -270) return [0, 1];
  if (r === 180 || r === -180) return [-1, 0];
  if (r === 270 || r === -90) return [0, -1];
  const a = (angleDeg * Math.PI) / 180;
  return [Math.cos(a), Math.sin(a)];
}

/** The complex constant 0. */
export const ZERO: Complex = Object.freeze({ re: 0, im: 0 });
/** The complex constant 1. */
export const ONE: Complex = Object.freeze({ re: 1, im: 0 });
