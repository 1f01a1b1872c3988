/**
 * A table as one typed column list: each column declares its header together with how its
 * cell is made, so a header without a cell (or a cell without a header) cannot be written.
 * The component (src/components/DataTable.astro) prints the headers, and each cell carries
 * its header as `data-label` so narrow screens and print can show a row as a stacked list.
 */

export interface Column<T> {
  header: string;
  cell: (row: T) => string;
  /** Numbers: tabular digits (default true). */
  num?: boolean;
  /** Shown as code (file names). */
  code?: boolean;
}

export interface TableCell {
  text: string;
  label: string;
  num: boolean;
  code: boolean;
}

export interface TableView {
  /** Header of the row-header column, when rows have one. */
  rowHeader?: string;
  headers: string[];
  rows: Array<{ head?: string; cells: TableCell[] }>;
}

/** Lay out `items` with `columns`; `rowHead` (header and text) makes the first column a row header. */
export function tableView<T>(
  columns: ReadonlyArray<Column<T>>,
  items: readonly T[],
  rowHead?: { header: string; text: (row: T) => string },
): TableView {
  return {
    rowHeader: rowHead?.header,
    headers: columns.map((c) => c.header),
    rows: items.map((item) => ({
      head: rowHead?.text(item),
      cells: columns.map((c) => ({ text: c.cell(item), label: c.header, num: c.num ?? true, code: c.code ?? false })),
    })),
  };
}
