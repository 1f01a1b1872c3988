/**
 * What a CSV/TSV column holds, read from its name (README: The part record, "Sweep files").
 *
 * A name is matched by the words it contains, not by its exact text, so instrument exports read
 * as written: `Freq(Hz)`, `Trace1 |Z| (Ohm)`, `Trace2 Phase (deg)`, `Re(Z) [Ω]`, `Rs`, `Frequenz / kHz`.
 * - The unit is the last bracketed group (`()`, `[]`, `{}` or `<>`), a `/ unit` ending or a
 *   trailing unit word (`Frequency Hz`); a bracket holding a quantity (`Re(Z)`) stays part of the name.
 * - Trace and channel prefixes (`Trace1`, `Tr2`, `Ch1`, `Mem3`) are ignored.
 * - Names naming something other than an impedance (admittance, S-parameters, dB, series or
 *   parallel C/L, D, Q, time, index) are never taken.
 * - A name that fits two roles, or two columns that fit one role, is ambiguous: the record's
 *   `columns:` map says which column is which.
 */

import { SWEEP_COLUMN_ROLES, type SweepColumnRole } from '../schema/part.ts';

/** What an impedance sweep's columns can hold; the keys of a sweep's `columns:` map in the record. */
export const CSV_COLUMN_ROLES = SWEEP_COLUMN_ROLES;
export type CsvColumnRole = SweepColumnRole;

const FREQ_UNITS: Record<string, number> = { hz: 0, khz: 3, mhz: 6, ghz: 9 };
const OHM_WORDS = new Set(['ohm', 'ohms', 'Ω', 'Ω', 'ω']);
const OHM_PREFIX: Record<string, number> = { k: 3, K: 3, M: 6, m: -3 };
/** Phase units: true for radians. */
const PHASE_UNITS: Record<string, boolean> = {
  deg: false,
  degree: false,
  degrees: false,
  '°': false,
  rad: true,
  radian: true,
  radians: true,
};

const WORDS: Record<CsvColumnRole, Set<string>> = {
  frequency: new Set(['f', 'freq', 'frequency', 'frequencies', 'frequenz', 'fréquence', 'frecuencia']),
  resistance: new Set(['r', 're', 'real', 'resistance', 'rs', 'esr', 'zreal', 'rez']),
  reactance: new Set(['x', 'im', 'imag', 'imaginary', 'reactance', 'xs', 'zimag', 'imz']),
  magnitude: new Set(['|z|', 'mag', 'magnitude', 'abs', 'modulus', 'betrag', 'zmag', 'magz']),
  phase: new Set(['phase', 'theta', 'θ', 'phi', 'φ', 'angle', 'arg', 'ang', 'phasez', 'zphase']),
};
/** Words that say "impedance" without saying which part of it (alone: the magnitude). */
const IMPEDANCE_WORDS = new Set(['z', 'impedance', 'zs', 'imped']);
/** Words of quantities that are not the impedance: a column naming one is never taken. */
const OTHER_WORDS = new Set([
  'y',
  '|y|',
  'admittance',
  'g',
  'b',
  'gp',
  'bp',
  'conductance',
  'susceptance',
  's11',
  's21',
  's12',
  's22',
  'db',
  'log',
  'vswr',
  'swr',
  'rp',
  'xp',
  'cs',
  'cp',
  'ls',
  'lp',
  'c',
  'l',
  'd',
  'q',
  'time',
  't',
  'index',
  'point',
  'points',
  'no',
  'n',
  'number',
  'sample',
  'marker',
]);
/** Trace/channel prefixes and bare numbers: ignored. */
const IGNORED_WORD = /^(?:trace|trc|tr|ch|chan|channel|mem|meas|data)?\d*$/;
/** Bracket contents that are a quantity (part of the name), not a unit. */
const QUANTITY_IN_BRACKETS = /^(?:z|y|\|z\||\|y\||zs|impedance|admittance|s\d\d)$/i;
const OPENERS: Record<string, string> = { ')': '(', ']': '[', '}': '{', '>': '<' };

