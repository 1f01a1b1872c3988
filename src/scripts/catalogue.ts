/**
 * Catalogue page behaviour: fuzzy search over the index (fuse.js), engineering-notation
 * filters, sortable columns, result count, and the view kept in the URL (replaceState).
 * Rows are rendered at build time; this script only hides, shows and reorders them.
 */
import {
  compareEntries,
  compileFilters,
  emptyFilterState,
  readFilterState,
  writeFilterState,
  SORT_KEYS,
  type FilterState,
  type SortKey,
} from '../site/filters.ts';
import type { IndexEntry } from '../site/types.ts';
import { createSearcher } from '../site/search.ts';
import { showFits } from './catalogue-fits.ts';

const form = document.getElementById('catalogue-filters') as HTMLFormElement | null;
const table = document.getElementById('catalogue-table') as HTMLTableElement | null;

function base(): string {
  return document.body.dataset.base ?? '/';
}

function field(name: keyof FilterState): HTMLInputElement | HTMLSelectElement | null {
  return form?.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement | null;
}

const TEXT_FIELDS = ['q', 'f', 'esr', 'cl', 'kind', 'pkg', 'ot', 'state', 'circuit', 'fit'] as const;

/** Rows listed at a time. */
const PAGE_ROWS = 100;

async function start(): Promise<void> {
  if (!form || !table) return;
  document.documentElement.classList.add('js');
  const response = await fetch(`${base()}data/index.json`);
  const entries = (await response.json()) as IndexEntry[];
  const tbody = table.tBodies[0];
  const rows = new Map<string, HTMLTableRowElement>();
  for (const tr of Array.from(tbody.rows)) rows.set(tr.dataset.id ?? '', tr);
  // Each part's point on the overview chart and its entry in the list of the chart's links.
  const points = new Map<string, Element[]>();
  document.querySelectorAll('[data-point]').forEach((el) => {
    const id = el.getAttribute('data-point') ?? '';
    points.set(id, [...(points.get(id) ?? []), el]);
  });
  document.querySelectorAll<SVGElement>('circle.point[data-href]').forEach((c) => {
    c.addEventListener('click', () => {
      location.href = c.dataset.href ?? location.href;
    });
  });
  const searcher = createSearcher(entries);
  const byId = new Map(entries.map((e) => [e.id, e]));

  let state: FilterState = readFilterState(new URLSearchParams(location.search));
  for (const k of TEXT_FIELDS) {
    const el = field(k);
    if (el) el.value = state[k];
  }
  const count = document.getElementById('result-count');
  const empty = document.getElementById('no-results');
  const more = document.getElementById('show-more') as HTMLButtonElement | null;
  // Only the first rows of a result are in the table (a 3,000-row table re-laid out on every
  // keystroke is slow); "show more" adds the next page. The static page keeps every row for
  // readers without JavaScript.
  let limit = PAGE_ROWS;
  let shownPoints = new Set(points.keys());
  let chartTimer: ReturnType<typeof setTimeout> | undefined;

  function updateChart(show: Set<string>): void {
    for (const [id, els] of points) {
      const was = shownPoints.has(id);
      const now = show.has(id);
      if (was !== now) for (const el of els) el.classList.toggle('is-out', !now);
    }
    shownPoints = show;
  }

  function apply(resetLimit = true): void {
    if (resetLimit) limit = PAGE_ROWS;
    const { test, errors } = compileFilters(state);
    for (const k of ['f', 'esr', 'cl'] as const) {
      const el = field(k);
      const err = document.getElementById(`f-${k}-err`);
      if (el) el.setAttribute('aria-invalid', errors[k] ? 'true' : 'false');
      if (err) err.textContent = errors[k] ?? '';
    }
    const matched = searcher.search(state.q);
    const visible = entries.filter((e) => (!matched || matched.has(e.id)) && test(e));
    visible.sort((a, b) => compareEntries(a, b, state.sort, state.dir));
    const page = visible
      .slice(0, limit)
      .map((e) => rows.get(e.id))
      .filter((r): r is HTMLTableRowElement => !!r);
    tbody.replaceChildren(...page);
    showFits(table!, page, byId, state.circuit);
    if (count)
      count.textContent = `${visible.length} of ${entries.length} part${entries.length === 1 ? '' : 's'}${visible.length > limit ? ` (first ${limit} listed)` : ''}`;
    if (empty) empty.hidden = visible.length > 0;
    if (more) {
      more.hidden = visible.length <= limit;
      more.textContent = `Show ${Math.min(PAGE_ROWS, visible.length - limit)} more`;
    }
    table!.querySelectorAll('th[data-key]').forEach((th) => {
      const key = th.getAttribute('data-key');
      if (key === state.sort) th.setAttribute('aria-sort', state.dir === 'asc' ? 'ascending' : 'descending');
      else th.removeAttribute('aria-sort');
    });
    const params = writeFilterState(state).toString();
    history.replaceState(null, '', params ? `${location.pathname}?${params}` : location.pathname);
    // The overview chart follows a moment later, off the keystroke's critical path.
    clearTimeout(chartTimer);
    const show = new Set(visible.map((e) => e.id));
    chartTimer = setTimeout(() => updateChart(show), 60);
  }

  more?.addEventListener('click', () => {
    limit += PAGE_ROWS;
    apply(false);
  });

  form.addEventListener('input', (ev) => {
    const el = ev.target as HTMLInputElement | HTMLSelectElement;
    const name = el.name as (typeof TEXT_FIELDS)[number];
    if ((TEXT_FIELDS as readonly string[]).includes(name)) {
      (state as unknown as Record<string, string>)[name] = el.value;
      apply();
    }
  });
  form.addEventListener('submit', (ev) => {
    ev.preventDefault();
    apply();
  });
  form.addEventListener('reset', () => {
    // After the browser has cleared the fields.
    setTimeout(() => {
      state = { ...emptyFilterState(), sort: state.sort, dir: state.dir };
      apply();
    });
  });
  table.querySelectorAll<HTMLButtonElement>('button.sort').forEach((btn) => {
    btn.addEventListener('click', () => {
      const key = btn.dataset.key as SortKey;
      if (!(SORT_KEYS as readonly string[]).includes(key)) return;
      state.dir = state.sort === key && state.dir === 'asc' ? 'desc' : 'asc';
      state.sort = key;
      apply(false);
    });
  });
  apply();
  document.body.dataset.ready = 'true';
}

start().catch((err: unknown) => {
  const count = document.getElementById('result-count');
  if (count) count.textContent = `search unavailable: ${err instanceof Error ? err.message : String(err)}`;
});
