/**
 * CSV/TSV impedance sweeps (README: The part record, "Sweep files"), read as instruments write them.
 *
 * - Blank lines and lines starting with `#` or `!` are comments. A preamble (instrument name,
 *   date, settings) may come before the header: the header is found as the first line that reads
 *   as column names followed by rows of numbers (src/lib/io/csv-header.ts), or given by the
 *   record (`headerLine:`). Its delimiter (`,`, `;` or tab, whichever occurs most outside quotes)
 *   is used for the whole file. Fields may be quoted with `"` (`""` inside quotes is a quote).
 * - Columns are found by the words in their names (src/lib/io/csv-columns.ts): the frequency and
 *   either resistance and reactance or magnitude and phase (degrees unless the unit says rad);
 *   units in the name (any brackets) or in a row of units under the header; defaults Hz, ohm,
 *   degrees. Other columns are ignored. When both forms are present, resistance and reactance are
 *   used. A record's `columns:` map says which column is which where names are ambiguous.
 * - Numbers use a decimal point. In `;`-separated files (the usual European spreadsheet export)
 *   a decimal comma is accepted as well (`1,5` = 1.5); thousands separators are not.
 * - Lines after the last data row whose frequency field is not a number (a summary such as
 *   `Average,…` or `END`) end the data; the same line between data rows is an error.
 * - Frequencies must be finite, non-negative and strictly rising; magnitudes non-negative.
 */
import { errorAt, InputError, type Issue } from '../issues.ts';
import type { ImpedanceSweep } from '../sweep/sweep.ts';
import { cosSinDeg } from '../sweep/complex.ts';
import {
  checkSweepText,
  MAX_ISSUES_PER_FILE,
  normalizeSweepLimits,
  quoteToken,
  shiftDecimalText,
  type SweepReadOptions,
} from './limits.ts';
import { looksNumeric, parseField, splitFields, type Delimiter } from './csv-fields.ts';
import { frequencyUnitExponent, type CsvColumnRole } from './csv-columns.ts';
import { findHeader, MAX_PREAMBLE_LINES, type CsvLayout, type ResolvedColumn, type TextLine } from './csv-header.ts';

export type { CsvColumnMap, CsvLayout } from './csv-header.ts';
export { CSV_COLUMN_ROLES, type CsvColumnRole } from './csv-columns.ts';

/** Options of {@link parseSweepCsv}: limit overrides (tests) and the record's layout hints. */
export interface SweepCsvOptions extends SweepReadOptions, CsvLayout {}

/** A CSV sweep with what the reader decided about the file. */
export interface SweepCsvRead {
  sweep: ImpedanceSweep;
  /** 1-based line of the header row; lines before it that are not comments were skipped as preamble. */
  headerLine: number;
  /** Non-blank, non-comment lines skipped before the header. */
  preambleLines: number;
  /** 1-based line of the row of units under the header, when there is one. */
  unitsLine?: number;
  delimiter: Delimiter;
  /** The columns used: name as written, 1-based number, unit as read. */
  columns: Partial<Record<CsvColumnRole, { name: string; number: number; unit: string }>>;
  /** Lines after the data that were taken as a summary, not data. */
  summaryLines: number[];
}

/**
 * Read an impedance sweep from CSV/TSV text.
 * @param text file contents
 * @param source file name for messages
 * @param opts limit overrides (tests) and the record's `headerLine` / `columns`
 * @returns frequencies in Hz and impedance in ohm
 * @throws InputError with every located issue found
 */
export function parseSweepCsv(text: string, source: string, opts: SweepCsvOptions = {}): ImpedanceSweep {
  return readSweepCsv(text, source, opts).sweep;
}

