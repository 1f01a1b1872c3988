/**
 * CSV/TSV impedance sweeps (README: The part record, "Sweep files").
 *
 * - Blank lines and lines starting with `#` or `!` are comments. The first other line is the
 *   header; its delimiter (`,`, `;` or tab, whichever occurs most outside quotes) is used for
 *   the whole file. Fields may be quoted with `"` (`""` inside quotes is a quote).
 * - Columns are found by name, case-insensitive, with an optional unit in `()` or `[]`:
 *   frequency `f`, `freq`, `frequency` (Hz, kHz, MHz, GHz; default Hz; `mhz` means MHz);
 *   resistance `r`, `re`, `real`, `resistance` and reactance `x`, `im`, `imag`, `reactance`;
 *   or magnitude `z`, `|z|`, `mag`, `magnitude` and phase `phase`, `theta` (deg by default,
 *   rad when the unit says so). Impedance units: ohm (`ohm`, `ohms`, `Ω`), `kohm`, `Mohm`,
 *   `mohm` (milliohm; the prefix is case-sensitive), default ohm. Other columns are ignored.
 *   When both forms are present, resistance and reactance are used.
 * - Numbers use a decimal point. In `;`-separated files (the usual European spreadsheet export)
 *   a decimal comma is accepted as well (`1,5` = 1.5); thousands separators are not.
 * - Frequencies must be finite, non-negative and strictly rising; magnitudes non-negative.
 */
import { errorAt, InputError, type Issue } from '../issues.ts';
import type { ImpedanceSweep } from '../sweep/sweep.ts';
import { cosSinDeg } from '../sweep/complex.ts';
import {
  checkSweepText,
  MAX_ISSUES_PER_FILE,
  normalizeSweepLimits,
  parseScaledDecimal,
  quoteToken,
  shiftDecimalText,
  type SweepReadOptions,
} from './limits.ts';

type Role = 'freq' | 'r' | 'x' | 'mag' | 'phase';
type Delimiter = ',' | ';' | '\t';

