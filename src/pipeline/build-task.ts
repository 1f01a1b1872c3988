/**
 * The per-part work of a catalogue build, the same whether it runs in a worker thread or in
 * the main thread (`--jobs 1`): fingerprint the part folder; answer from the cache when the
 * fingerprint is known, else load and validate the record, extract, and make the page data and
 * downloads (storing them in the cache); then write the part's files into the build's data
 * folder. Only a small index entry travels back, so memory stays flat however many parts there are.
 *
 * Raw record files (downloads named `raw/…`) are not copied into the cache: the fingerprint
 * covers their bytes, so they are read again from the part folder when written.
 */
import { readFile, readdir, mkdir, rename, rm } from 'node:fs/promises';
import { dirname, join, relative, sep } from 'node:path';
import type { Issue } from '../lib/issues.ts';
import { extractPart } from '../lib/extract/extract-part.ts';
import { EXTRACTOR_VERSION } from '../lib/extract/version.ts';
import { parseOscillatorsYaml } from '../lib/osc/oscillators-yaml.ts';
import type { OscillatorCircuit } from '../lib/schema/oscillators.ts';
import { PART_DATA_VERSION, type IndexEntry, type PartData } from '../site/types.ts';
import { cacheKey, hashPartFolder, openCache, type BuildCache } from './cache.ts';
import { makeDownloads, writeCatalogueData, type EmitPart } from './emit.ts';
import { loadPart } from './load-part.ts';
import { makeIndexEntry, makePartData } from './part-data.ts';

/** Settings shared by every task of one build (sent once to each thread). */
export interface BuildTaskContext {
  /** Cache folder; undefined = no cache. */
  cacheDir?: string;
  /** Oscillator circuits file: display name, text and sha256; undefined = none. */
  oscillators?: { file: string; text: string; hash: string };
  /** Site base path, e.g. `/` or `/tools/crystals/`. */
  basePath: string;
  /** Catalogue data folder the parts are written into (created by the caller). */
  dataDir: string;
  /** Scratch folder for per-part writes (created by the caller). */
  scratchDir: string;
}

/** One record to process. */
export interface BuildTask {
  /** Position in the sorted list of records. */
  index: number;
  /** Path of part.yaml as discovered (used in messages). */
  yamlFile: string;
  /** Only validate (another record already failed: nothing will be published). */
  validateOnly: boolean;
}

/** A download as cached: its text, or the record file it is read from (`raw/…`). */
export interface CachedDownload {
  name: string;
  label?: string;
  content?: string;
  /** Path relative to the part folder, for raw record files. */
  raw?: string;
}

/** What the cache keeps per part. */
export interface PartEntry {
  data: PartData;
  downloads: CachedDownload[];
}

/** Counts of a valid part, for the build summary. */
export interface PartStats {
  samples: number;
  modes: number;
  /** Extraction warnings over the samples (record warnings are in `issues`). */
  warnings: number;
}

export interface BuildTaskResult {
  index: number;
  yamlFile: string;
  /** Part id when it could be read (also for invalid records: duplicate checks). */
  id?: string;
  /** Line of the `id` field in part.yaml, for duplicate-id messages. */
  idLine?: number;
  /** Issues of the record and its files: errors and warnings. */
  issues: Issue[];
  /** True when the record has no error. */
  valid: boolean;
  /** Answered from the cache. */
  cached: boolean;
  stats?: PartStats;
  /** Search-index row of the part, once its files are written. */
  indexEntry?: IndexEntry;
  /** Time spent per step, ms. */
  ms: { hash: number; load: number; extract: number; data: number; emit: number };
}

/** Header line of a cache entry: what is needed without parsing the body. */
interface CacheHeader {
  id: string;
  idLine?: number;
  issues: Issue[];
  stats: PartStats;
}

/** Runs the tasks of one build in one thread. */
export interface BuildTaskRunner {
  run(task: BuildTask): Promise<BuildTaskResult>;
}

/**
 * Prepare a runner for a build's tasks.
 * @throws Error when the oscillator circuits file has errors (the caller validates it first)
 */
export function createBuildTaskRunner(context: BuildTaskContext): BuildTaskRunner {
  let circuits: OscillatorCircuit[] = [];
  if (context.oscillators) {
    const parsed = parseOscillatorsYaml(context.oscillators.text, context.oscillators.file);
    if (parsed.issues.some((i) => i.severity === 'error')) throw new Error(`${context.oscillators.file} has errors`);
    circuits = parsed.circuits;
  }
  const cache: BuildCache | undefined = context.cacheDir ? openCache(context.cacheDir) : undefined;
  const options = `partData=${PART_DATA_VERSION};base=${context.basePath}`;
  const keyOf = (folderHash: string) =>
    cacheKey({ folderHash, extractorVersion: EXTRACTOR_VERSION, oscillatorsHash: context.oscillators?.hash ?? '', options });
  return { run: (task) => runTask(task, context, circuits, cache, keyOf) };
}

