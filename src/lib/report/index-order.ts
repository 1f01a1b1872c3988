/**
 * The one order of parts in the search index and the catalogue: by id, with numbers in ids
 * compared as numbers ("XT-9" before "XT-10").
 */

/** One collator for every comparison (`localeCompare` with options builds one per call: slow). */
export const ID_COLLATOR = new Intl.Collator('en', { numeric: true });

/** Compare two ids in catalogue order. */
export function compareIds(a: string, b: string): number {
  return ID_COLLATOR.compare(a, b);
}

/** A copy of the rows sorted by id in catalogue order. */
export function sortById<T extends { id: string }>(rows: readonly T[]): T[] {
  return [...rows].sort((a, b) => compareIds(a.id, b.id));
}
