/**
 * The per-part work of a catalogue build.
 *
 * {@link lookupRecord} (main thread, cheap): fingerprint the part folder and, when the cache
 * knows the fingerprint, hard-link the part's stored catalogue files into the build's data
 * folder. No extraction code is even loaded for that.
 *
 * {@link createBuildTaskRunner} (worker threads, or the main thread with `--jobs 1`): for the
 * others, load and validate the record, extract, make the page data and downloads, write the
 * part's files with emit.ts's writer, store them in the cache, and put them into the data
 * folder. Only a small index row travels back, so memory stays flat however many parts.
 */
import { copyFile, link, mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import { dirname, join, relative, sep } from 'node:path';
import type { Issue } from '../lib/issues.ts';
import type { OscillatorCircuit } from '../lib/schema/oscillators.ts';
import { PART_DATA_VERSION, type IndexEntry } from '../lib/report/types.ts';
import { cacheKey, hashPartFolder, openCache, type BuildCache, type FingerprintMemo } from './cache.ts';

/** Settings shared by every task of one build (sent once to each thread). */
export interface BuildTaskContext {
  /** Cache folder; undefined = no cache. */
  cacheDir?: string;
  /** Fingerprint of the code that makes a part's files (code-hash.ts), computed once per build. */
  codeHash: string;
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
  /** Cache key from {@link lookupRecord}, when the cache is on. */
  key?: string;
}

/** Counts of a valid part, for the build summary. */
export interface PartStats {
  samples: number;
  modes: number;
  /** Extraction warnings over the samples (record warnings are in `issues`). */
  warnings: number;
}

/** Time spent per step, ms. */
export interface TaskTimes {
  hash: number;
  load: number;
  extract: number;
  data: number;
  emit: number;
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
  /** Search-index row of the part, once its files are in the data folder. */
  indexEntry?: IndexEntry;
  /** The part's files, relative, '/'-separated: in the data folder, or in {@link BuildTaskResult.filesDir}. */
  files?: string[];
  /** Where the part's files are when they are not yet in the data folder (a cache entry). */
  filesDir?: string;
  /** Cache key of the part's data (when the cache is on). */
  key?: string;
  ms: TaskTimes;
}

/** The header of a cache entry; the entry's folder holds the part's catalogue files. */
interface CacheHeader {
  id: string;
  idLine?: number;
  /** Issues with files named relative to the part folder ({@link FOLDER_MARK}). */
  issues: Issue[];
  stats: PartStats;
  indexEntry: IndexEntry;
  /** Files of the entry folder, relative, '/'-separated. */
  files: string[];
}

/** Cache access of one thread: the handle and the key function. */
interface CacheAccess {
  cache: BuildCache;
  keyOf(folderHash: string): string;
}

function cacheAccess(context: BuildTaskContext): CacheAccess | undefined {
  if (!context.cacheDir) return undefined;
  const options = `partData=${PART_DATA_VERSION};base=${context.basePath}`;
  return {
    cache: openCache(context.cacheDir),
    keyOf: (folderHash) =>
      cacheKey({ folderHash, codeHash: context.codeHash, oscillatorsHash: context.oscillators?.hash ?? '', options }),
  };
}

const noTimes = (): TaskTimes => ({ hash: 0, load: 0, extract: 0, data: 0, emit: 0 });

/** Outcome of {@link lookupRecord}: a finished result (cache hit), or the task to run. */
export type LookupOutcome = { done: BuildTaskResult } | { task: BuildTask };

/** Per-build state of the main-thread lookups. */
export interface RecordLookup {
  lookup(index: number, yamlFile: string): Promise<LookupOutcome>;
}

/**
 * Prepare cache lookups for a build (main thread).
 * @param memo remembered folder fingerprints (unchanged folders are not read again)
 */
export function createRecordLookup(context: BuildTaskContext, memo?: FingerprintMemo): RecordLookup {
  const access = cacheAccess(context);
  return {
    async lookup(index, yamlFile) {
      const task: BuildTask = { index, yamlFile, validateOnly: false };
      if (!access) return { task };
      const t0 = performance.now();
      const folder = dirname(yamlFile);
      const fingerprint = await hashPartFolder(folder, memo).catch(() => undefined);
      if (!fingerprint) return { task };
      const key = access.keyOf(fingerprint.hash);
      const text = await access.cache.get(key);
      const header = text === undefined ? undefined : parseHeader(text);
      const t1 = performance.now();
      // the entry's files are linked into the data folder only when the build needs them there
      // (placeResultFiles): an incremental build needs just the changed parts' files
      const filesDir = access.cache.filesOf(key);
      if (header && (await filesPresent(filesDir, header.files))) {
        const ms = { ...noTimes(), hash: t1 - t0, emit: performance.now() - t1 };
        return {
          done: {
            index,
            yamlFile,
            id: header.id,
            idLine: header.idLine,
            issues: relocate(header.issues, folder),
            valid: true,
            cached: true,
            stats: header.stats,
            indexEntry: header.indexEntry,
            files: header.files,
            filesDir,
            key,
            ms,
          },
        };
      }
      return { task: { ...task, key } };
    },
  };
}

/** Runs the tasks of one build in one thread. */
export interface BuildTaskRunner {
  run(task: BuildTask): Promise<BuildTaskResult>;
}

/**
 * Prepare a runner for a build's tasks (loads the extraction code).
 * @throws Error when the oscillator circuits file has errors (the caller validates it first)
 */
export async function createBuildTaskRunner(context: BuildTaskContext): Promise<BuildTaskRunner> {
  const [
    { parseOscillatorsYaml },
    { loadPart },
    { extractPart },
    { makePartData },
    { makeIndexEntry },
    { makeDownloads, writeCatalogueData },
  ] = await Promise.all([
    import('../lib/osc/oscillators-yaml.ts'),
    import('./load-part.ts'),
    import('../lib/extract/extract-part.ts'),
    import('../lib/report/part-data.ts'),
    import('../lib/report/catalogue-entries.ts'),
    import('./emit.ts'),
  ]);
  let circuits: OscillatorCircuit[] = [];
  if (context.oscillators) {
    const parsed = parseOscillatorsYaml(context.oscillators.text, context.oscillators.file);
    if (parsed.issues.some((i) => i.severity === 'error')) throw new Error(`${context.oscillators.file} has errors`);
    circuits = parsed.circuits;
  }
  const access = cacheAccess(context);
  const dirs = new Set<string>();

  // An exception while processing one record is a bug, reported as that record's error so
  // the build still lists every other record's problems (and fails).
  const run = async (task: BuildTask): Promise<BuildTaskResult> => {
    try {
      return await processRecord(task);
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      return {
        index: task.index,
        yamlFile: task.yamlFile,
        valid: false,
        cached: false,
        ms: noTimes(),
        issues: [
          {
            severity: 'error',
            file: task.yamlFile,
            message: `internal error while building this part: ${message}`,
            code: 'internal',
          },
        ],
      };
    }
  };

  const processRecord = async (task: BuildTask): Promise<BuildTaskResult> => {
    const ms = noTimes();
    const base = { index: task.index, yamlFile: task.yamlFile, ms };
    const folder = dirname(task.yamlFile);
    let t = performance.now();
    const lap = (key: keyof TaskTimes) => {
      const now = performance.now();
      ms[key] += now - t;
      t = now;
    };

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
    const indexEntry = makeIndexEntry(data);
    const stats: PartStats = {
      samples: result.samples.length,
      modes: result.samples.reduce((n, s) => n + s.modes.length, 0),
      warnings: result.samples.reduce((n, s) => n + s.warnings.length, 0),
    };
    lap('data');

    // The part's files, written by the catalogue writer into a folder of their own; its
    // one-part index is dropped (the build writes the whole index once).
    const scratch = join(context.scratchDir, String(task.index));
    await writeCatalogueData(scratch, [{ data, downloads }]);
    await rm(join(scratch, 'index.json'), { force: true });
    const files = await listFiles(scratch);
    if (access && task.key) {
      const header: CacheHeader = {
        id: loaded.part.id,
        idLine,
        issues: portable(loaded.issues, folder),
        stats,
        indexEntry,
        files,
      };
      await access.cache.put(task.key, JSON.stringify(header), scratch);
      if (!(await linkFiles(access.cache.filesOf(task.key), files, context.dataDir, dirs))) {
        throw new Error(`cache entry ${task.key} lost its files while the build ran`);
      }
    } else {
      await linkFiles(scratch, files, context.dataDir, dirs, true);
      await rm(scratch, { recursive: true, force: true });
    }
    lap('emit');
    return {
      ...base,
      id: loaded.part.id,
      idLine,
      issues: loaded.issues,
      valid: true,
      cached: false,
      stats,
      indexEntry,
      files,
      key: task.key,
    };
  };
  return { run };
}

/** True when a cache entry still holds its files (the first and last stand for all: entries are written whole). */
async function filesPresent(dir: string, files: string[]): Promise<boolean> {
  const probe = files.length > 1 ? [files[0], files[files.length - 1]] : files;
  for (const rel of probe) if (!(await stat(join(dir, ...rel.split('/'))).catch(() => undefined))) return false;
  return true;
}

/**
 * Put the files of these results into `to` (hard links): from their cache entry, or from the
 * data folder when they were written there.
 * @returns false when a file is missing
 */
export async function placeResultFiles(results: BuildTaskResult[], dataDir: string, to: string): Promise<boolean> {
  const dirs = new Set<string>();
  let next = 0;
  let ok = true;
  const lane = async () => {
    while (next < results.length && ok) {
      const r = results[next++];
      const from = r.filesDir ?? dataDir;
      if (from === to || !r.files) continue;
      if (!(await linkFiles(from, r.files, to, dirs))) ok = false;
    }
  };
  await Promise.all(Array.from({ length: 8 }, lane));
  return ok;
}

/** Every file under a folder, relative, '/'-separated, sorted. */
async function listFiles(root: string): Promise<string[]> {
  const out: string[] = [];
  const walk = async (dir: string, rel: string) => {
    for (const e of (await readdir(dir, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const r = rel ? `${rel}/${e.name}` : e.name;
      if (e.isDirectory()) await walk(join(dir, e.name), r);
      else out.push(r);
    }
  };
  await walk(root, '');
  return out;
}

/**
 * Put `files` from `from` into the same places under `to`: hard links (a copy across file
 * systems), or renames when `move` is set. An existing target is left alone (two records with
 * one id: the build fails on the duplicate anyway).
 * @returns false when a source file is missing
 */
export async function linkFiles(
  from: string,
  files: string[],
  to: string,
  dirs = new Set<string>(),
  move = false,
): Promise<boolean> {
  for (const rel of files) {
    const parts = rel.split('/');
    const src = join(from, ...parts);
    const dest = join(to, ...parts);
    const dir = dirname(dest);
    if (!dirs.has(dir)) {
      await mkdir(dir, { recursive: true });
      dirs.add(dir);
    }
    try {
      await (move ? rename(src, dest) : link(src, dest));
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'EEXIST') continue;
      if (code === 'ENOENT') return false;
      if (code === 'EXDEV' || code === 'EPERM' || code === 'EMLINK') await copyFile(src, dest);
      else throw err;
    }
  }
  return true;
}

function parseHeader(text: string): CacheHeader | undefined {
  try {
    const h = JSON.parse(text) as CacheHeader;
    return Array.isArray(h.files) && h.indexEntry && typeof h.id === 'string' ? h : undefined;
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
  return issues.map((i) =>
    i.file.startsWith(`${FOLDER_MARK}/`) ? { ...i, file: join(folder, i.file.slice(FOLDER_MARK.length + 1)) } : i,
  );
}
