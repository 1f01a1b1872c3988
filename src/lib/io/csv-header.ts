/**
 * Where a CSV/TSV sweep's header is and which column is which (README: The part record,
 * "Sweep files").
 *
 * Instruments write a preamble (name, date, settings) before the header. The header is the first
 * line of at least two fields, not all numbers, followed (after an optional row of units) by a row
 * with at least two numbers; among such lines within the first {@link MAX_PREAMBLE_LINES} + 1
 * lines that are neither blank nor comments, the first whose names give the frequency and a pair
 * of impedance columns is taken, else the first that gives the frequency, else the first. A record
 * may fix the line (`headerLine:`) and say which column is which (`columns:`).
 */
import {
  CSV_COLUMN_ROLES,
  isKnownUnit,
  ROLE_TEXT,
  rolesOfName,
  splitUnit,
  unitShift,
  type CsvColumnRole,
} from './csv-columns.ts';
import { detectDelimiter, looksNumeric, splitFields, type Delimiter } from './csv-fields.ts';
import { quoteToken } from './limits.ts';

/** Lines of preamble searched before the header (blank and comment lines not counted). */
export const MAX_PREAMBLE_LINES = 30;

/** Which column holds what: a column's name as written in the header, or its number (1 = first). */
export type CsvColumnMap = Partial<Record<CsvColumnRole, string | number>>;

/** What a record may say about a CSV file's layout. */
export interface CsvLayout {
  /** 1-based line number of the header row. */
  headerLine?: number;
  columns?: CsvColumnMap;
}

/** A line that is neither blank nor a comment, trimmed, with its 1-based number. */
export interface TextLine {
  no: number;
  text: string;
}

export interface ResolvedColumn {
  index: number;
  /** The column's name as written. */
  text: string;
  unit: string;
  /** Power of ten to SI (Hz, ohm); for the phase 1 = radians, 0 = degrees. */
  shift: number;
}

/** A problem of the header, located at the header row or the units row. */
export interface HeaderProblem {
  message: string;
  code: string;
  /** The units row, when the problem is there. */
  onUnitsRow?: boolean;
}

export interface HeaderAnalysis {
  cols: Map<CsvColumnRole, ResolvedColumn>;
  problems: HeaderProblem[];
  /** 2: frequency and an impedance pair, no problem; 1: the frequency found; 0: otherwise. */
  score: number;
}

export interface FoundHeader {
  line: TextLine;
  delim: Delimiter;
  names: string[];
  /** The row of units under the header, when there is one. */
  unitsLine?: TextLine;
  analysis: HeaderAnalysis;
}

const norm = (s: string) => s.trim().toLowerCase().replace(/\s+/g, ' ');
const EXAMPLE = 'e.g. frequency (Hz),r (ohm),x (ohm)';