/** {@link parseSweepCsv} with what the reader found: header line, preamble, columns, summary lines. */
export function readSweepCsv(text: string, source: string, opts: SweepCsvOptions = {}): SweepCsvRead {
  const limits = normalizeSweepLimits(opts);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const pre = checkSweepText(text, source, limits);
  if (pre.length) throw new InputError(pre);

  const issues: Issue[] = [];
  const add = (line: number | undefined, message: string, code: string): boolean => {
    if (issues.length >= MAX_ISSUES_PER_FILE) {
      issues.push(
        errorAt(source, line, `too many problems; stopped after ${MAX_ISSUES_PER_FILE}`, { code: 'too-many' }),
      );
      return false;
    }
    issues.push(errorAt(source, line, message, { code }));
    return true;
  };

  const search = findHeader(leadingLines(text, limits.maxLineChars, opts.headerLine), opts);
  if (!search.ok) {
    // Over-long lines before the header are reported as well: they are why no header was seen.
    throw new InputError([
      ...longLines(text, source, limits.maxLineChars, search.line),
      errorAt(source, search.line, search.message, { code: search.code }),
    ]);
  }
  const found = search.header;
  if (found.analysis.problems.length) {
    throw new InputError(
      found.analysis.problems.map((p) =>
        errorAt(source, p.onUnitsRow ? found.unitsLine!.no : found.line.no, p.message, { code: p.code }),
      ),
    );
  }
  const header = { line: found.line.no, cols: found.analysis.cols, width: found.names.length, delim: found.delim };
  const lastHeaderLine = found.unitsLine?.no ?? found.line.no;
  const useRx = header.cols.has('resistance');
  const colA = header.cols.get(useRx ? 'resistance' : 'magnitude')!;
  const colB = header.cols.get(useRx ? 'reactance' : 'phase')!;
  const colF = header.cols.get('frequency')!;

  const freqHz: number[] = [];
  const zRe: number[] = [];
  const zIm: number[] = [];
  /** Rows whose frequency is not a number: a summary when no data row follows them, else errors. */
  let pending: Array<{ line: number; message: string }> = [];
  let preambleLines = 0;
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
      going = add(
        lineNo,
        `line is ${raw.length} characters long, over the limit of ${limits.maxLineChars}`,
        'line-length',
      );
      continue;
    }
    const line = raw.trim();
    if (line === '' || line[0] === '#' || line[0] === '!') continue;
    if (lineNo <= lastHeaderLine) {
      if (lineNo < header.line) preambleLines++;
      continue;
    }
    const fields = splitFields(line, header.delim);
    if (fields === undefined) {
      going = add(lineNo, 'unterminated quoted field', 'csv-row');
      continue;
    }
    if (fields.every((f) => f.trim() === '')) continue;
    while (fields.length > header.width && fields[fields.length - 1].trim() === '') fields.pop();
    const fText = fields[colF.index];
    if (fText === undefined || !looksNumeric(fText, header.delim)) {
      const message =
        fields.length !== header.width
          ? `expected ${header.width} fields (as in the header, line ${header.line}), got ${fields.length}`
          : `column ${quoteToken(colF.text)}: ${parseField(fText, header.delim)}`;
      pending.push({ line: lineNo, message });
      if (pending.length > MAX_ISSUES_PER_FILE) pending = pending.slice(0, MAX_ISSUES_PER_FILE);
      continue;
    }
    if (pending.length) {
      for (const p of pending) if (going) going = add(p.line, p.message, 'csv-row');
      pending = [];
      if (!going) continue;
    }
    if (fields.length !== header.width) {
      going = add(
        lineNo,
        `expected ${header.width} fields (as in the header, line ${header.line}), got ${fields.length}`,
        'csv-row',
      );
      continue;
    }
    const get = (col: ResolvedColumn, phase = false): number | undefined => {
      const v = parseField(fields[col.index], header.delim, phase ? 0 : col.shift);
      if (typeof v === 'string') {
        going = add(lineNo, `column ${quoteToken(col.text)}: ${v}`, 'number');
        return undefined;
      }
      return v;
    };
    const f = get(colF);
    const a = get(colA);
    const b = get(colB, !useRx);
    if (f === undefined || a === undefined || b === undefined) continue;
    const fHz = f;
    if (fHz < 0) {
      going = add(lineNo, `negative frequency ${fHz} Hz`, 'frequency');
      continue;
    }
    const n = freqHz.length;
    if (n > 0 && !(fHz > freqHz[n - 1])) {
      going = add(
        lineNo,
        `frequency ${fHz} Hz is not above the previous one (${freqHz[n - 1]} Hz); frequencies must rise`,
        'frequency',
      );
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
        going = add(lineNo, `column ${quoteToken(colA.text)}: negative magnitude ${a}`, 'number');
        continue;
      }
      const [c, s] = colB.shift === 1 ? [Math.cos(b), Math.sin(b)] : cosSinDeg(b);
      freqHz.push(fHz);
      zRe.push(a * c);
      zIm.push(a * s);
    }
  }
  if (freqHz.length === 0 && issues.length === 0) {
    if (pending.length) for (const p of pending) add(p.line, p.message, 'csv-row');
    else issues.push(errorAt(source, header.line, 'no data rows after the header', { code: 'empty' }));
  }
  if (issues.length) throw new InputError(issues);
  const columns: SweepCsvRead['columns'] = {};
  for (const [role, col] of header.cols) columns[role] = { name: col.text, number: col.index + 1, unit: col.unit };
  return {
    sweep: { freqHz: Float64Array.from(freqHz), zRe: Float64Array.from(zRe), zIm: Float64Array.from(zIm), source },
    headerLine: header.line,
    preambleLines,
    unitsLine: found.unitsLine?.no,
    delimiter: header.delim,
    columns,
    summaryLines: pending.map((p) => p.line),
  };
}

/**
 * The first lines that are neither blank nor comments (enough for the header search), trimmed;
 * with a record's `headerLine`, that line (a leading `#` or `!` dropped) and the two after it.
 */
function leadingLines(text: string, maxLineChars: number, headerLine: number | undefined): TextLine[] {
  const out: TextLine[] = [];
  const want = MAX_PREAMBLE_LINES + 3;
  let pos = 0;
  let no = 0;
  while (pos < text.length && out.length < want) {
    let le = text.indexOf('\n', pos);
    if (le < 0) le = text.length;
    const raw = text.slice(pos, le);
    pos = le + 1;
    no++;
    if (raw.length > maxLineChars) continue;
    let line = raw.trim();
    if (headerLine !== undefined) {
      if (no < headerLine) continue;
      if (no === headerLine && (line[0] === '#' || line[0] === '!')) line = line.slice(1).trim();
      else if (out.length >= 3) break;
    }
    if (line === '' || line[0] === '#' || line[0] === '!') continue;
    out.push({ no, text: line });
  }
  return out;
}

/** Issues for over-long lines up to a line (all lines when `upTo` is undefined). */
function longLines(text: string, source: string, maxLineChars: number, upTo: number | undefined): Issue[] {
  if (text.length <= maxLineChars) return [];
  const out: Issue[] = [];
  let pos = 0;
  let no = 0;
  while (pos < text.length && out.length < MAX_ISSUES_PER_FILE) {
    let le = text.indexOf('\n', pos);
    if (le < 0) le = text.length;
    no++;
    if (upTo !== undefined && no >= upTo) break;
    if (le - pos > maxLineChars)
      out.push(
        errorAt(source, no, `line is ${le - pos} characters long, over the limit of ${maxLineChars}`, {
          code: 'line-length',
        }),
      );
    pos = le + 1;
  }
  return out;
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
  const unitExp = frequencyUnitExponent(unit);
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
