/**
 * One rule for a measured value with its standard uncertainty, used by the pages, the CLI text
 * and the CSV export (JSON keeps full precision). JCGM 100:2008 (GUM) §7.2.6: the uncertainty
 * is quoted with at most two significant digits and the value is rounded to the same decimal
 * place; §7.2.2 form 2 (the concise form): "100.021 47(35) g", where the number in parentheses
 * is u in units of the last digits of the value. Both therefore carry one unit. The "±" form is
 * avoided: §7.2.2 reserves it, by custom, for an interval of high confidence (expanded
 * uncertainty), not a standard uncertainty.
 *
 * Uncertainties are rounded to the nearest digit (§7.2.6 allows rounding up; we do not).
 */
import { SI_PREFIXES, prefixFor, type SiPrefix } from './si.ts';

/** Most significant digits a value is ever shown with (binary doubles hold about 15.9). */
const MAX_DIGITS = 15;

/** A value and its uncertainty rounded together, as decimal text in one scale. */
export interface RoundedMeasured {
  /** The value rounded to the uncertainty's last digit, in units of `prefix.scale`, as text ("-" for negatives). */
  value: string;
  /** The uncertainty with at most two significant digits, same scale and decimal place. */
  uncertainty: string;
  /** Decimals of both texts (negative: the last digit is tens or more; both are then integers). */
  decimals: number;
  /** The uncertainty as an integer in units of the last digit ("35" for 0.00035 g at 5 decimals). */
  lastDigits: bigint;
  prefix: SiPrefix;
}

const UNIT_PREFIX: SiPrefix = { scale: 1, symbol: '' };

/** Decimal exponent of the last kept digit of u rounded to two significant digits, and u in those units. */
function uncertaintyDigits(u: number): { place: number } {
  let place = Math.floor(Math.log10(u)) - 1;
  let count = Math.round(u / 10 ** place);
  if (count >= 100) {
    // 0.0999 → 0.10: the rounding carried into a third digit.
    place += 1;
    count = Math.round(u / 10 ** place);
  }
  return { place };
}

/** Digits of `x` (already scaled) rounded to `decimals` (may be negative), as plain decimal text. */
function fixedText(x: number, decimals: number): string {
  if (decimals >= 0) return x.toFixed(decimals);
  const step = 10 ** -decimals;
  return (Math.round(x / step) * step).toFixed(0);
}

/**
 * Round a value and its standard uncertainty together (GUM §7.2.6). `prefixed` picks an SI
 * prefix for the pair from the larger of |value| and u; otherwise the pair stays in the unit.
 * Returns undefined when u is absent, zero, negative or not finite (no uncertainty to state).
 */
export function roundMeasured(value: number, u: number | undefined, prefixed = true): RoundedMeasured | undefined {
  if (!Number.isFinite(value) || u === undefined || !Number.isFinite(u) || !(u > 0)) return undefined;
  let prefix = prefixed ? prefixFor(Math.max(Math.abs(value), u)) : UNIT_PREFIX;
  const { place } = uncertaintyDigits(u / prefix.scale);
  let decimals = -place;
  if (prefixed && decimals < 0) {
    // u's last digit in tens of the prefix (e.g. 300(500) µΩ): one prefix up shows it with decimals.
    const up = SI_PREFIXES[SI_PREFIXES.indexOf(prefix) - 1];
    if (up) {
      prefix = up;
      decimals += 3;
    }
  }
  const scaled = value / prefix.scale;
  const uScaled = u / prefix.scale;
  // At most MAX_DIGITS significant digits counted from the leading digit of the larger of the two.
  const lead = Math.floor(Math.log10(Math.max(Math.abs(scaled), uScaled)));
  decimals = Math.min(decimals, MAX_DIGITS - 1 - lead);
  const lastDigits = BigInt(Math.round(uScaled * 10 ** decimals));
  let valueText = fixedText(scaled, decimals);
  if (/^-0(\.0*)?$/.test(valueText)) valueText = valueText.slice(1);
  return { value: valueText, uncertainty: fixedText(uScaled, decimals), decimals, lastDigits, prefix };
}

/**
 * What goes in the parentheses of the concise form: u in units of the last digit ("35"), or
 * in the unit of the value when it reaches across the decimal point ("1.2" in 1234.5(1.2)).
 */
function conciseUncertainty(r: RoundedMeasured): string {
  if (r.decimals > 0 && r.lastDigits >= 10n ** BigInt(r.decimals)) return r.uncertainty;
  return r.decimals < 0 ? r.uncertainty : r.lastDigits.toString();
}

export interface MeasuredFormat {
  /** Minus sign to print (pages use U+2212, the command line '-'). */
  minus?: string;
  /** Significant digits of the value when there is no uncertainty to state. */
  fallbackDigits?: number;
  /** Whether the unit takes SI prefixes (false for ppm, °C and dimensionless numbers). */
  prefixed?: boolean;
}

/** The value alone in engineering notation (no uncertainty stated). */
function valueOnly(value: number, unit: string, digits: number, prefixed: boolean): string {
  const prefix = prefixed ? prefixFor(Math.abs(value)) : UNIT_PREFIX;
  let t = (value / prefix.scale).toPrecision(digits);
  if (t.includes('e')) t = String(Number(t));
  if (t.includes('.')) t = t.replace(/\.?0+$/, '');
  return joinUnit(t, `${prefix.symbol}${unit}`);
}

function joinUnit(number: string, unit: string): string {
  return unit ? `${number} ${unit}` : number;
}

/**
 * The concise form of a measured value (GUM §7.2.2, form 2): formatMeasured(100.02147, 0.00035, 'g')
 * → "100.02147(35) g"; formatMeasured(25.79883, 0.000955, 'Ω') → "25.79883(96) Ω". Without a
 * usable uncertainty (absent, zero) the value alone with `fallbackDigits` significant digits;
 * "—" for a missing value.
 */
export function formatMeasured(
  value: number | undefined,
  u: number | undefined,
  unit: string,
  options: MeasuredFormat = {},
): string {
  const { minus = '-', fallbackDigits = 6, prefixed = true } = options;
  if (value === undefined || !Number.isFinite(value)) return '—';
  const r = roundMeasured(value, u, prefixed);
  const text = r
    ? joinUnit(`${r.value}(${conciseUncertainty(r)})`, `${r.prefix.symbol}${unit}`)
    : valueOnly(value, unit, fallbackDigits, prefixed);
  return minus === '-' ? text : text.replace(/^-/, minus);
}

/** CSV cells of a measured value and its uncertainty in SI base units, rounded together; plain numbers when u is unusable. */
export function measuredCells(value: number, u: number | undefined): [string, string] {
  const r = roundMeasured(value, u, false);
  if (!r)
    return [String(Number(value.toPrecision(MAX_DIGITS))), u === undefined || !Number.isFinite(u) ? '' : String(u)];
  const plain = (t: string) =>
    Math.abs(Number(t)) !== 0 && (Math.abs(Number(t)) < 1e-4 || r.decimals > 20)
      ? Number(t).toExponential(Math.max(0, significant(t) - 1))
      : t;
  return [plain(r.value), plain(r.uncertainty)];
}

/** Significant digits of a plain decimal text ("0.00035" → 2, "100.02147" → 8). */
function significant(t: string): number {
  const digits = t.replace(/^-/, '').replace('.', '').replace(/^0+/, '');
  return Math.max(1, digits.length);
}
