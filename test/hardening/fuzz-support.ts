/**
 * Shared pieces of the property-based (fast-check) reader tests in test/hardening/fuzz-*.test.ts:
 * input mutations, the "located error or valid result, in bounded time" check, and the count of
 * inputs tried, written to test-artifacts/fuzz-counts.json for the README.
 *
 * Every property runs with a fixed seed, so the inputs (and the counts) are the same on every run.
 */
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import fc from 'fast-check';
import { InputError, type Issue } from '../../src/lib/issues.ts';

export const ROOT = resolve(import.meta.dirname, '..', '..');
/** Bound on the time one input may take, ms (real inputs take well under 1 ms). */
export const INPUT_BUDGET_MS = 200;
/** Seed of every property in these files: inputs are deterministic, so every failure reproduces. */
export const FUZZ_SEED = 20_260_502;

// ---------------------------------------------------------------- mutations

/** What a mutation does to a text. */
export type MutationOp =
  | 'bit-flip'
  | 'replace-char'
  | 'truncate'
  | 'duplicate-line'
  | 'drop-line'
  | 'swap-lines'
  | 'bad-number'
  | 'insert-nul'
  | 'insert-unicode'
  | 'insert-token'
  | 'line-endings'
  | 'repeat-line';

export interface Mutation {
  op: MutationOp;
  /** Where, as a fraction of the text (or of its lines). */
  at: number;
  /** Which replacement, token or line (taken modulo the list length). */
  pick: number;
}

const OPS: MutationOp[] = [
  'bit-flip',
  'replace-char',
  'truncate',
  'duplicate-line',
  'drop-line',
  'swap-lines',
  'bad-number',
  'insert-nul',
  'insert-unicode',
  'insert-token',
  'line-endings',
  'repeat-line',
];

/** Numbers a sweep or record should never accept silently. */
export const BAD_NUMBERS = [
  'NaN',
  'nan',
  'Infinity',
  '-Infinity',
  'inf',
  '1e999',
  '-1e999',
  '1e-400',
  '9'.repeat(400),
  `-${'9'.repeat(400)}`,
  '-5',
  '0',
  '-0',
  '1e308',
  '-1e308',
  '0x1F',
  '1,5',
  '1.2.3',
  '--1',
  '+-1',
  '.',
  'e5',
  '1e',
  '1e+',
  '١٢٣',
  '１２',
  '½',
  '',
];

/** Characters that trip text handling: controls, bidi and invisible marks, surrogates, odd line breaks. */
export const ODD_UNICODE = [
  '\u0000',
  '\u0001',
  '\u0007',
  '\u001b',
  '\u007f',
  '\u0085',
  '\u00a0',
  '\u00ad',
  '\u200b',
  '\u200d',
  '\u200e',
  '\u202e',
  '\u2066',
  '\u2028',
  '\u2029',
  '\ufeff',
  '\ufffd',
  '\ud800',
  '\udc00',
  '😀',
  'e\u0301',
  'Ω',
  'µ',
  '°',
  '\r',
  '\t',
  '\f',
  '\v',
  'İ',
  'ß',
  'ﬀ',
];

/** Characters a random "replace" writes. */
const REPLACE_CHARS = [
  ' ',
  '\t',
  '\n',
  '-',
  '+',
  '.',
  ',',
  ';',
  ':',
  'e',
  'E',
  '0',
  '9',
  '!',
  '#',
  '[',
  ']',
  '{',
  '}',
  '"',
  "'",
  '&',
  '*',
  '|',
  '>',
  '%',
  '@',
  '`',
  'x',
  ...ODD_UNICODE,
];

