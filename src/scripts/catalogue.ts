/**
 * Catalogue page behaviour: fuzzy search over the index (fuse.js), engineering-notation
 * filters, sortable columns, result count, and the view kept in the URL (replaceState).
 * Rows are rendered at build time; this script only hides, shows and reorders them.
 */
import Fuse from 'fuse.js';
import { compareEntries, compileFilters, emptyFilterState, readFilterState, writeFilterState, SORT_KEYS, type FilterState, type SortKey } from '../site/filters.ts';
import type { IndexEntry } from '../site/types.ts';

const form = document.getElementById('catalogue-filters') as HTMLFormElement | null;
const table = document.getElementById('catalogue-table') as HTMLTableElement | null;

function base(): string {
  return document.body.dataset.base ?? '/';
}

function field(name: keyof FilterState): HTMLInputElement | HTMLSelectElement | null {
  return form?.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement | null;
}

const TEXT_FIELDS = ['q', 'f', 'esr', 'cl', 'kind', 'pkg', 'ot', 'state'] as const;

async function start(): Promise<void> {
  if (!form || !table) return;
  document.documentElement.classList.add('js');
  const response = await fetch(`${base()}data/index.json`);
  const entries = (await response.json()) as IndexEntry[];
  const byId = new Map(entries.map((e) => [e.id, e]));
  const tbody = table.tBodies[0];
  const rows = new Map<string, HTMLTableRowElement>();
  for (const tr of Array.from(tbody.rows)) rows.set(tr.dataset.id ?? '', tr);
  const points = new Map<string, Element>();
  document.querySelectorAll('.point-link[data-id]').forEach((a) => points.set(a.getAttribute('data-id') ?? '', a));
  const fuse = new Fuse(entries, {
    keys: [
      { name: 'id', weight: 3 },
      { name: 'title', weight: 2 },
      { name: 'supplierPart', weight: 2 },
      { name: 'supplier', weight: 1 },
      { name: 'package', weight: 1 },
      { name: 'kind', weight: 1 },
      { name: 'notes', weight: 0.5 },
    ],
    threshold: 0.34,
    ignoreLocation: true,
    minMatchCharLength: 1,
  });

  let state: FilterState = readFilterState(new URLSearchParams(location.search));
  for (const k of TEXT_FIELDS) {
    const el = field(k);
    if (el) el.value = state[k];
  }
  let lastOrder = '';

  const count = document.getElementById('result-count');
  const empty = document.getElementById('no-results');

  function apply(): void {
    const { test, errors } = compileFilters(state);
    for (const k of ['f', 'esr', 'cl'] as const) {
      const el = field(k);
      const err = document.getElementById(`f-${k}-err`);
      if (el) el.setAttribute('aria-invalid', errors[k] ? 'true' : 'false');
      if (err) err.textContent = errors[k] ?? '';
    }
    const q = state.q.trim();
    const matched = q ? new Set(fuse.search(q).map((r) => r.item.id)) : undefined;
    const visible = entries.filter((e) => (!matched || matched.has(e.id)) && test(e));
    const show = new Set(visible.map((e) => e.id));
    const sorted = [...entries].sort((a, b) => compareEntries(a, b, state.sort, state.dir));
    const order = sorted.map((e) => e.id).join('\n');
    if (order !== lastOrder) {
      const frag = document.createDocumentFragment();
      for (const e of sorted) {
        const tr = rows.get(e.id);
        if (tr) frag.appendChild(tr);
      }
      tbody.appendChild(frag);
      lastOrder = order;
    }
    for (const [id, tr] of rows) tr.hidden = !show.has(id);
    for (const [id, a] of points) a.classList.toggle('is-out', !show.has(id));
    if (count) count.textContent = `${visible.length} of ${entries.length} part${entries.length === 1 ? '' : 's'}`;
    if (empty) empty.hidden = visible.length > 0;
    table!.querySelectorAll('th[data-key]').forEach((th) => {
      const key = th.getAttribute('data-key');
      if (key === state.sort) th.setAttribute('aria-sort', state.dir === 'asc' ? 'ascending' : 'descending');
      else th.removeAttribute('aria-sort');
    });
    const params = writeFilterState(state).toString();
    history.replaceState(null, '', params ? `${location.pathname}?${params}` : location.pathname);
  }

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
      apply();
    });
  });
  void byId;
  apply();
  document.body.dataset.ready = 'true';
}

start().catch((err: unknown) => {
  const count = document.getElementById('result-count');
  if (count) count.textContent = `search unavailable: ${err instanceof Error ? err.message : String(err)}`;
});
