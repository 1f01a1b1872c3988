/**
 * The catalogue table's columns, each with its header, its sort key (a field of IndexEntry)
 * and how its cell is written: one list, so a column cannot lose its cell or its sort key.
 * The first column (the part, with its link and title) and the last (the state, with its
 * badge) are drawn by the table component itself; `cell` writes the plain numeric cells.
 */
import { formatHz, formatNumber, formatQty } from './format.ts';
import type { IndexEntry } from './types.ts';

/** One column of the catalogue table. */
export interface CatalogueColumn {
  /** Field of the index row the column sorts by. */
  key: keyof IndexEntry;
  label: string;
  /** Text of a numeric cell; absent for the part and state columns, which the table draws. */
  cell?: (e: IndexEntry) => string;
}

export const CATALOGUE_COLUMNS = [
  { key: 'id', label: 'Part' },
  { key: 'fsHz', label: 'fs', cell: (e) => formatHz(e.fsHz, 9) },
  { key: 'r1Ohm', label: 'R1', cell: (e) => formatQty(e.r1Ohm, 'Ω', 4) },
  { key: 'c0F', label: 'C0', cell: (e) => formatQty(e.c0F, 'F', 3) },
  { key: 'c1F', label: 'C1', cell: (e) => formatQty(e.c1F, 'F', 4) },
  { key: 'q', label: 'Q', cell: (e) => formatNumber(e.q, 3) },
  { key: 'clForNominalF', label: 'CL for nominal', cell: (e) => formatQty(e.clForNominalF, 'F', 3) },
  { key: 'samples', label: 'Samples', cell: (e) => String(e.samples) },
  { key: 'state', label: 'State' },
] as const satisfies ReadonlyArray<CatalogueColumn>;

/** Sort key of a column. */
export type SortKey = (typeof CATALOGUE_COLUMNS)[number]['key'];

/** Every column's sort key, in column order. */
export const SORT_KEYS: readonly SortKey[] = CATALOGUE_COLUMNS.map((c) => c.key);