async function runTask(
  task: BuildTask,
  context: BuildTaskContext,
  circuits: OscillatorCircuit[],
  cache: BuildCache | undefined,
  keyOf: (folderHash: string) => string,
): Promise<BuildTaskResult> {
  const ms = { hash: 0, load: 0, extract: 0, data: 0, emit: 0 };
  const base = { index: task.index, yamlFile: task.yamlFile, ms };
  const folder = dirname(task.yamlFile);
  let t = performance.now();
  const lap = (key: keyof typeof ms) => {
    const now = performance.now();
    ms[key] += now - t;
    t = now;
  };

  let key: string | undefined;
  if (cache) {
    const fingerprint = await hashPartFolder(folder).catch(() => undefined);
    if (fingerprint) {
      key = keyOf(fingerprint.hash);
      const text = await cache.get(key);
      const hit = text === undefined ? undefined : splitEntry(text);
      lap('hash');
      if (hit) {
        const result: BuildTaskResult = {
          ...base, id: hit.header.id, idLine: hit.header.idLine, issues: relocate(hit.header.issues, folder),
          valid: true, cached: true, stats: hit.header.stats,
        };
        if (!task.validateOnly) {
          result.indexEntry = await emitEntry(JSON.parse(hit.body) as PartEntry, folder, task.index, context);
          lap('emit');
        }
        return result;
      }
    }
  }
  lap('hash');

  const loaded = await loadPart(task.yamlFile);
  lap('load');
  const idLine = loaded.id !== undefined ? loaded.locate(['id']).line : undefined;
  const valid = loaded.part !== undefined && !loaded.issues.some((i) => i.severity === 'error');
  if (!valid || task.validateOnly || !loaded.part) {
    return { ...base, id: loaded.id, idLine, issues: loaded.issues, valid, cached: false };
  }

  const result = extractPart(loaded.part, loaded.sweeps);
  lap('extract');
  const downloads = makeDownloads(loaded, result);
  const data = makePartData(loaded, result, circuits, { basePath: context.basePath, downloads });
  const rawPrefix = 'raw/';
  const entry: PartEntry = {
    data,
    downloads: downloads.map((d) => (d.name.startsWith(rawPrefix) ? { name: d.name, label: d.label, raw: d.name.slice(rawPrefix.length) } : d)),
  };
  const stats: PartStats = {
    samples: result.samples.length,
    modes: result.samples.reduce((n, s) => n + s.modes.length, 0),
    warnings: result.samples.reduce((n, s) => n + s.warnings.length, 0),
  };
  lap('data');
  if (cache && key) {
    const header: CacheHeader = { id: loaded.part.id, idLine, issues: portable(loaded.issues, folder), stats };
    await cache.put(key, `${JSON.stringify(header)}\n${JSON.stringify(entry)}`);
  }
  const indexEntry = await emitEntry(entry, folder, task.index, context);
  lap('emit');
  return { ...base, id: loaded.part.id, idLine, issues: loaded.issues, valid: true, cached: false, stats, indexEntry };
}

/**
 * Write one part's files with the catalogue writer (emit.ts) into a scratch folder of its own,
 * then move them into the data folder; the scratch index is dropped (the caller writes the
 * whole index once).
 */
async function emitEntry(entry: PartEntry, folder: string, index: number, context: BuildTaskContext): Promise<IndexEntry> {
  const downloads: EmitPart['downloads'] = [];
  for (const d of entry.downloads) {
    const content = d.raw !== undefined ? await readFile(join(folder, ...d.raw.split('/')), 'utf8') : (d.content ?? '');
    downloads.push({ name: d.name, label: d.label, content });
  }
  const scratch = join(context.scratchDir, String(index));
  await writeCatalogueData(scratch, [{ data: entry.data, downloads }]);
  await moveTree(scratch, context.dataDir, new Set(['index.json']));
  await rm(scratch, { recursive: true, force: true });
  return makeIndexEntry(entry.data);
}

/** Move every file under `from` to the same relative place under `to`, except top-level `skip` names. */
async function moveTree(from: string, to: string, skip: Set<string>, top = true): Promise<void> {
  for (const e of await readdir(from, { withFileTypes: true })) {
    if (top && skip.has(e.name)) continue;
    const src = join(from, e.name);
    const dest = join(to, e.name);
    if (e.isDirectory()) {
      await mkdir(dest, { recursive: true });
      await moveTree(src, dest, skip, false);
    } else {
      await rename(src, dest);
    }
  }
}

function splitEntry(text: string): { header: CacheHeader; body: string } | undefined {
  const nl = text.indexOf('\n');
  if (nl < 0) return undefined;
  try {
    return { header: JSON.parse(text.slice(0, nl)) as CacheHeader, body: text.slice(nl + 1) };
  } catch {
    return undefined;
  }
}

// Cached issues name files relative to the part folder, so the same folder found under another
// path (a moved or copied catalogue) reports its own paths.
const FOLDER_MARK = '<part>';

function portable(issues: Issue[], folder: string): Issue[] {
  return issues.map((i) => {
    const rel = relative(folder, i.file);
    return rel.startsWith('..') ? i : { ...i, file: `${FOLDER_MARK}/${rel.split(sep).join('/')}` };
  });
}

function relocate(issues: Issue[], folder: string): Issue[] {
  return issues.map((i) => (i.file.startsWith(`${FOLDER_MARK}/`) ? { ...i, file: join(folder, i.file.slice(FOLDER_MARK.length + 1)) } : i));
}
