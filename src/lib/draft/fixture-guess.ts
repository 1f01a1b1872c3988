/**
 * The fixture of a sweep, read from its data (README: Measuring a part, step 2).
 *
 * - Z or Y data, and CSV impedance exports: `impedance`.
 * - One-port S: `reflection`.
 * - Two-port S: a reflection record leaves port 2 alone (S21 at the isolation floor, S22 unlike
 *   S11); a through fixture is symmetric. A part in series between the ports passes the signal
 *   at its series resonance and blocks it at the anti-resonance (|S21| peaks, then notches); a
 *   part from the line to ground shorts the signal at its series resonance (|S21| notches, then
 *   peaks). The order of the peak and the notch of |S21| inside the sweep decides; with only one
 *   of them inside (a narrow sweep), that one decides.
 */
import type { Fixture } from '../schema/part.ts';
import type { NetworkData } from '../sweep/sweep.ts';

export interface FixtureGuess {
  fixture: Fixture;
  /** Why, for the draft's comment. */
  reason: string;
  /** Undecided: the data show no peak or notch; the reason says what to check. */
  unsure?: boolean;
}

/** Guess the fixture of a network record. */
export function guessFixture(net: NetworkData): FixtureGuess {
  if (net.parameter !== 'S')
    return { fixture: 'impedance', reason: `${net.parameter} data are the impedance (or admittance) of the part` };
  if (net.ports === 1) return { fixture: 'reflection', reason: 'one-port S data are a reflection measurement' };
  const n = net.freqHz.length;
  const mag = (k: number, i: number) => Math.hypot(net.re[k][i], net.im[k][i]);
  const s21 = Float64Array.from({ length: n }, (_, i) => mag(2, i));
  let s21Max = 0;
  let asym = 0;
  for (let i = 0; i < n; i++) {
    s21Max = Math.max(s21Max, s21[i]);
    asym += Math.hypot(net.re[0][i] - net.re[3][i], net.im[0][i] - net.im[3][i]);
  }
  asym /= n;
  if (s21Max < 1e-3 && asym > 0.05) {
    return {
      fixture: 'reflection',
      reason: `|S21| stays below ${(20 * Math.log10(Math.max(s21Max, 1e-12))).toFixed(0)} dB and S22 differs from S11: port 2 is not connected through the part`,
    };
  }
  let imax = 0;
  let imin = 0;
  for (let i = 1; i < n; i++) {
    if (s21[i] > s21[imax]) imax = i;
    if (s21[i] < s21[imin]) imin = i;
  }
  const inside = (i: number) => i > 0 && i < n - 1;
  const db = (a: number, b: number) => (20 * Math.log10(a / b)).toFixed(1);
  const sorted = Float64Array.from(s21).sort();
  const median = sorted[n >> 1];
  const series = {
    fixture: 'series-thru' as const,
    reason: `|S21| peaks at the series resonance (${db(s21[imax], median)} dB above its median): the part passes the signal between the ports`,
  };
  const shunt = {
    fixture: 'shunt-thru' as const,
    reason: `|S21| notches at the series resonance (${db(median, s21[imin])} dB below its median): the part shorts the line to ground`,
  };
  if (inside(imax) && inside(imin)) return imax < imin ? series : shunt;
  if (inside(imax)) return series;
  if (inside(imin)) return shunt;
  return {
    fixture: 'series-thru',
    reason: '|S21| shows neither a peak nor a notch inside the sweep; check the fixture',
    unsure: true,
  };
}
