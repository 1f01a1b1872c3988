/**
 * Part record reader: `part.yaml` text in, a validated {@link Part} plus located issues out
 * (README: The part record). Every issue carries the file, 1-based line and column, and the
 * field path in dot/bracket form (`samples[0].sweeps[1].file`); all issues are collected, not
 * just the first.
 *
 * Order of work:
 * 1. text checks: empty, size ({@link MAX_PART_YAML_BYTES}), binary, CR-only line endings,
 *    long lines (a lone CR counts as a line break), line count ({@link MAX_PART_YAML_LINES}),
 *    flow nesting;
 * 2. YAML syntax (yaml `parseDocument` with a `LineCounter`), errors and warnings located, their
 *    messages cut to {@link MAX_YAML_MESSAGE_CHARS} characters (a bad token can be a whole line);
 * 3. one walk of the YAML tree that refuses aliases (no "billion laughs" expansion ever happens),
 *    refuses duplicate keys (found here with a Set: yaml's own `uniqueKeys` check compares every
 *    key with every other, quadratic in the key count), limits nesting depth and builds plain
 *    data — text fields keep their source text, so `id: 0012` stays "0012" and `package: 3225`
 *    stays "3225"; each key's position is kept for the warnings below;
 * 4. unknown keys as warnings with a "did you mean" hint;
 * 5. zod validation ({@link PartSchema}) with issues mapped back to YAML positions, plus the
 *    cross-field rules re-checked here, because zod 4 skips an object's refinements once the
 *    object has other issues (duplicate sample ids, addedConnection without addedCapacitance,
 *    open without short, load without loadResistance).
 */
import { isAlias, isMap, isScalar, isSeq, LineCounter, parseDocument, type Document, type Node } from 'yaml';
import type { z } from 'zod';
import { errorAt, type Issue } from '../issues.ts';
import { KNOWN_KEYS, PartSchema, type Part } from '../schema/part.ts';

/** Largest part.yaml accepted, bytes (UTF-16 code units of the text). */
export const MAX_PART_YAML_BYTES = 1024 * 1024;
/** Longest line accepted, characters; a record's notes wrap well below this. */
export const MAX_PART_YAML_LINE_CHARS = 10_000;
/** Deepest nesting of mappings and lists accepted; a valid record needs 5. */
export const MAX_PART_YAML_DEPTH = 20;
/** Most lines accepted; a record with many samples and sweeps needs a few hundred. */
export const MAX_PART_YAML_LINES = 20_000;
/** Longest yaml parser message kept, characters (it may quote a whole line). */
const MAX_YAML_MESSAGE_CHARS = 200;
/** Stop reporting after this many issues in one record (and say so). */
const MAX_ISSUES = 200;

/** Limit overrides (tests use small ones). */
export interface PartYamlOptions {
  maxBytes?: number;
  maxLineChars?: number;
  maxDepth?: number;
  maxLines?: number;
}

/** A field path: keys and list indexes. */
export type FieldPath = ReadonlyArray<string | number>;

/** Where a field is in the YAML text (1-based), or nothing when it cannot be found. */
export interface FieldPosition {
  line?: number;
  col?: number;
}

export interface PartYamlResult {
  /** The record in SI base units; present only when there is no error (warnings allowed). */
  part?: Part;
  issues: Issue[];
  /** Line and column of a field (deepest existing node of the path), for later checks. */
  locate(path: FieldPath): FieldPosition;
  /** The record as plain data before validation (absent when the YAML itself is unusable). */
  data?: unknown;
}

/** `['samples', 0, 'sweeps', 1, 'file']` → `samples[0].sweeps[1].file`. */
export function formatFieldPath(path: FieldPath): string {
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? p : `.${p}`)).join('');
}

/** Keys whose values are text even when they look like numbers or booleans. */
const TEXT_KEYS = new Set([
  'id',
  'title',
  'package',
  'supplier',
  'supplierPart',
  'notes',
  'lot',
  'by',
  'instrument',
  'file',
  'open',
  'short',
  'load',
]);

/**
 * Parse and validate a part record.
 * @param text contents of part.yaml
 * @param file file name for messages
 */
