/**
 * Catalogue "fits circuit" columns in the page: with a circuit chosen, the header gains the fit
 * columns and every listed row its cells (src/site/catalogue-fits.ts gives the texts); with none,
 * they go. Only the rows on the page are touched, so a keystroke costs the same with a circuit.
 */
import { FIT_HEADERS, fitCells } from '../site/catalogue-fits.ts';
import type { IndexEntry } from '../site/types.ts';

const COL = 'fit-col';

function headerCells(table: HTMLTableElement, circuit: string): void {
  const head = table.tHead?.rows[0];
  if (!head) return;
  const have = head.querySelectorAll(`th.${COL}`);
  if (!circuit) {
    have.forEach((th) => th.remove());
    return;
  }
  if (have.length === FIT_HEADERS.length) {
    have[have.length - 1].textContent = `Fits ${circuit}`;
    return;
  }
  have.forEach((th) => th.remove());
  FIT_HEADERS.forEach((label, i) => {
    const th = document.createElement('th');
    th.scope = 'col';
    th.className = COL;
    th.textContent = i === FIT_HEADERS.length - 1 ? `Fits ${circuit}` : label;
    head.appendChild(th);
  });
}

/** Show (or remove) the fit columns for `circuit` on the listed rows. */
export function showFits(
  table: HTMLTableElement,
  rows: HTMLTableRowElement[],
  byId: Map<string, IndexEntry>,
  circuit: string,
): void {
  headerCells(table, circuit);
  for (const tr of rows) {
    let cells = tr.querySelectorAll<HTMLTableCellElement>(`td.${COL}`);
    if (!circuit) {
      cells.forEach((td) => td.remove());
      delete tr.dataset.fitFor;
      continue;
    }
    if (cells.length !== FIT_HEADERS.length) {
      delete tr.dataset.fitFor;
      cells.forEach((td) => td.remove());
      for (let i = 0; i < FIT_HEADERS.length; i++) {
        const td = document.createElement('td');
        td.className = i < FIT_HEADERS.length - 1 ? `${COL} num` : COL;
        td.dataset.label = FIT_HEADERS[i];
        tr.appendChild(td);
      }
      cells = tr.querySelectorAll<HTMLTableCellElement>(`td.${COL}`);
    }
    if (tr.dataset.fitFor === circuit) continue;
    const c = fitCells(byId.get(tr.dataset.id ?? '')?.fits, circuit);
    c.texts.forEach((t, i) => (cells[i].textContent = t));
    const badge = document.createElement('span');
    badge.className = c.stateClass;
    badge.textContent = c.verdict;
    cells[FIT_HEADERS.length - 1].replaceChildren(badge);
    tr.dataset.fitFor = circuit;
  }
}
