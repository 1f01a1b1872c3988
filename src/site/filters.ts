/**
 * Catalogue filters typed in engineering notation, shared by the build (static page) and the
 * client script. A filter state lives in the URL query, so a link reproduces a view.
 *
 * Accepted forms (all values positive):
 * - a range `11.9M–12.1M`, `11.9M-12.1M`, `11.9 MHz .. 12.1 MHz`, `11.9M to 12.1M`;
 * - one-sided `>12M`, `>=12M`, `<12.1M`, `<=12.1M`, `12M+` (at least);
 * - a single value `12M`: within ±{@link SINGLE_VALUE_TOLERANCE} of it.
 * An "at most" field (ESR) takes one value: `50`, `50 ohm`, `50Ω`, `1k`.
 * A bare number has the field's default scale: capacitance fields read `8` as 8 pF.
 */
import type { ComplianceState, IndexEntry } from './types.ts';
import { SORT_KEYS, type SortKey } from './catalogue-columns.ts';
import { ID_COLLATOR } from '../lib/report/index-order.ts';
import { PREFIX_SCALE } from '../lib/units/si.ts';
import { FIT_VERDICTS, fitFor, type FitVerdict } from '../lib/report/fits.ts';

/** Relative half-width of the window a single value stands for (1 %). */
export const SINGLE_VALUE_TOLERANCE = 0.01;

/** Unit words a field accepts after the prefix (case-insensitive); the empty unit is always allowed. */
export type FilterUnit = 'Hz' | 'F' | 'ohm';
const UNIT_WORDS: Record<FilterUnit, RegExp> = {
  Hz: /^hz$/i,
  F: /^f$/i,
  ohm: /^(?:ohms?|Ω|Ω|r)$/i,
};

/** An example value per unit for messages: a capacitance field never suggests "12M". */
const UNIT_EXAMPLE: Record<FilterUnit, string> = { Hz: '12M', F: '8p', ohm: '50' };

/** Default scale of a bare number per unit (a capacitance typed as `8` means 8 pF). */
const BARE_SCALE: Record<FilterUnit, number> = { Hz: 1, F: 1e-12, ohm: 1 };

export type ParsedValue = { ok: true; value: number } | { ok: false; message: string };

/**
 * Parse one positive value in engineering notation: `11.9M`, `12 MHz`, `8p`, `8 pF`, `50`,
 * `50 ohm`, `2.2k`. Returns the SI value or a terse message.
 */