export function parsePartYaml(text: string, file: string, opts: PartYamlOptions = {}): PartYamlResult {
  const maxBytes = opts.maxBytes ?? MAX_PART_YAML_BYTES;
  const maxLineChars = opts.maxLineChars ?? MAX_PART_YAML_LINE_CHARS;
  const maxDepth = opts.maxDepth ?? MAX_PART_YAML_DEPTH;
  const maxLines = opts.maxLines ?? MAX_PART_YAML_LINES;
  const nowhere: PartYamlResult['locate'] = () => ({});
  const fail = (issues: Issue[]): PartYamlResult => ({ issues, locate: nowhere });

  if (text.length > maxBytes)
    return fail([
      errorAt(file, undefined, `file is ${text.length} bytes, over the limit of ${maxBytes} bytes for a part record`, {
        code: 'size',
      }),
    ]);
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const pre = checkText(body, file, { maxLineChars, maxDepth, maxLines });
  if (pre.length > 0) return fail(pre);
  const lineCounter = new LineCounter();
  // uniqueKeys: false — duplicates are found in toPlain (yaml's check is quadratic in the key count)
  const doc = parseDocument(body, { lineCounter, prettyErrors: false, uniqueKeys: false });
  const at = (offset: number | undefined): FieldPosition => (offset === undefined ? {} : lineCounter.linePos(offset));
  const locate = (path: FieldPath) => at(findOffset(doc, path));
  const issues: Issue[] = [];
  for (const e of doc.errors) {
    const message = /call stack/i.test(e.message)
      ? `nesting deeper than ${maxDepth} levels`
      : `yaml syntax: ${yamlMessage(e.message)}`;
    issues.push({ severity: 'error', file, ...at(e.pos[0]), message, code: 'yaml' });
  }
  for (const w of doc.warnings) {
    issues.push({
      severity: 'warning',
      file,
      ...at(w.pos[0]),
      message: `yaml: ${yamlMessage(w.message)}`,
      code: 'yaml',
    });
  }
  if (issues.some((i) => i.severity === 'error')) return { issues: capIssues(issues, file), locate };

  if (doc.contents === null || (isScalar(doc.contents) && doc.contents.value === null && !doc.contents.source)) {
    return fail([
      errorAt(file, undefined, 'empty file, expected a part record (id, title, kind, samples)', { code: 'empty' }),
    ]);
  }
  if (!isMap(doc.contents)) {
    const got = isSeq(doc.contents)
      ? 'a list'
      : isScalar(doc.contents)
        ? `${describeValue(doc.contents.value)}`
        : 'something else';
    issues.push(
      errorAt(
        file,
        at(doc.contents?.range?.[0]).line,
        `expected a mapping of fields (id, title, kind, samples) at the top level, got ${got}`,
        { code: 'not-mapping', col: 1 },
      ),
    );
    return { issues, locate };
  }

  const built = toPlain(doc.contents, [], maxDepth);
  for (const p of built.problems)
    issues.push({
      severity: 'error',
      file,
      ...at(p.offset),
      path: formatFieldPath(p.path) || undefined,
      message: p.message,
      code: p.code,
    });
  if (built.problems.length > 0) return { issues: capIssues(issues, file), locate };

  const data = built.value;
  for (const w of unknownKeys(built.value))
    issues.push({
      severity: 'warning',
      file,
      ...at(built.keyOffsets.get(w.parent)?.get(w.key)),
      path: formatFieldPath(w.path),
      message: w.message,
      code: 'unknown-key',
    });

  const result = PartSchema.safeParse(built.value, { reportInput: true });
  const errors: Issue[] = [];
  const seen = new Set<string>();
  const add = (path: FieldPath, message: string, code: string) => {
    const key = `${formatFieldPath(path)}\u0000${message}`;
    if (seen.has(key)) return;
    seen.add(key);
    errors.push({ severity: 'error', file, ...locate(path), path: formatFieldPath(path) || undefined, message, code });
  };
  if (!result.success) {
    for (const zi of result.error.issues)
      add(
        zi.path as FieldPath,
        zodMessage(zi, built.value),
        zi.code === 'custom' ? 'invalid' : zi.code.replace(/_/g, '-'),
      );
  }
  for (const c of crossFieldProblems(built.value)) add(c.path, c.message, 'invalid');
  issues.push(...errors);
  issues.sort((a, b) => (a.line ?? 0) - (b.line ?? 0) || (a.col ?? 0) - (b.col ?? 0));
  if (issues.length > MAX_ISSUES) return { issues: capIssues(issues, file), locate, data };
  return { part: result.success && errors.length === 0 ? result.data : undefined, issues, locate, data };
}

