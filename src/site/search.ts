/**
 * Free-text search over the index: every word of the query as a plain substring of the part's
 * text (id, title, supplier, supplier part, package, kind, notes) first — typing a part number
 * narrows to exactly that part — and, when no part contains every word, fuzzy matching
 * (fuse.js) so typing errors still find something.
 */
import Fuse from 'fuse.js';
import type { IndexEntry } from './types.ts';

/** Fuse options: weights favour id, title and supplier part number. */
export const FUSE_KEYS = [
  { name: 'id', weight: 3 },
  { name: 'title', weight: 2 },
  { name: 'supplierPart', weight: 2 },
  { name: 'supplier', weight: 1 },
  { name: 'package', weight: 1 },
  { name: 'kind', weight: 1 },
  { name: 'notes', weight: 0.5 },
];

/** Fuzzy threshold (0 exact … 1 anything). */
export const FUZZY_THRESHOLD = 0.34;

export interface Searcher {
  /** Ids matching the query, or undefined for an empty query (everything). */
  search(query: string): Set<string> | undefined;
}

function haystack(e: IndexEntry): string {
  return [e.id, e.title, e.supplier, e.supplierPart, e.package, e.kind, e.notes]
    .filter(Boolean)
    .join('\n')
    .toLowerCase();
}

export function createSearcher(entries: IndexEntry[]): Searcher {
  const texts = entries.map((e) => ({ id: e.id, text: haystack(e) }));
  let fuse: Fuse<IndexEntry> | undefined;
  return {
    search(query) {
      const words = query.toLowerCase().split(/\s+/).filter(Boolean);
      if (!words.length) return undefined;
      const exact = texts.filter((t) => words.every((w) => t.text.includes(w))).map((t) => t.id);
      if (exact.length) return new Set(exact);
      fuse ??= new Fuse(entries, { keys: FUSE_KEYS, threshold: FUZZY_THRESHOLD, ignoreLocation: true });
      return new Set(fuse.search(query.trim()).map((r) => r.item.id));
    },
  };
}
