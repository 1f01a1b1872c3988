/**
 * SI quantities as written in part records: `12 MHz`, `12MHz`, `12e6 Hz`, `8 pF`, `80 ohm`,
 * `80 Ω`, `100 uW`, `100 µW`, `10 ppm`, `25 C`, `25 °C`, and ranges `-40 to 85 C`.
 * Values come back in SI base units (Hz, F, Ω, W, H, S, V, A, °C; ppm as a plain number of ppm).
 */

/** The dimensions a record field can ask for. */
export type UnitKind =
  | 'frequency'
  | 'capacitance'
  | 'resistance'
  | 'inductance'
  | 'power'
  | 'temperature'
  | 'ppm'
  | 'conductance'
  | 'voltage'
  | 'current'
  | 'time';

interface UnitDef {
  kind: UnitKind;
  /** Accepted spellings, case-sensitive (prefix case matters: m vs M). */
  symbols: string[];
  /** Whether SI prefixes are allowed. */
  prefixed: boolean;
}

const UNITS: UnitDef[] = [
  { kind: 'frequency', symbols: ['Hz', 'hz', 'HZ'], prefixed: true },
  { kind: 'capacitance', symbols: ['F'], prefixed: true },
  { kind: 'resistance', symbols: ['ohm', 'Ohm', 'ohms', 'Ohms', 'Ω', 'Ω', 'R'], prefixed: true },
  { kind: 'inductance', symbols: ['H'], prefixed: true },
  { kind: 'power', symbols: ['W'], prefixed: true },
  { kind: 'conductance', symbols: ['S', 'A/V'], prefixed: true },
  { kind: 'voltage', symbols: ['V', 'Vpp', 'Vrms'], prefixed: true },
  { kind: 'current', symbols: ['A'], prefixed: true },
  { kind: 'time', symbols: ['s'], prefixed: true },
  { kind: 'temperature', symbols: ['C', '°C', 'degC', '℃'], prefixed: false },
  { kind: 'ppm', symbols: ['ppm'], prefixed: false },
];

/** One SI prefix as printed: its multiplier and symbol. */
export interface SiPrefix {
  scale: number;
  symbol: string;
}

/**
 * The one SI prefix table of the project (BIPM SI Brochure, 9th ed., table 7), largest first:
 * what the pages, plots and command line print, and (with {@link PREFIX_ALIASES}) what the
 * record reader and the catalogue filters accept.
 */
export const SI_PREFIXES: readonly SiPrefix[] = [
  { scale: 1e12, symbol: 'T' },
  { scale: 1e9, symbol: 'G' },
  { scale: 1e6, symbol: 'M' },
  { scale: 1e3, symbol: 'k' },
  { scale: 1, symbol: '' },
  { scale: 1e-3, symbol: 'm' },
  { scale: 1e-6, symbol: 'µ' },
  { scale: 1e-9, symbol: 'n' },
  { scale: 1e-12, symbol: 'p' },
  { scale: 1e-15, symbol: 'f' },
  { scale: 1e-18, symbol: 'a' },
];

/** Other spellings read as a prefix: u and Greek mu for micro, K for kilo, MEG (SPICE) for mega (common practice). */
const PREFIX_ALIASES: Record<string, string> = { u: 'µ', μ: 'µ', K: 'k', MEG: 'M' };

/** Every prefix spelling accepted when reading, with its multiplier. */
export const PREFIX_SCALE: Readonly<Record<string, number>> = Object.freeze({
  ...Object.fromEntries(SI_PREFIXES.map((p) => [p.symbol, p.scale])),
  ...Object.fromEntries(
    Object.entries(PREFIX_ALIASES).map(([alias, symbol]) => [
      alias,
      SI_PREFIXES.find((p) => p.symbol === symbol)!.scale,
    ]),
  ),
});

