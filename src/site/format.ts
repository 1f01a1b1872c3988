/**
 * Number formatting for the pages (engineering notation with SI prefixes), shared by the
 * build-time pages and the client scripts so both print the same text.
 */
import { formatSi } from '../lib/units/si.ts';
import { formatMeasured } from '../lib/units/measured.ts';
import type { PartKind } from '../lib/schema/part.ts';
import type { ComplianceState } from './types.ts';

/** Significant digits shown per quantity (the displayed digits the browser tests compare). */
export const DISPLAY_DIGITS = { fsHz: 10, r1Ohm: 4, c1F: 5, c0F: 4, l1H: 5, q: 4, clF: 3 } as const;

/**
 * formatSi with at least enough digits for the integer part of the mantissa: 610 µΩ with two
 * digits would print "6.1e+2 µΩ", so it gets three.
 */
export function si(v: number, unit: string, digits: number, fixed = false): string {
  const t = formatSi(v, unit, digits, fixed);
  return /e[+-]?\d/.test(t) ? formatSi(v, unit, Math.max(digits, 3), fixed) : t;
}

/** A frequency with 10 significant digits: "11.99965020 MHz" → trailing zeros trimmed. */
export function formatHz(v: number | undefined, digits: number = DISPLAY_DIGITS.fsHz): string {
  return v === undefined ? '—' : si(v, 'Hz', digits);
}

/** Any quantity in engineering notation, or an em dash when absent. */
export function formatQty(v: number | undefined, unit: string, digits = 4): string {
  return v === undefined || !Number.isFinite(v) ? '—' : si(v, unit, digits);
}

/** A dimensionless number with `digits` significant digits and thin-space grouping avoided. */
export function formatNumber(v: number | undefined, digits = 4): string {
  if (v === undefined || !Number.isFinite(v)) return '—';
  const abs = Math.abs(v);
  if (abs !== 0 && (abs >= 1e7 || abs < 1e-3)) return v.toExponential(digits - 1).replace('-', '−');
  return String(Number(v.toPrecision(digits))).replace('-', '−');
}

/** Signed ppm with `decimals` decimals: "+12.345 ppm". */
export function formatPpm(v: number | undefined, decimals = 2): string {
  if (v === undefined || !Number.isFinite(v)) return '—';
  return `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(decimals)} ppm`;
}

/**
 * A value with its standard uncertainty in the GUM's concise form (one rule for pages, CLI text
 * and CSV: src/lib/units/measured.ts): (24.8123, 0.05, 'Ω') → "24.812(50) Ω". Without an
 * uncertainty the value alone with at least `minDigits` (and four) significant digits.
 */
export function formatWithUncertainty(
  v: number | undefined,
  u: number | undefined,
  unit: string,
  minDigits = 3,
): string {
  return formatMeasured(v, u, unit, {
    minus: '−',
    fallbackDigits: Math.max(minDigits, 4),
    prefixed: unit !== '' && unit !== 'ppm' && unit !== '°C',
  });
}

/** Words for the compliance states. */
export const STATE_LABEL: Record<ComplianceState, string> = {
  pass: 'meets datasheet',
  fail: 'misses datasheet',
  unknown: 'not checked',
  warnings: 'has warnings',
};

/** Bytes as "12.3 kB". */
export function formatBytes(n: number): string {
  if (n < 1000) return `${n} B`;
  if (n < 1e6) return `${(n / 1000).toFixed(1)} kB`;
  return `${(n / 1e6).toFixed(2)} MB`;
}

/** Kind names for display. */
export const KIND_LABEL: Record<PartKind, string> = {
  'quartz-at': 'quartz, AT-cut',
  'quartz-tuning-fork': 'quartz tuning fork',
  ceramic: 'ceramic',
  saw: 'SAW',
  other: 'other',
};
