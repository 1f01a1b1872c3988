/**
 * Compare page: reads `?parts=A,B` (or repeated `parts`), fetches each part's compare data,
 * draws overlaid curves and an aligned parameter table, and keeps the URL canonical.
 */
import { layoutPlot } from '../site/plot.ts';
import { compareModeSpec, comparePullingSpec } from '../site/part-plots.ts';
import { compareRows, parseCompareSelection, MAX_COMPARE } from '../site/compare.ts';
import type { CompareData } from '../site/types.ts';
import { renderPlot } from './render-plot.ts';
import { attachPlotHover } from './plot-hover.ts';
import { appendCircuitOverlay } from './compare-circuit.ts';

const base = document.body.dataset.base ?? '/';
const status = document.getElementById('compare-status');
const out = document.getElementById('compare-out');
const input = document.getElementById('cmp-parts') as HTMLInputElement | null;

function say(text: string): void {
  if (status) status.textContent = text;
}

async function load(id: string): Promise<CompareData | string> {
  const res = await fetch(`${base}data/compare/${encodeURIComponent(id)}.json`);
  if (!res.ok) return `no part "${id}"`;
  return (await res.json()) as CompareData;
}

async function show(): Promise<void> {
  if (!out) return;
  const ids = parseCompareSelection(new URLSearchParams(location.search));
  if (input) input.value = ids.join(',');
  out.replaceChildren();
  if (ids.length === 0) {
    say('Enter two to four part ids.');
    return;
  }
  const canonical = `${location.pathname}?parts=${ids.map(encodeURIComponent).join(',')}`;
  history.replaceState(null, '', canonical);
  const loaded = await Promise.all(ids.map(load));
  const missing = loaded.filter((x): x is string => typeof x === 'string');
  const parts = loaded.filter((x): x is CompareData => typeof x !== 'string');
  const notes = [...missing];
  if (ids.length > MAX_COMPARE) notes.push(`only the first ${MAX_COMPARE} are shown`);
  if (parts.length < 2) notes.push('pick at least two parts');
  say(`${parts.length} part${parts.length === 1 ? '' : 's'} compared${notes.length ? ` — ${notes.join('; ')}` : ''}.`);
  if (parts.length === 0) return;

  const table = document.createElement('table');
  table.className = 'data compare-table';
  table.id = 'compare-table';
  table.createCaption().textContent = 'Main mode of the first sample of each part';
  const head = table.createTHead().insertRow();
  const corner = document.createElement('th');
  corner.scope = 'col';
  corner.textContent = 'Quantity';
  head.appendChild(corner);
  parts.forEach((p, i) => {
    const th = document.createElement('th');
    th.scope = 'col';
    th.className = `part-col part-col-${i}`;
    const a = document.createElement('a');
    a.href = `${base}parts/${encodeURIComponent(p.id)}/`;
    a.textContent = p.id;
    th.appendChild(a);
    const t = document.createElement('span');
    t.className = 'row-title';
    t.textContent = p.title;
    th.appendChild(t);
    head.appendChild(th);
  });
  const body = table.createTBody();
  for (const row of compareRows(parts)) {
    const tr = body.insertRow();
    const th = document.createElement('th');
    th.scope = 'row';
    th.textContent = row.label;
    tr.appendChild(th);
    for (const v of row.values) {
      const td = tr.insertCell();
      td.className = 'num';
      td.textContent = v;
    }
  }
  const wrap = document.createElement('div');
  wrap.className = 'table-wrap';
  wrap.appendChild(table);
  out.appendChild(wrap);
  if (parts.some((p) => p.mode)) out.appendChild(renderPlot(layoutPlot(compareModeSpec(parts, 'cmp-mode'))));
  if (parts.some((p) => p.pulling)) out.appendChild(renderPlot(layoutPlot(comparePullingSpec(parts, 'cmp-pull'))));
  attachPlotHover(out);
  appendCircuitOverlay(out, parts);
  document.body.dataset.ready = 'true';
}

show().catch((err: unknown) => say(`comparison failed: ${err instanceof Error ? err.message : String(err)}`));