/**
 * The engineering prefix for a magnitude: 1.2e7 → M. `slack` lets a value a hair below a
 * power of a thousand (999999.9999995) take the larger prefix.
 */
export function prefixFor(abs: number, slack = 1e-6): SiPrefix {
  const unit = SI_PREFIXES[4];
  if (!(abs > 0) || !Number.isFinite(abs)) return unit;
  for (const p of SI_PREFIXES) if (abs >= p.scale * (1 - slack)) return p;
  return SI_PREFIXES[SI_PREFIXES.length - 1];
}

/** What a unit kind is called in messages, with an example. */
export const UNIT_HINT: Record<UnitKind, string> = {
  frequency: 'a frequency such as "12 MHz"',
  capacitance: 'a capacitance such as "8 pF"',
  resistance: 'a resistance such as "80 ohm"',
  inductance: 'an inductance such as "10 mH"',
  power: 'a power such as "100 uW"',
  temperature: 'a temperature such as "25 C"',
  ppm: 'a relative value such as "10 ppm"',
  conductance: 'a transconductance such as "5 mA/V" or "5 mS"',
  voltage: 'a voltage such as "3.3 V"',
  current: 'a current such as "1 mA"',
  time: 'a time such as "1 ms"',
};

export type ParseResult = { ok: true; value: number } | { ok: false; message: string };

// Unambiguous digits and a tail that always matches: no backtracking, linear time on any text
// (`\d+\.?\d*` with `(.*)$` took minutes on a few thousand digits followed by line breaks).
const NUMBER = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([\s\S]*)$/;

/** Split a unit token into prefix multiplier and unit definition, or undefined. */
function resolveUnit(token: string): { mult: number; def: UnitDef } | undefined {
  for (const def of UNITS) {
    for (const sym of def.symbols) {
      if (token === sym) return { mult: 1, def };
      if (!def.prefixed || !token.endsWith(sym)) continue;
      const prefix = token.slice(0, token.length - sym.length);
      if (prefix in PREFIX_SCALE) return { mult: PREFIX_SCALE[prefix], def };
    }
  }
  // Case-insensitive fall-back for "OHM", "kOhm" and "mhz"-style spellings of unambiguous units.
  const lower = token.toLowerCase();
  for (const [suffix, def] of [
    ['ohms', UNITS[2]],
    ['ohm', UNITS[2]],
    ['hz', UNITS[0]],
  ] as const) {
    if (!lower.endsWith(suffix)) continue;
    const prefix = token.slice(0, token.length - suffix.length);
    const mult =
      PREFIX_SCALE[prefix] ??
      (prefix === 'K' || prefix === 'k' ? 1e3 : prefix.toLowerCase() === 'meg' ? 1e6 : undefined);
    if (mult !== undefined) return { mult, def };
  }
  return undefined;
}

/** Text quoted in a message, cut to 60 characters (a message never echoes a whole huge field). */
function clip(text: string): string {
  return text.length > 60 ? `${text.slice(0, 60)}…` : text;
}

/** Describe what was found for messages: `"8 pF" (a capacitance)`. */
function describe(text: string, found?: UnitKind): string {
  return found ? `"${text}" (a ${found === 'ppm' ? 'ppm value' : found})` : `"${text}"`;
}

/**
 * Parse one quantity of the expected kind. A bare number is refused (units are required),
 * except for `ppm` where a bare number is read as ppm.
 */
