/**
 * Frequencies for messages: one prefix for a pair, and just enough decimals to tell the two
 * ends apart ("3.97 and 4.03 MHz").
 */

const PREFIXES: Array<[number, string]> = [
  [1e9, 'GHz'],
  [1e6, 'MHz'],
  [1e3, 'kHz'],
  [1, 'Hz'],
];

function unitFor(hz: number): [number, string] {
  const a = Math.abs(hz);
  for (const [s, u] of PREFIXES) if (a >= s) return [s, u];
  return [1, 'Hz'];
}

/** Digits after the point so that `value` shows at least `sig` significant digits. */
function decimalsFor(value: number, sig: number): number {
  if (value === 0) return sig - 1;
  const lead = Math.floor(Math.log10(Math.abs(value)));
  return Math.max(0, sig - 1 - lead);
}

/** One frequency with `sig` significant digits (at least), e.g. formatFrequency(4.005879e6) → "4.006 MHz". */
export function formatFrequency(hz: number, sig = 4): string {
  const [s, u] = unitFor(hz);
  return `${(hz / s).toFixed(Math.min(decimalsFor(hz / s, sig), 12))} ${u}`;
}

/** "A and B unit" with the unit of the larger end and enough digits to differ. */
export function formatFrequencyRange(loHz: number, hiHz: number): string {
  const [s, u] = unitFor(Math.max(Math.abs(loHz), Math.abs(hiHz)));
  const a = loHz / s;
  const b = hiHz / s;
  let d = Math.max(decimalsFor(a, 3), decimalsFor(b, 3));
  while (d < 12 && a.toFixed(d) === b.toFixed(d)) d++;
  return `${a.toFixed(d)} and ${b.toFixed(d)} ${u}`;
}
