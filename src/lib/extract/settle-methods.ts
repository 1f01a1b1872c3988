/**
 * What a mode publishes when its methods disagree.
 *
 * Each method rests on assumptions that the data may not meet; a method whose assumptions fail
 * here is shown with the reason (`notCredible`) but neither votes in the cross-check nor moves
 * the published value:
 * - closed form: needs the anti-resonance above the noise floor (fa-visibility.ts);
 * - conductance peak, half-power: need at least MIN_POINTS_PER_BANDWIDTH points per bandwidth
 *   (the peak and the ±45° points are read off the samples);
 * - least-squares fits: need residuals without structure (fit-bvd.ts `residualStructure`).
 * The published value is the preferred (first) credible method's. When credible methods still
 * disagree beyond their combined uncertainties, the spread between them is an effect the
 * statistics do not cover: it is added as a rectangular distribution of half-width the largest
 * difference, u² + Δ²/3 (ISO/IEC Guide 98-3, GUM 4.3.7), so the published uncertainty covers
 * every credible method within √3 u. A "methods disagree" verdict never sits beside an
 * uncertainty smaller than the disagreement.
 */
import { crossCheck } from './cross-check.ts';
import type { CrossCheck, MethodName, MethodValue } from './types.ts';

/** Why a method's assumptions fail for this mode, or undefined when they hold. */
export type Credibility = (method: MethodName) => string | undefined;

/** The settled cross-check of one quantity. */
export interface SettledQuantity {
  check: CrossCheck;
  /** The published value: the first credible method's. */
  value: number;
  /** Its standard uncertainty, widened to cover credible methods that disagree. */
  uncertainty: number;
  /** The method the value comes from. */
  method: MethodName;
}

/**
 * Settle one quantity.
 * @param values methods in order of preference (the first is the default source)
 * @param credibility why a method does not apply here
 * @param likelyCause text for a disagreement
 */
export function settleQuantity(
  quantity: CrossCheck['quantity'],
  values: MethodValue[],
  credibility: Credibility,
  likelyCause: string,
): SettledQuantity | undefined {
  if (values.length === 0) return undefined;
  const marked = values.map((v) => {
    const why = credibility(v.method);
    return why ? { ...v, notCredible: why } : v;
  });
  const credible = marked.filter((v) => v.notCredible === undefined);
  const voters = credible.length ? credible : marked.slice(0, 1);
  const pick = voters[0];
  const base = crossCheck(quantity, voters, likelyCause);
  const check: CrossCheck = { ...base, values: [...base.values, ...marked.filter((v) => !voters.includes(v))] };
  // A method without its own uncertainty inherits the preferred one's before any widening.
  let u = pick.uncertainty ?? values[0].uncertainty ?? 0;
  if (check.verdict === 'disagree') {
    let spread = 0;
    for (const v of voters) spread = Math.max(spread, Math.abs(v.value - pick.value));
    u = Math.sqrt(u * u + (spread * spread) / 3);
    check.message = `${check.message}; ${pick.method} kept, its uncertainty widened to ${u.toPrecision(2)} to cover them`;
  }
  return { check, value: pick.value, uncertainty: u, method: pick.method };
}
