/** Compare page helpers: the selection in the URL and the aligned parameter rows. */
import { formatHz, formatNumber, formatQty, STATE_LABEL } from './format.ts';
import type { CompareData } from './types.ts';
import { overtoneLabel } from '../lib/models/mode-label.ts';

/** Most parts on one compare page. */
export const MAX_COMPARE = 4;

/**
 * Part ids from the query: `parts=A,B` and/or repeated `parts=A&parts=B`; trimmed, de-duplicated,
 * at most {@link MAX_COMPARE} kept in order.
 */
export function parseCompareSelection(params: URLSearchParams): string[] {
  const ids = params
    .getAll('parts')
    .flatMap((v) => v.split(/[,\s]+/))
    .map((s) => s.trim())
    .filter((s) => /^[A-Za-z0-9._-]{1,64}$/.test(s));
  return [...new Set(ids)].slice(0, MAX_COMPARE);
}

/** Rows of the aligned table: one quantity per row, one column per part. */
export function compareRows(parts: CompareData[]): Array<{ label: string; values: string[] }> {
  const row = (label: string, f: (p: CompareData) => string) => ({ label, values: parts.map(f) });
  return [
    row('Kind', (p) => p.kind),
    row('fs', (p) => formatHz(p.summary.fsHz)),
    row('R1', (p) => formatQty(p.summary.r1Ohm, 'Ω', 4)),
    row('L1', (p) => formatQty(p.summary.l1H, 'H', 5)),
    row('C1', (p) => formatQty(p.summary.c1F, 'F', 5)),
    row('C0', (p) => formatQty(p.summary.c0F, 'F', 4)),
    row('Q', (p) => formatNumber(p.summary.q, 4)),
    row('Mode', (p) => (p.summary.overtone === undefined ? '—' : overtoneLabel(p.summary.overtone))),
    row('CL for nominal', (p) => formatQty(p.summary.clForNominalF, 'F', 3)),
    row('Datasheet frequency', (p) => formatHz(p.datasheet?.frequencyHz, 9)),
    row('Datasheet CL', (p) =>
      p.datasheet?.loadCapacitanceF === 'series' ? 'series' : formatQty(p.datasheet?.loadCapacitanceF, 'F', 3),
    ),
    row('Datasheet ESR max', (p) => formatQty(p.datasheet?.esrMaxOhm, 'Ω', 3)),
    row('State', (p) => STATE_LABEL[p.summary.state]),
  ];
}
