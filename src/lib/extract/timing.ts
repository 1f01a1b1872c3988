/**
 * Optional timing collector for the extraction: callers that want a per-method split pass one
 * in; without it nothing is measured. Uses the global `performance` clock (Node and browsers).
 */

/** Receives elapsed milliseconds per named step (summed by the collector). */
export interface TimingCollector {
  add(name: string, ms: number): void;
}

/** A collector that sums milliseconds per name. */
export function createTiming(): TimingCollector & { totals: Record<string, number> } {
  const totals: Record<string, number> = {};
  return {
    totals,
    add: (name, ms) => {
      totals[name] = (totals[name] ?? 0) + ms;
    },
  };
}

/** Run `fn`, adding its wall time under `name` when a collector is given. */
export function timed<T>(timing: TimingCollector | undefined, name: string, fn: () => T): T {
  if (!timing) return fn();
  const t0 = performance.now();
  try {
    return fn();
  } finally {
    timing.add(name, performance.now() - t0);
  }
}
