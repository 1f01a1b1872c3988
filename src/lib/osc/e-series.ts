/**
 * E-series preferred values (IEC 60063:2015) and nearest-value lookup for load capacitors.
 *
 * The tables are hard-coded: they are not round(10^(i/n), 1) — E24 departs from that formula
 * at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2, E12 at 2.7 3.3 3.9 4.7 8.2, E6 at 3.3 4.7 (historical
 * rounding; IEC 60063:2015).
 *
 * Nearest value: write x = m·10^d with 1 ≤ m < 10; the candidates are series·10^d plus
 * 1.0·10^(d+1) (decade wrap); the winner minimises |ln(x/v)|, so the boundaries between two
 * neighbours sit at their geometric mean. Functions are scale-free: give farads, get farads.
 */

import { E_SERIES_NAMES, type ESeriesName } from '../schema/oscillators.ts';

export { E_SERIES_NAMES, type ESeriesName };

/** One decade of each series, IEC 60063:2015. */
export const E_SERIES: Readonly<Record<ESeriesName, readonly number[]>> = Object.freeze({
  E6: Object.freeze([1.0, 1.5, 2.2, 3.3, 4.7, 6.8]),
  E12: Object.freeze([1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]),
  E24: Object.freeze([
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
    9.1,
  ]),
});

/** True when `name` is one of E6, E12, E24. */
export function isESeriesName(name: string): name is ESeriesName {
  return (E_SERIES_NAMES as readonly string[]).includes(name);
}

/** Relative slack under which a value counts as sitting exactly on a preferred value. */
const ON_VALUE = 1e-9;

/** `mantissa · 10^exp` as the correctly rounded double (2.7e-12, not 2.7000000000000003e-12). */
function scaled(mantissa: number, exp: number): number {
  return Number(`${mantissa}e${exp}`);
}

/** Decade exponent d with 1 ≤ x/10^d < 10, robust to log10 rounding. */
function decadeOf(x: number): number {
  let d = Math.floor(Math.log10(x));
  if (x / scaled(1, d) >= 10) d += 1;
  if (x / scaled(1, d) < 1) d -= 1;
  return d;
}

/** Preferred values of a series from decade d−1 to d+1, ascending. */
function valuesAround(x: number, series: ESeriesName): number[] {
  const d = decadeOf(x);
  const out: number[] = [];
  for (const exp of [d - 1, d, d + 1]) for (const m of E_SERIES[series]) out.push(scaled(m, exp));
  out.push(scaled(1, d + 2));
  return out;
}

/**
 * Nearest preferred value to x (> 0) by minimum |ln(x/v)|, with decade wrap
 * (E24: 9.6 → 10, 9.5 → 9.1). Returns undefined for x ≤ 0 or non-finite x.
 */
export function nearestPreferred(x: number, series: ESeriesName): number | undefined {
  if (!(x > 0) || !Number.isFinite(x)) return undefined;
  let best: number | undefined;
  let bestDist = Infinity;
  for (const v of valuesAround(x, series)) {
    const dist = Math.abs(Math.log(x / v));
    if (dist < bestDist) {
      bestDist = dist;
      best = v;
    }
  }
  return best;
}

/**
 * Preferred values just below and just above x (> 0): floor ≤ x ≤ ceil. When x sits on a
 * preferred value (within 1e-9 relative) both are that value. Undefined for x ≤ 0.
 */
export function preferredNeighbours(x: number, series: ESeriesName): { floor: number; ceil: number } | undefined {
  if (!(x > 0) || !Number.isFinite(x)) return undefined;
  const values = valuesAround(x, series);
  const on = values.find((v) => Math.abs(x / v - 1) <= ON_VALUE);
  if (on !== undefined) return { floor: on, ceil: on };
  let floor = values[0];
  let ceil = values[values.length - 1];
  for (const v of values) {
    if (v < x) floor = v;
    else {
      ceil = v;
      break;
    }
  }
  return { floor, ceil };
}

/**
 * The preferred values around x: `below` values under the floor, the floor, the ceil and
 * `above` values over the ceil (no duplicates), ascending. Used to search capacitor pairs.
 */
export function preferredRange(x: number, series: ESeriesName, below: number, above: number): number[] {
  const n = preferredNeighbours(x, series);
  if (!n) return [];
  const step = (v: number, dir: 1 | -1): number => {
    const list = valuesAround(v, series);
    const i = list.findIndex((w) => Math.abs(w / v - 1) <= ON_VALUE);
    return list[i + dir];
  };
  const out = new Set<number>([n.floor, n.ceil]);
  let lo = n.floor;
  for (let i = 0; i < below; i++) out.add((lo = step(lo, -1)));
  let hi = n.ceil;
  for (let i = 0; i < above; i++) out.add((hi = step(hi, 1)));
  return [...out].sort((a, b) => a - b);
}
