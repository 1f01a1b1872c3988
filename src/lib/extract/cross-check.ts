/**
 * Cross-check of one quantity between independent methods.
 *
 * Two values agree when they differ by at most 3 combined standard uncertainties
 * (√(u1² + u2²)), or by at most the quantity's tolerance below, which allows for the known
 * biases of the methods (typical disagreements between methods, derived from the BVD model;
 * IEC 60444-1/-3 accuracy claims) that their statistical uncertainties do not cover.
 * Every method is compared with the first (preferred) value; one disagreement makes the
 * verdict 'disagree', with a message naming the methods and the likely cause.
 *
 * Tolerances (relative) and why:
 * - fsHz 1 ppm: every method here estimates the motional fs itself (G peak, half-power
 *   geometric mean, fits); the zero-phase fr would differ by δ·fs (0.06 ppm X1, 2.2 ppm at low
 *   M) and is not compared. Coarse sampling and a known CL's stray (three-load fs) stay within it.
 * - r1Ohm 1 %: 1/Gmax and the fits share one definition; fixture series resistance moves all
 *   of them, so what remains is sampling and drive.
 * - c1F, l1H 2 %: load shift depends on CL, whose fixture stray is tens of fF; fs–fa on C0
 *   (derived from the BVD model); the older methods claim 3–7 % (IEC 60444-3 accuracy claim), ours do better.
 * - c0F 2 %: capacitive region vs fit; fixture capacitance and far modes (+ΣCk) shift the
 *   former (derived from the BVD model).
 * - q 2 %: follows from R1 and L1.
 */
import type { CrossCheck, MethodValue } from './types.ts';

/** Relative tolerance per quantity (see the module doc for the reasons). */
export const CROSS_CHECK_TOLERANCE: Record<CrossCheck['quantity'], number> = {
  fsHz: 1e-6,
  r1Ohm: 0.01,
  c1F: 0.02,
  l1H: 0.02,
  c0F: 0.02,
  q: 0.02,
};

/** How many combined standard uncertainties two agreeing values may differ by. */
export const AGREEMENT_SIGMAS = 3;

function describeTolerance(q: CrossCheck['quantity']): string {
  const t = CROSS_CHECK_TOLERANCE[q];
  return t < 1e-3 ? `${t * 1e6} ppm` : `${t * 100} %`;
}

function formatValue(q: CrossCheck['quantity'], v: number): string {
  switch (q) {
    case 'fsHz':
      return `${v.toFixed(3)} Hz`;
    case 'r1Ohm':
      return `${v.toPrecision(5)} Ω`;
    case 'c1F':
      return `${(v * 1e15).toPrecision(5)} fF`;
    case 'l1H':
      return `${(v * 1e3).toPrecision(5)} mH`;
    case 'c0F':
      return `${(v * 1e12).toPrecision(5)} pF`;
    case 'q':
      return v.toPrecision(5);
  }
}

/**
 * Compare the methods' values of one quantity. Non-finite values are dropped.
 * @param likelyCause text for a disagreement, e.g. "too few points across the resonance"
 */
export function crossCheck(
  quantity: CrossCheck['quantity'],
  values: MethodValue[],
  likelyCause = 'fixture parasitics or a model that misses a mode',
): CrossCheck {
  const vals = values.filter(
    (v) => Number.isFinite(v.value) && (v.uncertainty === undefined || Number.isFinite(v.uncertainty)),
  );
  const rule = `within ${AGREEMENT_SIGMAS} combined standard uncertainties or ${describeTolerance(quantity)}`;
  if (vals.length < 2) return { quantity, values: vals, verdict: 'single', rule };
  const ref = vals[0];
  const tol = CROSS_CHECK_TOLERANCE[quantity];
  const bad: Array<{ v: MethodValue; rel: number }> = [];
  for (const v of vals.slice(1)) {
    const diff = Math.abs(v.value - ref.value);
    const u = Math.hypot(v.uncertainty ?? 0, ref.uncertainty ?? 0);
    if (diff <= AGREEMENT_SIGMAS * u || diff <= tol * Math.abs(ref.value)) continue;
    bad.push({ v, rel: diff / Math.abs(ref.value) });
  }
  if (bad.length === 0) return { quantity, values: vals, verdict: 'agree', rule };
  const parts = bad.map(({ v, rel }) => {
    const size = quantity === 'fsHz' ? `${(rel * 1e6).toPrecision(3)} ppm` : `${(rel * 100).toPrecision(3)} %`;
    return `${v.method} ${formatValue(quantity, v.value)} differs from ${ref.method} ${formatValue(quantity, ref.value)} by ${size}`;
  });
  return {
    quantity,
    values: vals,
    verdict: 'disagree',
    rule,
    message: `${quantity}: ${parts.join('; ')}; likely cause: ${likelyCause}`,
  };
}