const NUMBER_TOKEN = /[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/g;

/** Apply one mutation (pure, deterministic). */
export function applyMutation(text: string, m: Mutation, tokens: readonly string[]): string {
  const pos = Math.min(text.length, Math.floor(m.at * (text.length + 1)));
  const lines = text.split('\n');
  const li = Math.min(lines.length - 1, Math.floor(m.at * lines.length));
  switch (m.op) {
    case 'bit-flip': {
      if (text.length === 0) return text;
      const i = Math.min(text.length - 1, pos);
      return text.slice(0, i) + String.fromCharCode(text.charCodeAt(i) ^ (1 << (m.pick % 8))) + text.slice(i + 1);
    }
    case 'replace-char': {
      if (text.length === 0) return text;
      const i = Math.min(text.length - 1, pos);
      return text.slice(0, i) + REPLACE_CHARS[m.pick % REPLACE_CHARS.length] + text.slice(i + 1);
    }
    case 'truncate':
      return text.slice(0, pos);
    case 'duplicate-line':
      lines.splice(li, 0, lines[li]);
      return lines.join('\n');
    case 'drop-line':
      lines.splice(li, 1);
      return lines.join('\n');
    case 'swap-lines': {
      const lj = m.pick % lines.length;
      [lines[li], lines[lj]] = [lines[lj], lines[li]];
      return lines.join('\n');
    }
    case 'repeat-line':
      lines.splice(li, 0, ...Array.from({ length: 2 + (m.pick % 40) }, () => lines[li]));
      return lines.join('\n');
    case 'bad-number': {
      const found = [...text.matchAll(NUMBER_TOKEN)];
      if (found.length === 0) return text;
      const hit = found[Math.min(found.length - 1, Math.floor(m.at * found.length))];
      return (
        text.slice(0, hit.index) + BAD_NUMBERS[m.pick % BAD_NUMBERS.length] + text.slice(hit.index! + hit[0].length)
      );
    }
    case 'insert-nul':
      return `${text.slice(0, pos)}\u0000${text.slice(pos)}`;
    case 'insert-unicode':
      return text.slice(0, pos) + ODD_UNICODE[m.pick % ODD_UNICODE.length] + text.slice(pos);
    case 'insert-token':
      lines.splice(li, 0, tokens[m.pick % tokens.length]);
      return lines.join('\n');
    case 'line-endings':
      return m.pick % 2 === 0 ? text.replace(/\n/g, '\r\n') : text.replace(/\n/g, '\r');
  }
}

/** 1 to 4 mutations. */
export const mutationsArb: fc.Arbitrary<Mutation[]> = fc.array(
  fc.record({
    op: fc.constantFrom(...OPS),
    at: fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }),
    pick: fc.nat({ max: 1000 }),
  }),
  { minLength: 1, maxLength: 4 },
);

export function mutate(text: string, ms: readonly Mutation[], tokens: readonly string[]): string {
  return ms.reduce((t, m) => applyMutation(t, m, tokens), text);
}

/** Text made of a format's own words, numbers and separators: random, but it reaches deep into a parser. */
export function tokenSoupArb(words: readonly string[], maxLength = 60): fc.Arbitrary<string> {
  const seps = [' ', ' ', '\t', '\n', '\n', '\r\n', ''];
  return fc
    .array(fc.tuple(fc.constantFrom(...words), fc.constantFrom(...seps)), { maxLength })
    .map((parts) => parts.map(([w, s]) => w + s).join(''));
}

/** Arbitrary text: any UTF-16 code units (lone surrogates included), or printable grapheme soup. */
export const randomTextArb: fc.Arbitrary<string> = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 300 }),
  fc.string({ unit: 'grapheme', maxLength: 300 }),
  fc.string({ unit: fc.constantFrom(...'0123456789 .,;\t\n-+eE#![]"'.split('')), maxLength: 300 }),
);

// ---------------------------------------------------------------- checks

/** Run once and time it; a slow run is repeated once, so a GC pause is not taken for a hang. */
export function timed<T>(run: () => T): { ms: number; value?: T; error?: unknown } {
  const once = () => {
    const t0 = performance.now();
    try {
      const value = run();
      return { ms: performance.now() - t0, value };
    } catch (error) {
      return { ms: performance.now() - t0, error };
    }
  };
  const first = once();
  return first.ms < INPUT_BUDGET_MS ? first : once();
}

/** Number of lines of a text as the readers count them (a lone CR also counts, for YAML). */
export function lineCount(text: string): number {
  let n = 1;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) n++;
  }
  return n;
}

/** Issue codes that concern a file as a whole and so carry no line. */
export const FILE_LEVEL_CODES = new Set(['size', 'empty', 'ports', 'too-many']);

/**
 * Assert an issue is located: it names the file, has a line inside the text (or is about the
 * whole file), and a terse message that shows no internals.
 */
