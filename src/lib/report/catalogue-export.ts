/**
 * The catalogue as a table for other tools (README: Reading a part page, "Catalogue export"):
 * `catalogue.csv` (RFC 4180: comma-separated, CRLF line ends, fields with a comma, quote or line
 * break quoted, quotes doubled) and `catalogue.json` (schema below, `schemaVersion`).
 *
 * One row per part (`row: part`: the summary the catalogue shows, from the first sample's main
 * mode) and one per sample (`row: sample`: that sample's main mode). Column names carry their
 * units (SI base units: Hz, Ω, F, H, W, ppm). Numbers are written in shortest round-trip form,
 * so a reader gets the very double the pages show. A text field that a spreadsheet would take for
 * a formula (starting with `=`, `+`, `-`, `@`, tab or carriage return) is written with a leading
 * `'` in the CSV (common practice against formula injection); the JSON holds the text as is.
 */
import { z } from 'zod';
import { PART_KINDS } from '../schema/part.ts';
import type { PartData } from './types.ts';

/** Bump when a column changes meaning or goes away (adding columns at the end keeps it). */
export const CATALOGUE_SCHEMA_VERSION = 1;

const num = z.number().finite().optional();
const text = z.string().optional();

export const CatalogueRowSchema = z.object({
  row: z.enum(['part', 'sample']),
  id: z.string(),
  sample: text,
  title: z.string(),
  kind: z.enum(PART_KINDS),
  package: text,
  supplier: text,
  supplierPart: text,
  overtone: z.number().int().positive().optional(),
  fsHz: num,
  fpHz: num,
  r1Ohm: num,
  c1F: num,
  l1H: num,
  c0F: num,
  q: num,
  clForNominalF: num,
  datasheetFrequencyHz: num,
  datasheetTolerancePpm: num,
  datasheetLoadCapacitanceF: num,
  datasheetSeriesResonant: z.boolean().optional(),
  datasheetEsrMaxOhm: num,
  datasheetC0MaxF: num,
  datasheetDriveMaxW: num,
  verdict: z.enum(['pass', 'fail', 'unknown', 'warnings']),
});

export const CatalogueExportSchema = z.object({
  schemaVersion: z.literal(CATALOGUE_SCHEMA_VERSION),
  /** Column order of the CSV, the keys of every row. */
  columns: z.array(z.string()),
  rows: z.array(CatalogueRowSchema),
});

export type CatalogueRow = z.output<typeof CatalogueRowSchema>;
export type CatalogueExport = z.output<typeof CatalogueExportSchema>;

export const CATALOGUE_COLUMNS = Object.keys(CatalogueRowSchema.shape) as Array<keyof CatalogueRow>;

/** The export of whole parts, in the order given (the index's order by id). */
export function catalogueExport(parts: PartData[]): CatalogueExport {
  return catalogueExportOf(parts.map(catalogueRows));
}

/** The export from each part's rows (as {@link catalogueRows} made them), in the order given. */
export function catalogueExportOf(rowsPerPart: CatalogueRow[][]): CatalogueExport {
  return { schemaVersion: CATALOGUE_SCHEMA_VERSION, columns: CATALOGUE_COLUMNS, rows: rowsPerPart.flat() };
}

/** One part's rows: its summary, then each sample's main mode. */
export function catalogueRows(p: PartData): CatalogueRow[] {
  const rows: CatalogueRow[] = [];
  {
    const ds = p.datasheet;
    const common = {
      id: p.id,
      title: p.title,
      kind: p.kind,
      package: p.package,
      supplier: p.supplier,
      supplierPart: p.supplierPart,
      datasheetFrequencyHz: ds?.frequencyHz,
      datasheetTolerancePpm: ds?.tolerancePpm,
      datasheetLoadCapacitanceF: typeof ds?.loadCapacitanceF === 'number' ? ds.loadCapacitanceF : undefined,
      datasheetSeriesResonant: ds?.loadCapacitanceF === undefined ? undefined : ds.loadCapacitanceF === 'series',
      datasheetEsrMaxOhm: ds?.esrMaxOhm,
      datasheetC0MaxF: ds?.c0MaxF,
      datasheetDriveMaxW: ds?.driveMaxW,
    };
    const s = p.summary;
    rows.push({
      row: 'part',
      ...common,
      overtone: s.overtone,
      fsHz: s.fsHz,
      fpHz: s.fpHz,
      r1Ohm: s.r1Ohm,
      c1F: s.c1F,
      l1H: s.l1H,
      c0F: s.c0F,
      q: s.q,
      clForNominalF: s.clForNominalF,
      verdict: s.state,
    });
    for (const sample of p.samples) {
      const mode = sample.mainMode && sample.mainMode.index >= 0 ? sample.modes[sample.mainMode.index] : undefined;
      const items = p.compliance.find((c) => c.sample === sample.id)?.items ?? [];
      const verdict = items.some((i) => i.verdict === 'fail')
        ? 'fail'
        : items.length > 0 && items.every((i) => i.verdict === 'pass')
          ? 'pass'
          : 'unknown';
      rows.push({
        row: 'sample',
        ...common,
        sample: sample.id,
        overtone: mode?.overtone,
        fsHz: mode?.fsHz,
        fpHz: mode?.fpHz,
        r1Ohm: mode?.r1Ohm,
        c1F: mode?.c1F,
        l1H: mode?.l1H,
        c0F: mode ? sample.c0F : undefined,
        q: mode?.q,
        verdict,
      });
    }
  }
  return rows;
}

/** One CSV field (RFC 4180 §2). */
function csvField(value: unknown): string {
  if (value === undefined || value === null) return '';
  if (typeof value === 'number') return Object.is(value, -0) ? '0' : String(value);
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  let s = String(value);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The export as CSV text: a header row of the column names, one line per row, CRLF. */
export function catalogueCsv(data: CatalogueExport): string {
  const lines = [data.columns.join(',')];
  for (const r of data.rows) lines.push(data.columns.map((c) => csvField((r as Record<string, unknown>)[c])).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