/** Which column is which, from the names, a units row and the record's map. */
export function analyzeHeader(
  names: string[],
  units: string[] | undefined,
  map: CsvColumnMap | undefined,
): HeaderAnalysis {
  const problems: HeaderProblem[] = [];
  const chosen = new Map<CsvColumnRole, number>();
  const width = names.length;
  const mapped = new Set<number>();
  if (map) {
    const byIndex = new Map<number, CsvColumnRole>();
    for (const role of CSV_COLUMN_ROLES) {
      const ref = map[role];
      if (ref === undefined) continue;
      let index: number;
      if (typeof ref === 'number') {
        index = ref - 1;
        if (!(Number.isInteger(ref) && ref >= 1 && ref <= width)) {
          problems.push({
            message: `columns.${role} in the record: column ${ref} does not exist; the header has ${width} columns`,
            code: 'csv-columns',
          });
          continue;
        }
      } else {
        const want = norm(ref);
        index = names.findIndex((n) => norm(n) === want);
        if (index < 0) index = names.findIndex((n) => norm(splitUnit(n).name) === want);
        if (index < 0) {
          problems.push({
            message: `columns.${role} in the record: no column named ${quoteToken(ref)} in the header; its columns are ${listNames(names)}`,
            code: 'csv-columns',
          });
          continue;
        }
      }
      const other = byIndex.get(index);
      if (other) {
        problems.push({
          message: `columns.${other} and columns.${role} in the record name the same column ${quoteToken(names[index].trim())}`,
          code: 'csv-columns',
        });
        continue;
      }
      byIndex.set(index, role);
      chosen.set(role, index);
      mapped.add(index);
    }
  }
  // By name, for the roles the map does not give, among the columns it does not name.
  const byName = new Map<CsvColumnRole, number[]>();
  const ambiguous: Array<{ index: number; roles: CsvColumnRole[] }> = [];
  names.forEach((raw, index) => {
    if (mapped.has(index)) return;
    const roles = rolesOfName(splitUnit(raw).name);
    if (roles.length === 1) byName.set(roles[0], [...(byName.get(roles[0]) ?? []), index]);
    else if (roles.length > 1) ambiguous.push({ index, roles });
  });
  const duplicated: CsvColumnRole[] = [];
  for (const role of CSV_COLUMN_ROLES) {
    if (chosen.has(role)) continue;
    const found = byName.get(role) ?? [];
    if (found.length === 1) chosen.set(role, found[0]);
    else if (found.length > 1) duplicated.push(role);
  }
  const rx = chosen.has('resistance') && chosen.has('reactance');
  const mp = chosen.has('magnitude') && chosen.has('phase');
  const needed = (role: CsvColumnRole) =>
    role === 'frequency' ||
    (!rx && !mp) ||
    (rx ? role === 'resistance' || role === 'reactance' : role === 'magnitude' || role === 'phase');
  for (const role of duplicated) {
    if (!needed(role)) continue;
    const [a, b] = byName.get(role)!.map((i) => names[i].trim());
    problems.push({
      message: `columns ${quoteToken(a)} and ${quoteToken(b)} both read as the ${ROLE_TEXT[role]}; say which one in the record: columns: { ${role}: ${a.length <= 40 && !a.includes('"') ? `"${a}"` : byName.get(role)![0] + 1} }`,
      code: 'csv-header',
    });
  }
  const unassigned = names.map((n, i) => ({ n: n.trim(), i })).filter(({ i }) => ![...chosen.values()].includes(i));
  const hint = (role: CsvColumnRole) => {
    const amb = ambiguous.find((a) => a.roles.includes(role));
    const example = amb ? names[amb.index].trim() : unassigned[0]?.n;
    const ambText = amb
      ? `; column ${quoteToken(names[amb.index].trim())} could be the ${amb.roles.map((r) => ROLE_TEXT[r]).join(' or the ')}`
      : '';
    const value =
      example !== undefined && example !== '' && example.length <= 40 && !example.includes('"')
        ? `"${example}"`
        : 'COLUMN-NUMBER';
    return `${ambText}; if a column holds the ${ROLE_TEXT[role]}, say which in the record: columns: { ${role}: ${value} }`;
  };
  if (!chosen.has('frequency') && !duplicated.includes('frequency')) {
    problems.push({
      message: `no frequency column (f, freq or frequency) in the header ${quoteToken(names.join(','), 80)}${hint('frequency')}`,
      code: 'csv-header',
    });
  }
  // Units: from the name, else from the units row.
  const cols = new Map<CsvColumnRole, ResolvedColumn>();
  let unitProblem = false;
  for (const [role, index] of chosen) {
    if (!needed(role)) continue;
    const text = names[index].trim();
    let unit = splitUnit(text).unit;
    let onUnitsRow = false;
    if (unit === '' && units && units[index] !== undefined) {
      unit = stripBrackets(units[index]);
      onUnitsRow = unit !== '';
    }
    const shift = unitShift(role, unit);
    if (typeof shift === 'string') {
      unitProblem = true;
      problems.push({ message: `column ${quoteToken(text)}: ${shift}, got ${unit}`, code: 'unit', onUnitsRow });
      continue;
    }
    cols.set(role, { index, text, unit, shift });
  }
  if (!rx && !mp && !unitProblem && !duplicated.some((r) => r !== 'frequency')) {
    const have = (['resistance', 'reactance', 'magnitude', 'phase'] as CsvColumnRole[])
      .filter((r) => chosen.has(r))
      .map((r) => quoteToken(names[chosen.get(r)!].trim()));
    const found = have.length ? `; found only ${have.join(', ')}` : '';
    const missing: CsvColumnRole = chosen.has('resistance')
      ? 'reactance'
      : chosen.has('reactance')
        ? 'resistance'
        : chosen.has('magnitude')
          ? 'phase'
          : chosen.has('phase')
            ? 'magnitude'
            : 'magnitude';
    problems.push({
      message: `expected resistance and reactance columns (r, x) or magnitude and phase columns (|z|, phase)${found}${hint(missing)}`,
      code: 'csv-header',
    });
  }
  if (rx) {
    cols.delete('magnitude');
    cols.delete('phase');
  }
  const score =
    problems.length === 0 && cols.has('frequency') ? 2 : cols.has('frequency') || chosen.has('frequency') ? 1 : 0;
  return { cols, problems, score };
}

function stripBrackets(cell: string): string {
  const t = cell.trim();
  return /^[([{<].*[)\]}>]$/.test(t) ? t.slice(1, -1).trim() : t;
}

function listNames(names: string[]): string {
  const shown = names.slice(0, 12).map((n) => quoteToken(n.trim()));
  return names.length > 12 ? `${shown.join(', ')} and ${names.length - 12} more` : shown.join(', ');
}