const ROLE_NAMES: Record<Role, string[]> = {
  freq: ['f', 'freq', 'frequency'],
  r: ['r', 're', 'real', 'resistance'],
  x: ['x', 'im', 'imag', 'reactance'],
  mag: ['z', '|z|', 'mag', 'magnitude'],
  phase: ['phase', 'theta'],
};
const ROLE_TEXT: Record<Role, string> = {
  freq: 'frequency',
  r: 'resistance',
  x: 'reactance',
  mag: 'magnitude',
  phase: 'phase',
};
const FREQ_UNITS: Record<string, number> = { hz: 0, khz: 3, mhz: 6, ghz: 9 };
const OHM_WORDS = new Set(['ohm', 'ohms', 'Ω', 'Ω', 'ω']);
const OHM_PREFIX: Record<string, number> = { k: 3, K: 3, M: 6, m: -3 };
/** Phase units: true for radians. */
const PHASE_UNITS: Record<string, boolean> = { deg: false, degree: false, degrees: false, '°': false, rad: true, radian: true, radians: true };
// `\d+(\.\d*)?`, not `\d+\.?\d*`: the latter backtracks quadratically on a long run of digits.
const NUMBER = /^[+-]?(\d+(?:\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const NOT_FINITE = /^[+-]?(nan|inf|infinity)$/i;

interface Column {
  index: number;
  text: string;
  /** Power of ten to SI (Hz, ohm), applied on the decimal text; for the phase: 1 = radians, 0 = degrees. */
  shift: number;
}

/**
 * Read an impedance sweep from CSV/TSV text.
 * @param text file contents
 * @param source file name for messages
 * @param opts limit overrides (tests)
 * @returns frequencies in Hz and impedance in ohm
 * @throws InputError with every located issue found
 */
export function parseSweepCsv(text: string, source: string, opts: SweepReadOptions = {}): ImpedanceSweep {
  const limits = normalizeSweepLimits(opts);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const pre = checkSweepText(text, source, limits);
  if (pre.length) throw new InputError(pre);

  const issues: Issue[] = [];
  const add = (line: number | undefined, message: string, code: string): boolean => {
    if (issues.length >= MAX_ISSUES_PER_FILE) {
      issues.push(errorAt(source, line, `too many problems; stopped after ${MAX_ISSUES_PER_FILE}`, { code: 'too-many' }));
      return false;
    }
    issues.push(errorAt(source, line, message, { code }));
    return true;
  };

  let header: { line: number; cols: Map<Role, Column>; width: number; delim: Delimiter; names: string[] } | undefined;
  const freqHz: number[] = [];
  const zRe: number[] = [];
  const zIm: number[] = [];
  let pos = 0;
  let lineNo = 0;
  let going = true;
  while (pos < text.length && going) {
    let le = text.indexOf('\n', pos);
    if (le < 0) le = text.length;
    const raw = text.slice(pos, le);
    pos = le + 1;
    lineNo++;
    if (raw.length > limits.maxLineChars) {
      going = add(lineNo, `line is ${raw.length} characters long, over the limit of ${limits.maxLineChars}`, 'line-length');
      continue;
    }
    const line = raw.trim();
    if (line === '' || line[0] === '#' || line[0] === '!') continue;

    if (!header) {
      header = readHeader(line, lineNo, source);
      continue;
    }
    const fields = splitFields(line, header.delim);
    if (fields === undefined) {
      going = add(lineNo, 'unterminated quoted field', 'csv-row');
      continue;
    }
    if (fields.every((f) => f.trim() === '')) continue;
    while (fields.length > header.width && fields[fields.length - 1].trim() === '') fields.pop();
    if (fields.length !== header.width) {
      going = add(lineNo, `expected ${header.width} fields (as in the header, line ${header.line}), got ${fields.length}`, 'csv-row');
      continue;
    }
    const get = (role: Role): number | undefined => {
      const col = header!.cols.get(role)!;
      const v = parseField(fields[col.index], header!.delim, role === 'phase' ? 0 : col.shift);
      if (typeof v === 'string') {
        going = add(lineNo, `column ${quoteToken(col.text)}: ${v}`, 'number');
        return undefined;
      }
      return v;
    };
    const useRx = header.cols.has('r');
    const f = get('freq');
    const a = get(useRx ? 'r' : 'mag');
    const b = get(useRx ? 'x' : 'phase');
    if (f === undefined || a === undefined || b === undefined) continue;
    const cols = header.cols;
    const fHz = f;
    if (fHz < 0) {
      going = add(lineNo, `negative frequency ${fHz} Hz`, 'frequency');
      continue;
    }
    const n = freqHz.length;
    if (n > 0 && !(fHz > freqHz[n - 1])) {
      going = add(lineNo, `frequency ${fHz} Hz is not above the previous one (${freqHz[n - 1]} Hz); frequencies must rise`, 'frequency');
      continue;
    }
    if (n >= limits.maxPoints) {
      add(lineNo, `more than ${limits.maxPoints} frequency points`, 'size');
      going = false;
      continue;
    }
    if (useRx) {
      freqHz.push(fHz);
      zRe.push(a);
      zIm.push(b);
    } else {
      if (a < 0) {
        going = add(lineNo, `column ${quoteToken(cols.get('mag')!.text)}: negative magnitude ${a}`, 'number');
        continue;
      }
      const mag = a;
      const [c, s] = cols.get('phase')!.shift === 1 ? [Math.cos(b), Math.sin(b)] : cosSinDeg(b);
      freqHz.push(fHz);
      zRe.push(mag * c);
      zIm.push(mag * s);
    }
  }
  if (!header) {
    issues.push(errorAt(source, undefined, 'no header row (expected a line naming the columns, e.g. frequency (Hz),r (ohm),x (ohm))', { code: 'empty' }));
  } else if (freqHz.length === 0 && issues.length === 0) {
    issues.push(errorAt(source, header.line, 'no data rows after the header', { code: 'empty' }));
  }
  if (issues.length) throw new InputError(issues);
  return { freqHz: Float64Array.from(freqHz), zRe: Float64Array.from(zRe), zIm: Float64Array.from(zIm), source };
}

/** Parse the header line; throws InputError when the columns cannot be used. */
function readHeader(line: string, lineNo: number, source: string) {
  const delim = detectDelimiter(line);
  const names = splitFields(line, delim);
  const issues: Issue[] = [];
  const fail = (message: string): never => {
    issues.push(errorAt(source, lineNo, message, { code: 'csv-header' }));
    throw new InputError(issues);
  };
  if (names === undefined) return fail('header: unterminated quoted field');
  if (names.every((n) => typeof parseField(n, delim) === 'number')) {
    fail(`expected a header row naming the columns (e.g. frequency (Hz),r (ohm),x (ohm)), got data ${quoteToken(line)}`);
  }
  if (names.length === 1) {
    fail(`header has a single column ${quoteToken(line)}; expected columns separated by ',', ';' or tab`);
  }
  const cols = new Map<Role, Column>();
  names.forEach((raw, index) => {
    const text = raw.trim();
    // No `\s*` after the lazy name (quadratic on long runs of spaces); the name is trimmed instead.
    const m = /^(.*?)(?:\(([^()]*)\)|\[([^[\]]*)\])$/.exec(text);
    const name = (m ? m[1].trim() : text).toLowerCase().replace(/\s+/g, ' ');
    const unit = m ? (m[2] ?? m[3]).trim() : '';
    const role = (Object.keys(ROLE_NAMES) as Role[]).find((r) => ROLE_NAMES[r].includes(name));
    if (!role) return;
    const prev = cols.get(role);
    if (prev) {
      issues.push(errorAt(source, lineNo, `columns ${quoteToken(prev.text)} and ${quoteToken(text)} both give the ${ROLE_TEXT[role]}`, { code: 'csv-header' }));
      return;
    }
    const shift = unitShift(role, unit);
    if (typeof shift === 'string') {
      issues.push(errorAt(source, lineNo, `column ${quoteToken(text)}: ${shift}, got ${unit}`, { code: 'unit' }));
      return;
    }
    cols.set(role, { index, text, shift });
  });
  if (!cols.has('freq')) {
    issues.push(errorAt(source, lineNo, `no frequency column (f, freq or frequency) in the header ${quoteToken(line, 80)}`, { code: 'csv-header' }));
  }
  const rx = cols.has('r') && cols.has('x');
  const mp = cols.has('mag') && cols.has('phase');
  if (!rx && !mp && !issues.some((i) => i.code === 'unit' || /both give/.test(i.message))) {
    const have = (['r', 'x', 'mag', 'phase'] as Role[]).filter((r) => cols.has(r)).map((r) => quoteToken(cols.get(r)!.text));
    const found = have.length ? `; found only ${have.join(', ')}` : '';
    issues.push(
      errorAt(source, lineNo, `expected resistance and reactance columns (r, x) or magnitude and phase columns (|z|, phase)${found}`, { code: 'csv-header' }),
    );
  }
  if (issues.length) throw new InputError(issues);
  if (rx) {
    cols.delete('mag');
    cols.delete('phase');
  }
  return { line: lineNo, cols, width: names.length, delim, names };
}

/** Power of ten of a column unit (phase: 1 for radians), or a message saying what was expected. */
function unitShift(role: Role, unit: string): number | string {
  if (role === 'freq') {
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

/** The delimiter occurring most often outside quotes (ties: tab, then `;`, then `,`). */
function detectDelimiter(line: string): Delimiter {
  const counts: Record<Delimiter, number> = { '\t': 0, ';': 0, ',': 0 };
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === '\t' || ch === ';' || ch === ',')) counts[ch]++;
  }
  let best: Delimiter = ',';
  for (const d of ['\t', ';', ','] as Delimiter[]) if (counts[d] > counts[best] || (counts[d] === counts[best] && counts[d] > 0 && best === ',')) best = d;
  return best;
}

/**
 * Split one line into fields; `undefined` when a quote is not closed. Pieces are sliced, not
 * added character by character (a 1 MB quoted field took 0.6 s that way).
 */
function splitFields(line: string, delim: Delimiter): string[] | undefined {
  if (line.indexOf('"') < 0) return line.split(delim);
  const out: string[] = [];
  let parts: string[] = [];
  const n = line.length;
  let i = 0;
  let quoted = false;
  for (;;) {
    if (quoted) {
      const q = line.indexOf('"', i);
      if (q < 0) return undefined;
      parts.push(line.slice(i, q));
      if (line.charCodeAt(q + 1) === 34) {
        parts.push('"');
        i = q + 2;
      } else {
        quoted = false;
        i = q + 1;
      }
      continue;
    }
    let j = i;
    while (j < n && line[j] !== '"' && line[j] !== delim) j++;
    parts.push(line.slice(i, j));
    if (j >= n) {
      out.push(parts.join(''));
      return out;
    }
    if (line[j] === '"') quoted = true;
    else {
      out.push(parts.join(''));
      parts = [];
    }
    i = j + 1;
  }
}

/** A finite number times 10^shift, or a message saying what is wrong. */
function parseField(field: string, delim: Delimiter, shift = 0): number | string {
  let s = field.trim();
  if (s === '') return 'empty value, expected a number';
  if (delim === ';' && s.indexOf(',') >= 0 && s.indexOf('.') < 0) s = s.replace(',', '.');
  if (NOT_FINITE.test(s)) return `value ${quoteToken(s)} is not a finite number`;
  if (!NUMBER.test(s)) return `expected a number, got ${quoteToken(field.trim())}`;
  const v = parseScaledDecimal(s, shift);
  if (!Number.isFinite(v)) return `value ${quoteToken(s)} is not a finite number`;
  return v;
}

/** Options of {@link formatSweepCsv}. */
export interface FormatSweepCsvOptions {
  /** Columns: resistance and reactance (default) or magnitude and phase in degrees. */
  form?: 'rx' | 'magphase';
  /** Field delimiter; default `,`. Numbers always use a decimal point. */
  delimiter?: Delimiter;
  /** Frequency unit of the first column; default Hz. */
  freqUnit?: 'Hz' | 'kHz' | 'MHz' | 'GHz';
}

/**
 * Write an impedance sweep as CSV with a header row that {@link parseSweepCsv} reads back;
 * numbers in shortest round-trip form (full double precision).
 */
export function formatSweepCsv(sweep: ImpedanceSweep, opts: FormatSweepCsvOptions = {}): string {
  const form = opts.form ?? 'rx';
  const d = opts.delimiter ?? ',';
  const unit = opts.freqUnit ?? 'Hz';
  const unitExp = FREQ_UNITS[unit.toLowerCase()];
  const head = form === 'rx' ? ['r (ohm)', 'x (ohm)'] : ['|z| (ohm)', 'phase (deg)'];
  const out = [[`frequency (${unit})`, ...head].join(d)];
  const num = (x: number) => (Object.is(x, -0) ? '0' : String(x));
  for (let i = 0; i < sweep.freqHz.length; i++) {
    const re = sweep.zRe[i];
    const im = sweep.zIm[i];
    const [a, b] = form === 'rx' ? [re, im] : [Math.hypot(re, im), (Math.atan2(im, re) * 180) / Math.PI];
    out.push([shiftDecimalText(sweep.freqHz[i], -unitExp), num(a), num(b)].join(d));
  }
  return `${out.join('\n')}\n`;
}
