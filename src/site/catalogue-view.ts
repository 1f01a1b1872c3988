/**
 * View model of the catalogue page: table rows, filter choices and the overview chart
 * (R1 against fs, log–log, one linked point per part).
 */
import { layoutPlot, type PlotLayout } from './plot.ts';
import { formatHz, formatNumber, formatQty, KIND_LABEL, STATE_LABEL } from './format.ts';
import type { IndexEntry } from './types.ts';
import { PART_KINDS, type PartKind } from '../lib/schema/part.ts';
import { CATALOGUE_COLUMNS } from './catalogue-columns.ts';
import { ID_COLLATOR, sortById } from '../lib/report/index-order.ts';
import { FIT_VERDICT_LABEL, FIT_VERDICTS } from '../lib/report/fits.ts';

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
  /** Circuits with a fit for at least one part, for the "fits circuit" selector. */
  circuits: string[];
  fitVerdicts: Array<{ value: string; label: string }>;
  overview?: PlotLayout;
  count: number;
}

/** Column headers with their sort keys (catalogue-columns.ts). */
export const COLUMNS = CATALOGUE_COLUMNS;

/** Short kind names for the overview chart's legend, one per schema kind. */
const OVERVIEW_KIND_LABEL: Record<PartKind, string> = {
  'quartz-at': 'quartz AT-cut',
  'quartz-tuning-fork': 'tuning fork',
  ceramic: 'ceramic',
  saw: 'SAW',
  other: 'other',
};

/** Href of a part page under the base path. */
export function partHref(base: string, id: string): string {
  return `${base}parts/${encodeURIComponent(id)}/`;
}

export function makeCatalogueView(entries: IndexEntry[], base: string): CatalogueView {
  const sorted = sortById(entries);
  const rows = sorted.map((e): CatalogueRow => ({
    id: e.id,
    href: partHref(base, e.id),
    title: e.title,
    cells: CATALOGUE_COLUMNS.flatMap((c) => ('cell' in c ? [{ text: c.cell(e) }] : [])),
    state: e.state,
    stateLabel: STATE_LABEL[e.state],
    synthetic: !!e.synthetic,
  }));
  const kinds = [...new Set(entries.map((e) => e.kind))].sort().map((k) => ({ value: k, label: KIND_LABEL[k] }));
  const packages = [...new Set(entries.map((e) => e.package).filter((p): p is string => !!p))].sort(
    ID_COLLATOR.compare,
  );
  const overtones = [...new Set(entries.map((e) => e.overtone).filter((o): o is number => o !== undefined))].sort(
    (a, b) => a - b,
  );
  const states = (['pass', 'warnings', 'fail', 'unknown'] as const).map((s) => ({ value: s, label: STATE_LABEL[s] }));
  const plotted = sorted.filter((e) => e.fsHz && e.r1Ohm);
  const overview = plotted.length
    ? layoutPlot({
        id: 'overview',
        title: 'All parts: R1 against frequency',
        description: `Motional resistance R1 against series resonance fs on logarithmic axes for ${plotted.length} parts; each point links to its part page.`,
        xName: 'Series resonance fs',
        xUnit: 'Hz',
        xScale: 'log',
        panels: [{ yName: 'R1', yUnit: 'Ω', yScale: 'log', series: [] }],
        links: plotted.map((e) => ({
          x: e.fsHz!,
          y: e.r1Ohm!,
          href: partHref(base, e.id),
          label: `${e.id}: ${formatHz(e.fsHz, 7)}, R1 ${formatQty(e.r1Ohm, 'Ω', 3)}`,
          group: (PART_KINDS as readonly string[]).indexOf(e.kind),
          id: e.id,
        })),
        groupLabels: PART_KINDS.map((k) => OVERVIEW_KIND_LABEL[k]),
        height: 360,
      })
    : undefined;
  const circuits = [...new Set(entries.flatMap((e) => (e.fits ?? []).map((f) => f.circuit)))].sort(ID_COLLATOR.compare);
  const fitVerdicts = FIT_VERDICTS.map((v) => ({ value: v, label: FIT_VERDICT_LABEL[v] }));
  return { rows, kinds, packages, overtones, states, circuits, fitVerdicts, overview, count: entries.length };
}