export function expectLocated(issue: Issue, source: string, text: string): void {
  const where = JSON.stringify(issue);
  if (issue.file !== source) throw new Error(`issue names file ${issue.file}, expected ${source}: ${where}`);
  if (issue.severity !== 'error' && issue.severity !== 'warning') throw new Error(`bad severity: ${where}`);
  if (issue.line === undefined) {
    if (!FILE_LEVEL_CODES.has(issue.code ?? '')) throw new Error(`issue without a line (code ${issue.code}): ${where}`);
  } else if (!Number.isInteger(issue.line) || issue.line < 1 || issue.line > lineCount(text) + 1) {
    throw new Error(`issue line ${issue.line} outside the text (${lineCount(text)} lines): ${where}`);
  }
  if (issue.col !== undefined && (!Number.isInteger(issue.col) || issue.col < 1))
    throw new Error(`bad column: ${where}`);
  const msg = issue.message;
  if (typeof msg !== 'string' || msg.length === 0) throw new Error(`empty message: ${where}`);
  if (/\bundefined\b|\[object |\bat .*\.ts:\d+/.test(msg)) throw new Error(`message shows internals: ${where}`);
  if (msg.length > 600)
    throw new Error(`message of ${msg.length} characters (should quote a shortened value): ${msg.slice(0, 200)}…`);
}

/**
 * A sweep reader either returns or throws the project's InputError with located issues; it never
 * throws anything else and never takes longer than {@link INPUT_BUDGET_MS}.
 * @returns the value when the read succeeded
 */
export function expectLocatedOrValue<T>(run: () => T, source: string, text: string): T | undefined {
  const r = timed(run);
  if (r.ms >= INPUT_BUDGET_MS)
    throw new Error(
      `took ${r.ms.toFixed(0)} ms (budget ${INPUT_BUDGET_MS} ms) on ${JSON.stringify(text.slice(0, 300))}`,
    );
  if (r.error === undefined) return r.value;
  if (!(r.error instanceof InputError)) {
    throw new Error(
      `threw ${(r.error as Error)?.name}: ${(r.error as Error)?.message} (expected InputError) on ${JSON.stringify(text.slice(0, 300))}`,
    );
  }
  if (r.error.issues.length === 0) throw new Error('InputError without issues');
  for (const issue of r.error.issues) expectLocated(issue, source, text);
  return undefined;
}

/** Every number reachable in a value (arrays, typed arrays, objects). */
export function* numbersIn(value: unknown, path = '$'): Generator<[string, number]> {
  if (typeof value === 'number') yield [path, value];
  else if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    const a = value as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) yield [`${path}[${i}]`, Number(a[i])];
  } else if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) yield* numbersIn(value[i], `${path}[${i}]`);
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) yield* numbersIn(v, `${path}.${k}`);
  }
}

/** The first non-finite number in a value, as [path, value], or undefined. */
export function firstNonFinite(value: unknown): [string, number] | undefined {
  for (const [p, x] of numbersIn(value)) if (!Number.isFinite(x)) return [p, x];
  return undefined;
}

// ---------------------------------------------------------------- counts

/** Inputs tried per reader and property, written to test-artifacts/fuzz-counts.json. */
export class FuzzCounter {
  private readonly counts: Record<string, number> = {};
  constructor(readonly reader: string) {}

  /** Count one input of a property (call inside the property, so only real runs count). */
  tick(property: string): void {
    this.counts[property] = (this.counts[property] ?? 0) + 1;
  }

  get total(): number {
    return Object.values(this.counts).reduce((a, b) => a + b, 0);
  }

  /** Merge this reader's counts into the shared file (test files run in parallel: a lock folder serialises writers). */
  write(): void {
    const dir = join(ROOT, 'test-artifacts');
    mkdirSync(dir, { recursive: true });
    const file = join(dir, 'fuzz-counts.json');
    const lock = join(dir, '.fuzz-counts.lock');
    const until = Date.now() + 10_000;
    for (;;) {
      try {
        mkdirSync(lock);
        break;
      } catch {
        // a lock older than 10 s was left by a killed run
        try {
          if (Date.now() - statSync(lock).mtimeMs > 10_000) rmSync(lock, { recursive: true, force: true });
        } catch {
          /* gone already */
        }
        if (Date.now() > until) return;
        Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 20);
      }
    }
    try {
      let all: { readers: Record<string, { properties: Record<string, number>; total: number }> } = { readers: {} };
      try {
        all = JSON.parse(readFileSync(file, 'utf8'));
      } catch {
        /* first writer */
      }
      all.readers[this.reader] = { properties: { ...this.counts }, total: this.total };
      const total = Object.values(all.readers).reduce((a, r) => a + r.total, 0);
      const out = {
        note: 'inputs tried by test/hardening/fuzz-*.test.ts (fast-check, fixed seed)',
        seed: FUZZ_SEED,
        total,
        readers: all.readers,
      };
      writeFileSync(`${file}.tmp`, `${JSON.stringify(out, null, 2)}\n`);
      renameSync(`${file}.tmp`, file);
    } finally {
      rmSync(lock, { recursive: true, force: true });
    }
  }
}
