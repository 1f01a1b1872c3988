/**
 * View model of the catalogue page: table rows, filter choices and the overview chart
 * (R1 against fs, log–log, one linked point per part).
 */
import { layoutPlot, type PlotLayout } from './plot.ts';
import { formatHz, formatNumber, formatQty, KIND_LABEL, STATE_LABEL } from './format.ts';
import type { IndexEntry } from './types.ts';

export interface CatalogueRow {
  id: string;
  href: string;
  title: string;
  cells: Array<{ text: string; sort?: number | string }>;
  state: IndexEntry['state'];
  stateLabel: string;
  synthetic: boolean;
}

export interface CatalogueView {
  rows: CatalogueRow[];
  kinds: Array<{ value: string; label: string }>;
  packages: string[];
  overtones: number[];
  states: Array<{ value: string; label: string }>;
  overview?: PlotLayout;
  count: number;
}

/** Column headers with their sort keys (the key names of IndexEntry / filters.ts SortKey). */
export const COLUMNS = [
  { key: 'id', label: 'Part' },
  { key: 'fsHz', label: 'fs' },
  { key: 'r1Ohm', label: 'R1' },
  { key: 'c0F', label: 'C0' },
  { key: 'c1F', label: 'C1' },
  { key: 'q', label: 'Q' },
  { key: 'clForNominalF', label: 'CL for nominal' },
  { key: 'samples', label: 'Samples' },
  { key: 'state', label: 'State' },
] as const;

/** Href of a part page under the base path. */
export function partHref(base: string, id: string): string {
  return `${base}parts/${encodeURIComponent(id)}/`;
}

export function makeCatalogueView(entries: IndexEntry[], base: string): CatalogueView {
  const collator = new Intl.Collator('en', { numeric: true });
  const sorted = [...entries].sort((a, b) => collator.compare(a.id, b.id));
  const rows = sorted.map((e): CatalogueRow => ({
    id: e.id,
    href: partHref(base, e.id),
    title: e.title,
    cells: [
      { text: formatHz(e.fsHz, 9) },
      { text: formatQty(e.r1Ohm, 'Ω', 4) },
      { text: formatQty(e.c0F, 'F', 3) },
      { text: formatQty(e.c1F, 'F', 4) },
      { text: formatNumber(e.q, 3) },
      { text: formatQty(e.clForNominalF, 'F', 3) },
      { text: String(e.samples) },
    ],
    state: e.state,
    stateLabel: STATE_LABEL[e.state],
    synthetic: !!e.synthetic,
  }));
  const kinds = [...new Set(entries.map((e) => e.kind))].sort().map((k) => ({ value: k, label: KIND_LABEL[k] ?? k }));
  const packages = [...new Set(entries.map((e) => e.package).filter((p): p is string => !!p))].sort(collator.compare);
  const overtones = [...new Set(entries.map((e) => e.overtone).filter((o): o is number => o !== undefined))].sort((a, b) => a - b);
  const states = (['pass', 'warnings', 'fail', 'unknown'] as const).map((s) => ({ value: s, label: STATE_LABEL[s] }));
  const plotted = sorted.filter((e) => e.fsHz && e.r1Ohm);
  const overview = plotted.length
    ? layoutPlot({
        id: 'overview',
        title: 'All parts: R1 against frequency',
        description: `Motional resistance R1 against series resonance fs on logarithmic axes for ${plotted.length} parts; each point links to its part page.`,
        xName: 'Series resonance fs', xUnit: 'Hz', xScale: 'log',
        panels: [{ yName: 'R1', yUnit: 'Ω', yScale: 'log', series: [] }],
        links: plotted.map((e) => ({ x: e.fsHz!, y: e.r1Ohm!, href: partHref(base, e.id), label: `${e.id}: ${formatHz(e.fsHz, 7)}, R1 ${formatQty(e.r1Ohm, 'Ω', 3)}`, group: ['quartz-at', 'quartz-tuning-fork', 'ceramic', 'saw', 'other'].indexOf(e.kind), id: e.id })),
        groupLabels: ['quartz AT-cut', 'tuning fork', 'ceramic', 'SAW', 'other'],
        height: 360,
      })
    : undefined;
  return { rows, kinds, packages, overtones, states, overview, count: entries.length };
}
