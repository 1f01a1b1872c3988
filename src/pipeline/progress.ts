/**
 * Progress of a counted task on stderr.
 *
 * On a terminal: one line redrawn in place (`\r`) with a bar, counts, rate and ETA, at most
 * every 100 ms. Elsewhere (CI logs, files): a plain line at every 10 % step or every 5 s,
 * whichever comes first, and one line at the end.
 */

/** Where progress goes: a writable with an optional TTY flag and width. */
export interface ProgressStream {
  write(text: string): unknown;
  isTTY?: boolean;
  columns?: number;
}

export interface ProgressOptions {
  /** What is being counted, e.g. "extract". */
  label: string;
  /** Number of items expected. */
  total: number;
  /** Default process.stderr. */
  stream?: ProgressStream;
  /** Force TTY or plain mode; default from the stream. */
  tty?: boolean;
  /** Quiet: draw nothing. */
  silent?: boolean;
  /** Clock in ms (tests). Default performance.now. */
  now?: () => number;
}

export interface Progress {
  /** Count `n` more items done (default 1), with an optional note for the line (e.g. "12 cached"). */
  tick(n?: number, note?: string): void;
  /** Finish: print the final line (TTY: ends the redrawn line). */
  done(note?: string): void;
}

/** Plain-mode spacing: a line every this fraction of the total... */
const PLAIN_STEP = 0.1;
/** ...or after this many ms, whichever comes first. */
const PLAIN_INTERVAL_MS = 5000;
/** TTY redraw throttle, ms. */
const TTY_INTERVAL_MS = 100;
const BAR_WIDTH = 24;

/** Seconds as `1m05s` or `12s`. */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '--';
  const s = Math.round(seconds);
  if (s < 60) return `${s}s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m}m${String(s % 60).padStart(2, '0')}s`;
  return `${Math.floor(m / 60)}h${String(m % 60).padStart(2, '0')}m`;
}

/** Start counting. */
export function createProgress(options: ProgressOptions): Progress {
  const stream = options.stream ?? process.stderr;
  const tty = options.tty ?? Boolean(stream.isTTY);
  const now = options.now ?? (() => performance.now());
  const total = Math.max(0, options.total);
  const t0 = now();
  let count = 0;
  let note = '';
  let lastDraw = tty ? -Infinity : t0;
  let lastPlainStep = 0;
  let finished = false;

  const eta = (): string => {
    if (count === 0 || count >= total) return '';
    const elapsed = (now() - t0) / 1000;
    return ` eta ${formatDuration((elapsed / count) * (total - count))}`;
  };
  const pct = (): number => (total === 0 ? 100 : Math.floor((100 * count) / total));
  const suffix = (): string => (note ? ` (${note})` : '');

  const drawTty = (): void => {
    const filled = total === 0 ? BAR_WIDTH : Math.round((BAR_WIDTH * count) / total);
    const bar = '#'.repeat(filled) + '-'.repeat(BAR_WIDTH - filled);
    let line = `${options.label} [${bar}] ${count}/${total} ${pct()}%${eta()}${suffix()}`;
    const width = stream.columns !== undefined && stream.columns >= 20 ? stream.columns : 100;
    if (line.length > width - 1) line = line.slice(0, width - 1);
    stream.write(`\r${line}\x1b[K`);
  };
  const drawPlain = (): void => {
    stream.write(`${options.label}: ${count}/${total} (${pct()}%)${eta()}${suffix()}\n`);
  };

  return {
    tick(n = 1, newNote) {
      if (finished) return;
      const before = count;
      count = Math.min(total, count + n);
      if (newNote !== undefined) note = newNote;
      if (options.silent || count === before) return;
      const t = now();
      if (tty) {
        if (t - lastDraw >= TTY_INTERVAL_MS || count === total) {
          lastDraw = t;
          drawTty();
        }
        return;
      }
      const step = total === 0 ? 1 : Math.floor(count / total / PLAIN_STEP);
      if (count < total && (step > lastPlainStep || t - lastDraw >= PLAIN_INTERVAL_MS)) {
        lastPlainStep = step;
        lastDraw = t;
        drawPlain();
      }
    },
    done(newNote) {
      if (finished) return;
      finished = true;
      if (newNote !== undefined) note = newNote;
      if (options.silent) return;
      const seconds = (now() - t0) / 1000;
      const line = `${options.label}: ${count}/${total} done in ${formatDuration(seconds)}${suffix()}`;
      stream.write(tty ? `\r${line}\x1b[K\n` : `${line}\n`);
    },
  };
}