export function parseEngValue(text: string, unit: FilterUnit): ParsedValue {
  const t = text.trim();
  const m = /^(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?\s*(.*)$/.exec(t);
  if (!m) return { ok: false, message: `expected a number such as "${UNIT_EXAMPLE[unit]}", got "${t}"` };
  let value = Number(m[1]) * (m[2] ? 10 ** Number(m[2]) : 1);
  const rest = m[3].trim();
  if (rest === '') return { ok: true, value: value * BARE_SCALE[unit] };
  const words = UNIT_WORDS[unit];
  // Try the longest prefix first so "MEG" wins over "M"; a bare unit ("F") wins over a prefix ("f").
  if (words.test(rest)) return { ok: true, value };
  for (const p of ['MEG', 'meg', ...Object.keys(PREFIX_SCALE)]) {
    if (p === '' || !rest.startsWith(p)) continue;
    const after = rest.slice(p.length).trim();
    if (after === '' || words.test(after)) {
      value *= PREFIX_SCALE[p.toUpperCase() === 'MEG' ? 'MEG' : p];
      return { ok: true, value };
    }
  }
  return {
    ok: false,
    message: `expected a value in ${unit === 'ohm' ? 'ohm' : unit} such as "${UNIT_EXAMPLE[unit]}", got "${t}"`,
  };
}

/** A closed interval; either end may be open (infinite). */
export interface Interval {
  min: number;
  max: number;
}

export type ParsedRange = { ok: true; range: Interval } | { ok: false; message: string };

/** Parse a range filter (see the module note for the forms). Empty text means "no filter". */
export function parseRangeFilter(text: string, unit: FilterUnit): ParsedRange | undefined {
  const t = text.trim();
  if (t === '') return undefined;
  const one = /^(>=|<=|≥|≤|>|<)\s*(.+)$/.exec(t);
  if (one) {
    const v = parseEngValue(one[2], unit);
    if (!v.ok) return v;
    return { ok: true, range: /[>≥]/.test(one[1]) ? { min: v.value, max: Infinity } : { min: 0, max: v.value } };
  }
  if (t.endsWith('+')) {
    const v = parseEngValue(t.slice(0, -1), unit);
    return v.ok ? { ok: true, range: { min: v.value, max: Infinity } } : v;
  }
  // The separator is a dash, en dash, em dash, '..' or 'to'; an exponent's minus ('1e-3') is not one.
  const two = /^(.+?[^eE\s]|\d)\s*(?:–|—|-|\.\.|\bto\b)\s*(.+)$/.exec(t);
  if (two) {
    const lo = parseEngValue(two[1], unit);
    if (!lo.ok) return lo;
    const hi = parseEngValue(two[2], unit);
    if (!hi.ok) return hi;
    if (lo.value > hi.value) return { ok: false, message: `expected the lower bound first, got "${t}"` };
    return { ok: true, range: { min: lo.value, max: hi.value } };
  }
  const v = parseEngValue(t, unit);
  if (!v.ok) return v;
  return {
    ok: true,
    range: { min: v.value * (1 - SINGLE_VALUE_TOLERANCE), max: v.value * (1 + SINGLE_VALUE_TOLERANCE) },
  };
}

/** Parse an "at most" filter: one value, or empty for none. */
export function parseAtMostFilter(text: string, unit: FilterUnit): ParsedRange | undefined {
  const t = text.trim().replace(/^(<=|≤|<)\s*/, '');
  if (t === '') return undefined;
  const v = parseEngValue(t, unit);
  return v.ok ? { ok: true, range: { min: 0, max: v.value } } : v;
}

/** The catalogue view as text, exactly as it appears in the form and the URL query. */
export interface FilterState {
  /** Free text for the fuzzy search. */
  q: string;
  /** Frequency range of the main mode. */
  f: string;
  /** ESR (R1 of the main mode) at most. */
  esr: string;
  /** Load capacitance for the nominal frequency, range. */
  cl: string;
  kind: string;
  pkg: string;
  /** Overtone order of the main mode, '' for any. */
  ot: string;
  state: '' | ComplianceState;
  /** Oscillator circuit whose fit columns are shown ('' for none). */
  circuit: string;
  /** Fit verdict in that circuit, '' for any. */
  fit: '' | FitVerdict;
  /** Sort column key and direction. */
  sort: SortKey;
  dir: 'asc' | 'desc';
}

export { SORT_KEYS, type SortKey };

const FIELDS = ['q', 'f', 'esr', 'cl', 'kind', 'pkg', 'ot', 'state', 'circuit', 'fit', 'sort', 'dir'] as const;

/** The default view: everything, sorted by id. */
export function emptyFilterState(): FilterState {
  return {
    q: '',
    f: '',
    esr: '',
    cl: '',
    kind: '',
    pkg: '',
    ot: '',
    state: '',
    circuit: '',
    fit: '',
    sort: 'id',
    dir: 'asc',
  };
}

/** Read a filter state from URL query parameters (unknown values fall back to defaults). */
export function readFilterState(params: URLSearchParams): FilterState {
  const s = emptyFilterState();
  for (const k of FIELDS) {
    const v = params.get(k);
    if (v === null) continue;
    if (k === 'sort') s.sort = (SORT_KEYS as readonly string[]).includes(v) ? (v as SortKey) : 'id';
    else if (k === 'dir') s.dir = v === 'desc' ? 'desc' : 'asc';
    else if (k === 'state') s.state = (['pass', 'fail', 'unknown', 'warnings'] as const).find((x) => x === v) ?? '';
    else if (k === 'fit') s.fit = FIT_VERDICTS.find((x) => x === v) ?? '';
    else s[k] = v.slice(0, 200);
  }
  return s;
}

/** Write a filter state as URL query parameters, leaving defaults out. */
export function writeFilterState(state: FilterState): URLSearchParams {
  const params = new URLSearchParams();
  const d = emptyFilterState();
  for (const k of FIELDS) if (state[k] !== d[k]) params.set(k, state[k]);
  return params;
}

/** Parsed numeric filters plus the messages of fields that did not parse. */
export interface CompiledFilters {
  test: (e: IndexEntry) => boolean;
  errors: Partial<Record<'f' | 'esr' | 'cl', string>>;
}

function inRange(v: number | undefined, r: Interval | undefined): boolean {
  if (!r) return true;
  return v !== undefined && v >= r.min && v <= r.max;
}

/**
 * Turn a filter state into one predicate over index entries. A field that does not parse is
 * reported in `errors` and ignored (the user sees the message next to the field).
 */
export function compileFilters(state: FilterState): CompiledFilters {
  const errors: CompiledFilters['errors'] = {};
  const take = (key: 'f' | 'esr' | 'cl', parsed: ParsedRange | undefined): Interval | undefined => {
    if (!parsed) return undefined;
    if (!parsed.ok) {
      errors[key] = parsed.message;
      return undefined;
    }
    return parsed.range;
  };
  const f = take('f', parseRangeFilter(state.f, 'Hz'));
  const esr = take('esr', parseAtMostFilter(state.esr, 'ohm'));
  const cl = take('cl', parseRangeFilter(state.cl, 'F'));
  const ot = state.ot === '' ? undefined : Number(state.ot);
  const test = (e: IndexEntry) =>
    inRange(e.fsHz, f) &&
    inRange(e.r1Ohm, esr) &&
    inRange(e.clForNominalF, cl) &&
    (state.kind === '' || e.kind === state.kind) &&
    (state.pkg === '' || e.package === state.pkg) &&
    (ot === undefined || e.overtone === ot) &&
    (state.state === '' || e.state === state.state) &&
    (state.circuit === '' || state.fit === '' || fitFor(e.fits, state.circuit).verdict === state.fit);
  return { test, errors };
}

const COLLATOR = ID_COLLATOR;

/** Compare two entries by a sort key; missing values sort last in either direction. */
export function compareEntries(a: IndexEntry, b: IndexEntry, key: SortKey, dir: 'asc' | 'desc'): number {
  const va = a[key];
  const vb = b[key];
  if (va === undefined && vb === undefined) return COLLATOR.compare(a.id, b.id);
  if (va === undefined) return 1;
  if (vb === undefined) return -1;
  const sign = dir === 'asc' ? 1 : -1;
  const c = typeof va === 'number' && typeof vb === 'number' ? va - vb : COLLATOR.compare(String(va), String(vb));
  return c !== 0 ? sign * c : COLLATOR.compare(a.id, b.id);
}