/** True when a row (split) is a row of units: no number, at least one known unit. */
function isUnitsRow(fields: string[], delim: Delimiter): boolean {
  return !fields.some((f) => looksNumeric(f, delim)) && fields.some((f) => isKnownUnit(stripBrackets(f)));
}

function countNumeric(fields: string[], delim: Delimiter): number {
  let n = 0;
  for (const f of fields) if (looksNumeric(f, delim)) n++;
  return n;
}

/** Outcome of the header search: the header, or why none was found (located). */
export type HeaderSearch =
  { ok: true; header: FoundHeader } | { ok: false; line?: number; message: string; code: string };

/**
 * Find the header among the first lines that are neither blank nor comments.
 * @param lines those lines, in order (the search looks at up to MAX_PREAMBLE_LINES + 3 of them)
 * @param layout the record's `headerLine` / `columns`
 */
export function findHeader(lines: TextLine[], layout: CsvLayout = {}): HeaderSearch {
  const candidates: FoundHeader[] = [];
  const limit = layout.headerLine !== undefined ? 1 : Math.min(lines.length, MAX_PREAMBLE_LINES + 1);
  const start = layout.headerLine !== undefined ? lines.findIndex((l) => l.no === layout.headerLine) : 0;
  if (layout.headerLine !== undefined && start < 0) {
    return {
      ok: false,
      line: layout.headerLine,
      message: `headerLine ${layout.headerLine} in the record: that line is blank, a comment or past the end of the file`,
      code: 'csv-header',
    };
  }
  for (let k = start; k < start + limit && k < lines.length; k++) {
    const line = lines[k];
    const delim = detectDelimiter(line.text);
    const names = splitFields(line.text, delim);
    if (names === undefined) {
      if (layout.headerLine !== undefined || k === 0)
        return { ok: false, line: line.no, message: 'header: unterminated quoted field', code: 'csv-header' };
      if (candidates.length > 0) break;
      continue;
    }
    const numeric = countNumeric(names, delim);
    const firstField = names.find((n) => n.trim() !== '');
    const isData =
      numeric === names.length || (numeric >= 2 && firstField !== undefined && looksNumeric(firstField, delim));
    if (isData) {
      // A data row: the header came before it, unless the candidates so far name no frequency
      // (a block of settings such as `Start,Stop,Points` over a row of numbers).
      if (candidates.some((c) => c.analysis.score >= 1)) break;
      if (candidates.length > 0) continue;
      return {
        ok: false,
        line: line.no,
        message: `expected a header row naming the columns (${EXAMPLE}), got data ${quoteToken(line.text)}`,
        code: 'csv-header',
      };
    }
    if (names.length < 2) {
      if (layout.headerLine !== undefined) {
        return {
          ok: false,
          line: line.no,
          message: `header has a single column ${quoteToken(line.text)}; expected columns separated by ',', ';' or tab`,
          code: 'csv-header',
        };
      }
      continue;
    }
    let next = lines[k + 1];
    let unitsLine: TextLine | undefined;
    let units: string[] | undefined;
    if (next) {
      const f = splitFields(next.text, delim);
      if (f && isUnitsRow(f, delim)) {
        unitsLine = next;
        units = f;
        next = lines[k + 2];
      }
    }
    if (next && layout.headerLine === undefined) {
      const f = splitFields(next.text, delim);
      // A data row that does not split (an unclosed quote) is the reader's to report.
      if (f && countNumeric(f, delim) < 2) continue;
    }
    const found: FoundHeader = { line, delim, names, unitsLine, analysis: analyzeHeader(names, units, layout.columns) };
    if (found.analysis.score === 2) return { ok: true, header: found };
    candidates.push(found);
  }
  if (candidates.length > 0) {
    const best = candidates.reduce((a, b) => (b.analysis.score > a.analysis.score ? b : a));
    return { ok: true, header: best };
  }
  if (lines.length === 0)
    return { ok: false, message: `no header row (expected a line naming the columns, ${EXAMPLE})`, code: 'empty' };
  const first = lines[0];
  if (
    lines
      .slice(0, MAX_PREAMBLE_LINES + 1)
      .every((l) => (splitFields(l.text, detectDelimiter(l.text)) ?? ['', '']).length < 2)
  ) {
    return {
      ok: false,
      line: first.no,
      message: `header has a single column ${quoteToken(first.text)}; expected columns separated by ',', ';' or tab`,
      code: 'csv-header',
    };
  }
  return {
    ok: false,
    line: first.no,
    message:
      `no header row followed by rows of numbers in the first ${MAX_PREAMBLE_LINES + 1} lines (blank and comment lines not counted); ` +
      `expected a line naming the columns (${EXAMPLE}); if the header is further down, say which line in the record: headerLine: LINE`,
    code: 'csv-header',
  };
}