/** The first {@link MAX_ISSUES} issues, and a note of how many more there were. */
function capIssues(issues: Issue[], file: string): Issue[] {
  if (issues.length <= MAX_ISSUES) return issues;
  const shown = issues.slice(0, MAX_ISSUES);
  shown.push(errorAt(file, undefined, `${issues.length - MAX_ISSUES} more issues not shown`, { code: 'too-many' }));
  return shown;
}

/** A yaml parser message, lower-case first letter, cut to {@link MAX_YAML_MESSAGE_CHARS}. */
function yamlMessage(s: string): string {
  const m = s.length > 0 ? s[0].toLowerCase() + s.slice(1) : s;
  return m.length > MAX_YAML_MESSAGE_CHARS ? `${m.slice(0, MAX_YAML_MESSAGE_CHARS - 1)}…` : m;
}

interface TextLimits {
  maxLineChars: number;
  maxDepth: number;
  maxLines: number;
}

/**
 * Binary content, CR-only line endings, long lines, too many lines and runaway flow nesting,
 * found before the YAML parser runs. A lone CR counts as a line break here (YAML 1.2 §5.4), so a
 * file of CR-only lines is not one long line; the yaml package reads a lone CR as an ordinary
 * character, so such a file is refused with its own message.
 */
function checkText(text: string, file: string, { maxLineChars, maxDepth, maxLines }: TextLimits): Issue[] {
  const firstCr = text.search(/\r(?!\n)/);
  if (firstCr >= 0 && !text.includes('\n')) {
    return [
      errorAt(file, 1, 'CR-only line endings; save the file with LF or CRLF line endings', {
        code: 'line-endings',
        col: firstCr + 1,
      }),
    ];
  }
  const issues: Issue[] = [];
  let line = 1;
  let lineStart = 0;
  let depth = 0;
  let quote = '';
  let comment = false;
  for (let i = 0; i <= text.length; i++) {
    const c = i < text.length ? text.charCodeAt(i) : 10;
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) {
      if (i - lineStart > maxLineChars) {
        issues.push(
          errorAt(file, line, `line is ${i - lineStart} characters long, over the limit of ${maxLineChars}`, {
            code: 'long-line',
          }),
        );
        if (issues.length >= 5) return issues;
      }
      if (line === maxLines && i + 1 < text.length) {
        issues.push(
          errorAt(file, line + 1, `file has more than ${maxLines} lines, over the limit for a part record`, {
            code: 'too-many-lines',
          }),
        );
        return issues;
      }
      line++;
      lineStart = i + 1;
      comment = false;
      continue;
    }
    if (c === 0 || (c < 32 && c !== 9 && c !== 13) || c === 0xfffd) {
      const what =
        c === 0xfffd
          ? 'bytes that are not UTF-8 (decoded as U+FFFD), expected a UTF-8 text file'
          : `binary data (character U+${c.toString(16).padStart(4, '0')}), expected a YAML text file`;
      return [errorAt(file, line, what, { code: 'binary', col: i - lineStart + 1 })];
    }
    if (comment) continue;
    const ch = text[i];
    if (quote) {
      if (ch === quote) quote = '';
      continue;
    }
    // Rough scan: quotes and comments are skipped so `[` inside them is not counted.
    if (ch === '#' && (i === lineStart || /\s/.test(text[i - 1]))) comment = true;
    else if ((ch === '"' || ch === "'") && (i === lineStart || /[\s:,[{-]/.test(text[i - 1]))) quote = ch;
    else if (ch === '[' || ch === '{') {
      if (++depth > maxDepth)
        return [
          errorAt(file, line, `nesting deeper than ${maxDepth} levels`, { code: 'depth', col: i - lineStart + 1 }),
        ];
    } else if ((ch === ']' || ch === '}') && depth > 0) depth--;
  }
  return issues;
}

interface Problem {
  path: FieldPath;
  offset?: number;
  message: string;
  code: string;
}

/** Plain data from the YAML tree, the problems found, and the offset of every key of every mapping built. */
interface PlainResult {
  value: unknown;
  problems: Problem[];
  keyOffsets: WeakMap<object, Map<string, number>>;
}

/** Convert the YAML tree to plain data, refusing aliases, complex keys, duplicate keys and deep nesting. */
function toPlain(root: Node, rootPath: FieldPath, maxDepth: number): PlainResult {
  const problems: Problem[] = [];
  const keyOffsets = new WeakMap<object, Map<string, number>>();
  let aliases = 0;
  const walk = (node: Node | null | undefined, path: FieldPath, depth: number): unknown => {
    if (node == null) return null;
    if (depth > maxDepth) {
      problems.push({
        path,
        offset: node.range?.[0],
        message: `nesting deeper than ${maxDepth} levels`,
        code: 'depth',
      });
      return null;
    }
    if (isAlias(node)) {
      // One issue for all aliases: an alias bomb has many, and none is ever expanded.
      if (aliases++ === 0)
        problems.push({
          path,
          offset: node.range?.[0],
          message: `yaml alias *${node.source} not allowed in a part record; write the value out`,
          code: 'yaml-alias',
        });
      return null;
    }
    if (isScalar(node)) {
      const key = path[path.length - 1];
      if (
        typeof key === 'string' &&
        TEXT_KEYS.has(key) &&
        node.type === 'PLAIN' &&
        typeof node.value !== 'string' &&
        node.value !== null &&
        typeof node.source === 'string'
      ) {
        return node.source;
      }
      return node.value;
    }
    if (isSeq(node)) return node.items.map((item, i) => walk(item as Node, [...path, i], depth + 1));
    if (isMap(node)) {
      const out: Record<string, unknown> = {};
      const offsets = new Map<string, number>();
      keyOffsets.set(out, offsets);
      for (const pair of node.items) {
        const k = pair.key as Node | null;
        if (
          !isScalar(k) ||
          (typeof k.value !== 'string' && typeof k.value !== 'number' && typeof k.value !== 'boolean')
        ) {
          problems.push({
            path,
            offset: k?.range?.[0],
            message: isAlias(k) ? 'yaml alias not allowed as a key' : 'expected a plain key such as "id"',
            code: 'yaml-key',
          });
          continue;
        }
        const name = String(k.value);
        const offset = k.range?.[0] ?? 0;
        if (offsets.has(name)) {
          problems.push({
            path: [...path, name],
            offset,
            message: `yaml syntax: map keys must be unique; "${shorten(name)}" appears again`,
            code: 'yaml',
          });
          continue;
        }
        offsets.set(name, offset);
        // defineProperty: a key named "__proto__" stays an ordinary key.
        Object.defineProperty(out, name, {
          value: walk(pair.value as Node, [...path, name], depth + 1),
          enumerable: true,
          writable: true,
          configurable: true,
        });
      }
      return out;
    }
    problems.push({
      path,
      offset: (node as { range?: [number] }).range?.[0],
      message: 'unsupported yaml node',
      code: 'yaml',
    });
    return null;
  };
  const value = walk(root, rootPath, 1);
  const first = problems.find((p) => p.code === 'yaml-alias');
  if (first && aliases > 1) first.message += ` (${aliases - 1} more aliases in the file)`;
  return { value, problems, keyOffsets };
}

/** Text cut to 60 characters for a message. */
function shorten(s: string): string {
  return s.length > 60 ? `${s.slice(0, 60)}…` : s;
}

/** Offset of the deepest existing node along a path: a collection by its key, a scalar by its value. */
function findOffset(doc: Document, path: FieldPath): number | undefined {
  let node: unknown = doc.contents;
  let best: number | undefined = (node as Node | null)?.range?.[0];
  for (const step of path) {
    if (isMap(node)) {
      const pair = node.items.find((p) => isScalar(p.key) && String(p.key.value) === String(step));
      if (!pair) return best;
      const key = pair.key as Node;
      const value = pair.value as Node | null;
      best = isScalar(value) && value.source !== '' ? value.range?.[0] : key.range?.[0];
      node = value;
    } else if (isSeq(node) && typeof step === 'number' && step < node.items.length) {
      node = node.items[step];
      best = (node as Node | null)?.range?.[0] ?? best;
    } else {
      return best;
    }
  }
  return best;
}

/** A value in a message: text quoted and shortened, others by kind. */
export function describeValue(value: unknown): string {
  if (value === null || value === undefined) return 'nothing';
  if (typeof value === 'string')
    return value === '' ? 'an empty text' : JSON.stringify(value.length > 60 ? `${value.slice(0, 60)}…` : value);
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (value instanceof Date)
    return Number.isNaN(value.getTime()) ? 'an invalid date' : value.toISOString().slice(0, 10);
  if (Array.isArray(value)) return value.length === 0 ? 'an empty list' : 'a list';
  return 'a mapping';
}

const TYPE_WORDS: Record<string, string> = {
  string: 'text',
  number: 'a number',
  boolean: 'true or false',
  array: 'a list',
  object: 'a mapping',
  date: 'a date',
};

function getIn(root: unknown, path: FieldPath): { exists: boolean; value: unknown } {
  let node: unknown = root;
  for (const step of path) {
    if (node === null || typeof node !== 'object' || !Object.prototype.hasOwnProperty.call(node, step))
      return { exists: false, value: undefined };
    node = (node as Record<string | number, unknown>)[step];
  }
  return { exists: true, value: node };
}

/** Rewrite a zod issue as a terse lower-case message that includes the bad value. */
function zodMessage(zi: z.core.$ZodIssue, data: unknown): string {
  const path = zi.path as FieldPath;
  const { exists, value } = getIn(data, path);
  const field = path[path.length - 1];
  if (zi.code === 'custom') {
    const scalar = value === null || typeof value !== 'object';
    return exists && scalar && zi.message.startsWith('expected') && !/\bgot\b/.test(zi.message)
      ? `${zi.message}, got ${describeValue(value)}`
      : zi.message;
  }
  if (!exists && typeof field === 'string') return `missing required field "${field}"`;
  if (zi.code === 'invalid_type')
    return `expected ${TYPE_WORDS[zi.expected] ?? zi.expected}, got ${describeValue(value)}`;
  if (zi.code === 'invalid_union') return unionMessage(zi.errors.flat(), value);
  const base = /^Invalid input/.test(zi.message) ? `invalid value` : zi.message;
  return /\bgot\b/.test(base) ? base : `${base}, got ${describeValue(value)}`;
}

/** A union failed every branch: prefer a branch's own message (a quantity's unit error) over "expected text". */
function unionMessage(branchIssues: z.core.$ZodIssue[], value: unknown): string {
  const custom = branchIssues.find((i) => i.code === 'custom' && i.path.length === 0);
  const words = branchIssues.flatMap((i) => (i.code === 'invalid_value' ? i.values.map((v) => `"${String(v)}"`) : []));
  if (custom) return words.length > 0 ? `${custom.message} (or the word ${words.join(' or ')})` : custom.message;
  if (words.length > 0) return `expected ${words.join(' or ')} or a quantity, got ${describeValue(value)}`;
  return `expected text, got ${describeValue(value)}`;
}

/** Cross-field rules that zod skips when an object already has other issues. Messages equal the schema's. */
function crossFieldProblems(data: unknown): Array<{ path: FieldPath; message: string }> {
  const out: Array<{ path: FieldPath; message: string }> = [];
  const samples = getIn(data, ['samples']).value;
  if (!Array.isArray(samples)) return out;
  const firstIndex = new Map<string, number>();
  samples.forEach((s: unknown, i) => {
    if (s === null || typeof s !== 'object') return;
    const sample = s as Record<string, unknown>;
    if (typeof sample.id === 'string' || typeof sample.id === 'number') {
      const id = String(sample.id);
      const seen = firstIndex.get(id);
      if (seen === undefined) firstIndex.set(id, i);
      else out.push({ path: ['samples', i, 'id'], message: `duplicate sample id "${id}" (also samples[${seen}])` });
    }
    const comp = sample.compensation as Record<string, unknown> | null | undefined;
    if (comp && typeof comp === 'object') {
      if ((comp.open === undefined) !== (comp.short === undefined)) {
        out.push({
          path: ['samples', i, 'compensation', comp.open === undefined ? 'open' : 'short'],
          message: 'open and short compensation sweeps go together',
        });
      }
      if (comp.load !== undefined && comp.loadResistance === undefined) {
        out.push({
          path: ['samples', i, 'compensation', 'loadResistance'],
          message: 'a load sweep needs loadResistance, e.g. "50 ohm"',
        });
      }
    }
    if (Array.isArray(sample.sweeps)) {
      sample.sweeps.forEach((sw: unknown, j) => {
        if (sw === null || typeof sw !== 'object') return;
        const sweep = sw as Record<string, unknown>;
        if (
          sweep.addedConnection !== undefined &&
          sweep.addedConnection !== null &&
          sweep.addedCapacitance === undefined
        ) {
          out.push({
            path: ['samples', i, 'sweeps', j, 'addedConnection'],
            message: 'addedConnection needs addedCapacitance',
          });
        }
      });
    }
  });
  return out;
}

type Level = keyof typeof KNOWN_KEYS;

/** An unknown key: its path, the mapping it is in and the key (to look up its position), a message. */
interface UnknownKey {
  path: FieldPath;
  parent: object;
  key: string;
  message: string;
}

/** Unknown keys at every record level, with a hint: a near spelling, or the level the key belongs to. */
function unknownKeys(data: unknown): UnknownKey[] {
  const out: UnknownKey[] = [];
  const check = (obj: unknown, level: Level, path: FieldPath) => {
    if (obj === null || typeof obj !== 'object' || Array.isArray(obj)) return;
    const known = new Set<string>(KNOWN_KEYS[level]);
    for (const key of Object.keys(obj)) {
      if (known.has(key)) continue;
      out.push({
        path: [...path, key],
        parent: obj,
        key,
        message: `unknown field "${shorten(key)}" is ignored${hintFor(key, level)}`,
      });
    }
  };
  check(data, 'part', []);
  const part = data as Record<string, unknown>;
  check(part.datasheet, 'datasheet', ['datasheet']);
  if (Array.isArray(part.samples)) {
    part.samples.forEach((s: unknown, i) => {
      check(s, 'sample', ['samples', i]);
      const sample = (s ?? {}) as Record<string, unknown>;
      check(sample.compensation, 'compensation', ['samples', i, 'compensation']);
      if (Array.isArray(sample.sweeps))
        sample.sweeps.forEach((sw: unknown, j) => check(sw, 'sweep', ['samples', i, 'sweeps', j]));
    });
  }
  return out;
}

function hintFor(key: string, level: Level): string {
  const norm = (s: string) => s.toLowerCase().replace(/[-_ ]/g, '');
  const own = KNOWN_KEYS[level] as readonly string[];
  const close =
    own.find((k) => norm(k) === norm(key)) ??
    own.find((k) => editDistance(norm(k), norm(key)) <= Math.min(2, Math.floor(k.length / 3)));
  if (close) return `; did you mean "${close}"?`;
  const where: Record<Level, string> = {
    part: 'the top level',
    datasheet: 'datasheet',
    sample: 'a sample',
    sweep: 'a sweep',
    compensation: 'compensation',
  };
  for (const other of Object.keys(KNOWN_KEYS) as Level[]) {
    if (other !== level && (KNOWN_KEYS[other] as readonly string[]).includes(key))
      return `; it belongs in ${where[other]}`;
  }
  return '';
}

/** Levenshtein distance (short keys only). */
function editDistance(a: string, b: string): number {
  if (Math.abs(a.length - b.length) > 3) return 99;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++)
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = cur;
  }
  return prev[b.length];
}