/** True when the text is a unit of a frequency, an impedance or a phase. */
export function isKnownUnit(text: string): boolean {
  const u = text.trim();
  if (u === '') return false;
  return FREQ_UNITS[u.toLowerCase()] !== undefined || PHASE_UNITS[u.toLowerCase()] !== undefined || isOhmUnit(u);
}

function isOhmUnit(u: string): boolean {
  if (OHM_WORDS.has(u.toLowerCase())) return true;
  return OHM_PREFIX[u[0]] !== undefined && OHM_WORDS.has(u.slice(1).toLowerCase());
}

/** A column name split into its name and unit (`''` when it has none). */
export function splitUnit(text: string): { name: string; unit: string } {
  const t = text.trim();
  const close = t[t.length - 1];
  const open = OPENERS[close];
  if (open !== undefined) {
    const at = t.lastIndexOf(open, t.length - 2);
    if (at >= 0) {
      const inside = t.slice(at + 1, -1).trim();
      if (!QUANTITY_IN_BRACKETS.test(inside)) return { name: t.slice(0, at).trim(), unit: inside };
    }
  }
  const slash = t.lastIndexOf('/');
  if (slash > 0 && isKnownUnit(t.slice(slash + 1)))
    return { name: t.slice(0, slash).trim(), unit: t.slice(slash + 1).trim() };
  const space = t.search(/\s\S+$/);
  if (space > 0 && isKnownUnit(t.slice(space + 1)))
    return { name: t.slice(0, space).trim(), unit: t.slice(space + 1).trim() };
  return { name: t, unit: '' };
}

/** The role a column name reads as: one role, several (ambiguous), or none. */
export function rolesOfName(name: string): CsvColumnRole[] {
  const tokens = (name.toLowerCase().match(/\|[^|]{0,8}\||[\p{L}\p{N}]+/gu) ?? [])
    .map((t) => t.replace(/\s+/g, ''))
    .filter((t) => !IGNORED_WORD.test(t));
  if (tokens.some((t) => OTHER_WORDS.has(t))) return [];
  const roles = CSV_COLUMN_ROLES.filter((role) => tokens.some((t) => WORDS[role].has(t)));
  if (roles.length === 0 && tokens.some((t) => IMPEDANCE_WORDS.has(t))) return ['magnitude'];
  return roles;
}

/**
 * Power of ten of a column unit to SI (Hz, ohm); for the phase 1 for radians, 0 for degrees;
 * or a message saying what was expected.
 */
export function unitShift(role: CsvColumnRole, unit: string): number | string {
  if (role === 'frequency') {
    if (unit === '') return 0;
    return FREQ_UNITS[unit.toLowerCase()] ?? 'expected a frequency unit (Hz, kHz, MHz, GHz)';
  }
  if (role === 'phase') {
    if (unit === '') return 0;
    const rad = PHASE_UNITS[unit.toLowerCase()];
    return rad === undefined ? 'expected a phase unit (deg or rad)' : rad ? 1 : 0;
  }
  if (unit === '' || OHM_WORDS.has(unit.toLowerCase())) return 0;
  const prefix = OHM_PREFIX[unit[0]];
  if (prefix !== undefined && OHM_WORDS.has(unit.slice(1).toLowerCase())) return prefix;
  return 'expected an impedance unit (ohm, mohm, kohm, Mohm)';
}

/** Frequency unit names for writers. */
export function frequencyUnitExponent(unit: 'Hz' | 'kHz' | 'MHz' | 'GHz'): number {
  return FREQ_UNITS[unit.toLowerCase()];
}

/** How a role is named in messages. */
export const ROLE_TEXT: Record<CsvColumnRole, string> = {
  frequency: 'frequency',
  resistance: 'resistance',
  reactance: 'reactance',
  magnitude: 'magnitude',
  phase: 'phase',
};