export function parseQuantity(text: string, expected: UnitKind): ParseResult {
  const trimmed = String(text).trim();
  const m = NUMBER.exec(trimmed);
  if (!m) return { ok: false, message: `expected ${UNIT_HINT[expected]}, got ${describe(clip(trimmed))}` };
  const value = Number(m[1]);
  const unitText = m[2].trim();
  if (!Number.isFinite(value)) return { ok: false, message: `expected a finite number, got "${clip(trimmed)}"` };
  if (unitText === '') {
    if (expected === 'ppm') return { ok: true, value };
    return { ok: false, message: `expected ${UNIT_HINT[expected]}, got "${clip(trimmed)}" with no unit` };
  }
  // "mhz" is how MHz is often typed (Touchstone and the CSV reader take units case-insensitively);
  // "mHz" is millihertz by SI, which no resonator record means: refused rather than guessed.
  if (unitText === 'mHz' || unitText === 'mHZ') {
    return {
      ok: false,
      message: `expected ${UNIT_HINT[expected]}, got ambiguous unit "${clip(unitText)}" in "${clip(trimmed)}" (write MHz for megahertz)`,
    };
  }
  const unit = unitText === 'mhz' ? { mult: 1e6, def: UNITS[0] } : resolveUnit(unitText);
  if (!unit)
    return {
      ok: false,
      message: `expected ${UNIT_HINT[expected]}, got unknown unit "${clip(unitText)}" in "${clip(trimmed)}"`,
    };
  if (unit.def.kind !== expected) {
    return { ok: false, message: `expected ${UNIT_HINT[expected]}, got ${describe(clip(trimmed), unit.def.kind)}` };
  }
  // Divide by the inverse for sub-unit prefixes: 100 / 1e6 is exactly 1e-4, 100 * 1e-6 is not.
  // (the divisor as the exact power of ten: Math.round(1 / 1e-18) is 999999999999999900)
  const scaled = unit.mult < 1 ? value / Number(`1e${Math.round(-Math.log10(unit.mult))}`) : value * unit.mult;
  return { ok: true, value: scaled };
}

export type RangeResult = { ok: true; min: number; max: number } | { ok: false; message: string };

/** Parse a range such as `-40 to 85 C`, `-40 C to 85 C`, `-40..85 C`. */
export function parseQuantityRange(text: string, expected: UnitKind): RangeResult {
  const trimmed = String(text).trim();
  // No `\s*` before the separator: with the lazy group it made long runs of spaces quadratic.
  const m = /^(.+?)(?:\bto\b|\.\.|…)\s*([\s\S]+)$/.exec(trimmed);
  if (!m) return { ok: false, message: `expected a range such as "-40 to 85 C", got "${clip(trimmed)}"` };
  const hi = parseQuantity(m[2], expected);
  if (!hi.ok) return hi;
  let lo = parseQuantity(m[1], expected);
  if (!lo.ok && NUMBER.exec(m[1].trim())?.[2] === '') {
    // Unit given once at the end: borrow it for the lower bound.
    const unit = NUMBER.exec(m[2].trim())?.[2] ?? '';
    lo = parseQuantity(`${m[1].trim()} ${unit}`, expected);
  }
  if (!lo.ok) return lo;
  if (!(lo.value < hi.value)) return { ok: false, message: `expected the lower bound first, got "${clip(trimmed)}"` };
  return { ok: true, min: lo.value, max: hi.value };
}

/**
 * Format a value in engineering notation with `digits` significant digits: formatSi(1.2e7, 'Hz') → "12 MHz".
 * Trailing zeros are kept only when `fixed` is true.
 */
export function formatSi(value: number, unit: string, digits = 4, fixed = false): string {
  if (!Number.isFinite(value)) return `— ${unit}`;
  if (value === 0) return `0 ${unit}`;
  let idx = SI_PREFIXES.indexOf(prefixFor(Math.abs(value), 1e-10));
  let mantissa = (value / SI_PREFIXES[idx].scale).toPrecision(digits);
  if (Math.abs(Number(mantissa)) >= 1000 && idx > 0) {
    idx -= 1;
    mantissa = (value / SI_PREFIXES[idx].scale).toPrecision(digits);
  }
  if (!fixed && mantissa.includes('.') && !mantissa.includes('e')) mantissa = mantissa.replace(/\.?0+$/, '');
  return `${mantissa} ${SI_PREFIXES[idx].symbol}${unit}`;
}
