/**
 * The whole catalogue build: records in, a complete static site out, never half-written.
 *
 * Stages (each timed for the summary):
 * 1. discover — find every part.yaml under the content folder; read the oscillator circuits.
 * 2. records  — per record: fingerprint and cache lookup (main thread; a hit hard-links the
 *               part's stored files into a staging folder next to the output folder); the
 *               others in worker threads: load + validate + extract + page data + files.
 *               Once any record is invalid the remaining ones are only validated, so every
 *               problem of every record is still listed.
 *               Any error stops the build here: the staging folder is removed and the output
 *               folder was never touched.
 * 3. emit     — write the search index over all parts.
 * 4. site     — run the Astro build from the staged data into the staging folder.
 * 5. swap     — replace the output folder by the staged site (atomic-dir.ts).
 *
 * Accounting: parts published (pages in the built site) must equal the valid records found;
 * a mismatch is an internal error and nothing is swapped in.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, readFile, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { formatIssue, type Issue } from '../lib/issues.ts';
import { parseOscillatorsYaml } from '../lib/osc/oscillators-yaml.ts';
import { OUTPUT_MARKER, cleanStale, createStaging, discardStaging, isProcessAlive, refuseReplace, swapInto, type StagingDir } from './atomic-dir.ts';
import { findPartFiles } from './check-paths.ts';
import { nodeFileSource } from './file-source.ts';
import { createBuildTaskRunner, createRecordLookup, linkFiles, type BuildTask, type BuildTaskContext, type BuildTaskResult } from './build-task.ts';
import { loadFingerprintMemo, pruneCache, sha256 } from './cache.ts';
import { extractionCodeHash } from './code-hash.ts';
import type { IndexEntry } from '../lib/report/types.ts';
import { sortById } from '../lib/report/index-order.ts';
import { PAGES_ENV, belongsTo, formatManifest, linkTree, overlayTree, planPartialSite, readManifest, siteCodeHash, siteSupportsPartialPages } from './partial-site.ts';
import { createProgress, type ProgressStream } from './progress.ts';
import { createWorkerPool, defaultJobs, runLanes } from './worker-pool.ts';
import { normalizeBase } from './static-server.ts';

/** The project root: where astro.config.mjs and node_modules are. */
export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Working folders of Astro builds, one per build process (see runAstroBuild). */
const ASTRO_RUNS = join(PROJECT_ROOT, '.motional', 'astro-run');

/** Astro builds started by this process (names their working folders). */
let astroRuns = 0;

/** Remove Astro working folders of build processes that are gone. */
async function cleanAstroRuns(): Promise<void> {
  for (const name of await readdir(ASTRO_RUNS).catch(() => [] as string[])) {
    const pid = Number(name.split('-')[0]);
    if (Number.isInteger(pid) && pid !== process.pid && !isProcessAlive(pid)) await rm(join(ASTRO_RUNS, name), { recursive: true, force: true });
  }
}

/** How deep folders of part folders are searched (the search is `check`'s own, findPartFiles). */
export { MAX_SEARCH_DEPTH } from './check-paths.ts';

export interface BuildCatalogueOptions {
  /** Folder of part folders (and optionally oscillators.yaml). Default `content`. */
  contentDir?: string;
  /** Output folder, replaced as a whole. Default `dist`. */
  outDir?: string;
  /** Site base path. Default `/`. */
  base?: string;
  /** Worker threads; 1 runs everything in the main thread. Default: every core. */
  jobs?: number;
  /** Use the extraction cache. Default true. */
  cache?: boolean;
  /** Cache folder. Default `<project>/.motional/cache`. */
  cacheDir?: string;
  /** Skip the Astro build: the output folder receives the catalogue data only. */
  dataOnly?: boolean;
  /** Render every page even when only some parts changed (see partial-site.ts). */
  fullSite?: boolean;
  /** Also keep a copy of the emitted catalogue data here (replaced). */
  keepDataDir?: string;
  /** Progress display; false for none. Default process.stderr. */
  progress?: ProgressStream | false;
  /** Problem and log lines (without newline handling: each call is one or more full lines). */
  log?: (text: string) => void;
  /** Stop the build (the output folder stays as it was). */
  signal?: AbortSignal;
  /** Called as each stage starts (tests, progress in other UIs). */
  onStage?: (stage: BuildStage, info: { stagingRoot?: string }) => void;
}

export type BuildStage = 'discover' | 'records' | 'emit' | 'site' | 'swap';

export interface BuildSummary {
  /** 0 built, 1 invalid records or a failed build. */
  exitCode: 0 | 1;
  /** Why the build stopped, when it did. */
  failure?: string;
  recordsFound: number;
  recordsValid: number;
  recordsInvalid: number;
  partsPublished: number;
  samples: number;
  modes: number;
  /** Record warnings (issues) plus extraction warnings. */
  warnings: number;
  /** Error issues. */
  errors: number;
  cache: { enabled: boolean; hits: number; misses: number };
  /** Worker threads requested. */
  jobs: number;
  /** Worker threads started besides the main thread, which takes tasks too (0: main thread only). */
  threads: number;
  /** Wall time per stage and in all, ms. */
  stageMs: Partial<Record<BuildStage, number>> & { total: number };
  /**
   * Time per step summed over records, ms: fingerprint + cache, load + validate, extract, page
   * data, writing. Tasks in one thread overlap (one computes while another waits for the
   * disk), so these add up to more than the wall time; see cpuSeconds for the real cost.
   */
  recordMs: { hash: number; load: number; extract: number; data: number; emit: number };
  /** How the site was rendered: every page, or only the changed parts' pages over the previous site. */
  site?: { mode: 'full' | 'partial'; pagesRendered: number; partsRemoved: number };
  /** Peak resident memory, bytes: this process (all threads) and the Astro build process. */
  peakRssBytes: { build: number; site: number };
  /**
   * CPU time, seconds: this process (all threads, from its start) and the Astro process. Unlike
   * wall time it hardly depends on what else the machine is doing.
   */
  cpuSeconds: { build: number; site: number };
  issues: Issue[];
  outDir: string;
}

class BuildFailure extends Error {}

/** Run the whole build. Never throws for bad input: the summary says what happened. */
export async function buildCatalogue(options: BuildCatalogueOptions = {}): Promise<BuildSummary> {
  const t0 = performance.now();
  const contentDir = options.contentDir ?? 'content';
  const outDir = resolve(options.outDir ?? 'dist');
  const basePath = normalizeBase(options.base);
  const jobs = Math.max(1, Math.floor(options.jobs ?? defaultJobs()));
  const useCache = options.cache ?? true;
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  const progressStream = options.progress === false ? undefined : (options.progress ?? process.stderr);
  const summary: BuildSummary = {
    exitCode: 1, recordsFound: 0, recordsValid: 0, recordsInvalid: 0, partsPublished: 0, samples: 0, modes: 0,
    warnings: 0, errors: 0, cache: { enabled: useCache, hits: 0, misses: 0 }, jobs, threads: 0, stageMs: { total: 0 },
    recordMs: { hash: 0, load: 0, extract: 0, data: 0, emit: 0 }, peakRssBytes: { build: 0, site: 0 }, cpuSeconds: { build: 0, site: 0 }, issues: [], outDir,
  };
  let stageStart = t0;
  let current: BuildStage | undefined;
  let staging: StagingDir | undefined;
  const stage = (next: BuildStage | undefined) => {
    const now = performance.now();
    if (current) summary.stageMs[current] = now - stageStart;
    stageStart = now;
    current = next;
    if (next) options.onStage?.(next, { stagingRoot: staging?.root });
  };
  const checkAbort = () => {
    if (options.signal?.aborted) throw new BuildFailure('build stopped');
  };

  try {
    const cacheDir = useCache ? resolve(options.cacheDir ?? join(PROJECT_ROOT, '.motional', 'cache')) : undefined;
    const protect = [contentDir, PROJECT_ROOT, process.cwd(), ...(cacheDir ? [cacheDir] : [])];
    for (const [dir, given] of [[outDir, options.outDir ?? 'dist'], ...(options.keepDataDir ? [[resolve(options.keepDataDir), options.keepDataDir]] : [])]) {
      const refusal = await refuseReplace(dir, dir === outDir ? protect : [...protect, outDir]);
      if (refusal) {
        summary.issues.push({ severity: 'error', file: given, message: refusal, code: 'output' });
        throw new BuildFailure(refusal);
      }
    }
    await cleanStale(outDir);
    await cleanAstroRuns();
    stage('discover');
    if (!(await stat(contentDir).catch(() => undefined))?.isDirectory()) {
      summary.issues.push({ severity: 'error', file: contentDir, message: 'content folder not found', code: 'missing' });
      throw new BuildFailure('no content');
    }
    const exclude = new Set([outDir, ...[options.keepDataDir, cacheDir].filter((d): d is string => !!d).map((d) => resolve(d))]);
    // the search `check` does: links followed (loop-safe), a folder past the depth limit is an error
    const discovered = await findPartFiles(nodeFileSource, contentDir, { exclude });
    const records = discovered.files;
    summary.issues.push(...discovered.issues);
    summary.recordsFound = records.length;
    if (records.length === 0) {
      summary.issues.push({ severity: 'error', file: contentDir, message: 'no part.yaml in this folder or its subfolders', code: 'no-parts' });
      throw new BuildFailure('no records');
    }
    const beforeOscillators = summary.issues.length;
    const oscillators = await readOscillators(contentDir, summary.issues);
    const oscillatorsBad = summary.issues.slice(beforeOscillators).some((i) => i.severity === 'error');
    checkAbort();

    // The staging folder sits next to the output folder, which is not touched until the swap.
    staging = await createStaging(outDir);
    const dataDir = join(staging.root, 'data');
    const scratchDir = join(staging.root, 'scratch');
    await mkdir(dataDir, { recursive: true });
    await mkdir(scratchDir, { recursive: true });
    const context: BuildTaskContext = {
      cacheDir,
      // the code that makes each part's files keys its cache entries (once per build)
      codeHash: cacheDir ? await extractionCodeHash(PROJECT_ROOT) : '',
      // a bad circuits file fails the build; the records are still validated to list their problems
      oscillators: oscillatorsBad ? undefined : oscillators,
      basePath,
      dataDir,
      scratchDir,
    };

    stage('records');
    // fingerprints of this content folder's parts are remembered between builds
    const memoFile = cacheDir ? join(cacheDir, 'fingerprints', `${sha256(resolve(contentDir)).slice(0, 16)}.json`) : undefined;
    const { results, threads } = await runRecords(records, context, jobs, oscillatorsBad, progressStream, options.signal, memoFile);
    summary.threads = threads;
    for (const r of results) {
      summary.recordMs.hash += r.ms.hash;
      summary.recordMs.load += r.ms.load;
      summary.recordMs.extract += r.ms.extract;
      summary.recordMs.data += r.ms.data;
      summary.recordMs.emit += r.ms.emit;
      if (r.cached) summary.cache.hits++;
      else if (r.valid && r.indexEntry !== undefined) summary.cache.misses++;
    }
    summary.issues.push(...results.flatMap((r) => r.issues), ...duplicateIds(results));
    const invalid = new Set(summary.issues.filter((i) => i.severity === 'error').map((i) => i.file));
    summary.recordsInvalid = results.filter((r) => !r.valid || invalid.has(r.yamlFile)).length;
    summary.recordsValid = summary.recordsFound - summary.recordsInvalid;
    if (summary.issues.some((i) => i.severity === 'error')) throw new BuildFailure('invalid records');
    for (const r of results) {
      summary.samples += r.stats?.samples ?? 0;
      summary.modes += r.stats?.modes ?? 0;
      summary.warnings += r.stats?.warnings ?? 0;
    }
    checkAbort();

    stage('emit');
    const index = results.map((r) => {
      if (!r.indexEntry) throw new Error(`internal error: no data written for ${r.yamlFile}`);
      return r.indexEntry;
    });
    await writeIndex(dataDir, index);
    await rm(scratchDir, { recursive: true, force: true });
    const ids = index.map((e) => e.id);
    checkAbort();

    let builtDir = dataDir;
    const partKeys = Object.fromEntries(results.map((r) => [r.id!, r.key]));
    let siteHash = '';
    if (!options.dataOnly) {
      stage('site');
      siteHash = await siteCodeHash(PROJECT_ROOT);
      const plan = options.fullSite || !useCache ? undefined : planPartialSite(await readManifest(outDir), { siteHash, base: basePath, parts: partKeys });
      const partial = plan && (await siteSupportsPartialPages()) ? plan : undefined;
      const siteDir = join(staging.root, 'site');
      const astro = { basePath, progress: progressStream, log, signal: options.signal };
      let astroUsage: AstroUsage;
      if (partial) {
        // Astro renders the changed parts' pages (and the pages over all parts) from a data
        // folder holding just those parts and the whole index; the rest comes from the
        // previous site, which stays untouched until the swap.
        const deltaDir = join(staging.root, 'delta');
        const freshDir = join(staging.root, 'site-fresh');
        const changed = new Set(partial.changed);
        const deltaFiles = ['index.json', ...results.filter((r) => changed.has(r.id!)).flatMap((r) => r.files ?? [])];
        if (!(await linkFiles(dataDir, deltaFiles, deltaDir))) throw new Error('a part file vanished from the staging folder');
        const pagesFile = join(staging.root, 'pages.json');
        await writeFile(pagesFile, JSON.stringify(partial.changed));
        astroUsage = await runAstroBuild({ ...astro, dataDir: deltaDir, siteDir: freshDir, pages: partial.changed.length, pagesFile });
        const replaced = new Set([...partial.changed, ...partial.removed]);
        await linkTree(outDir, siteDir, (rel) => rel === OUTPUT_MARKER || belongsTo(rel, replaced));
        await overlayTree(freshDir, siteDir);
        summary.site = { mode: 'partial', pagesRendered: partial.changed.length, partsRemoved: partial.removed.length };
      } else {
        astroUsage = await runAstroBuild({ ...astro, dataDir, siteDir, pages: ids.length });
        summary.site = { mode: 'full', pagesRendered: ids.length, partsRemoved: 0 };
      }
      summary.peakRssBytes.site = astroUsage.peakRssBytes;
      summary.cpuSeconds.site = astroUsage.cpuSeconds;
      builtDir = siteDir;
      summary.partsPublished = await countPublished(siteDir, ids, basePath);
    } else {
      summary.partsPublished = await countPublishedData(dataDir, ids);
    }
    if (summary.partsPublished !== summary.recordsValid) {
      throw new BuildFailure(`internal error: ${summary.partsPublished} parts published but ${summary.recordsValid} valid records found`);
    }
    checkAbort();

    stage('swap');
    if (options.keepDataDir && builtDir !== dataDir) {
      const keep = resolve(options.keepDataDir);
      await writeFile(join(dataDir, OUTPUT_MARKER), 'written by motional build (--keep-data); the whole folder is replaced on the next build\n');
      await rm(keep, { recursive: true, force: true });
      await mkdir(dirname(keep), { recursive: true });
      await rename(dataDir, keep).catch(async () => {
        // another file system: copy instead
        const { cp } = await import('node:fs/promises');
        await cp(dataDir, keep, { recursive: true });
      });
    }
    const marker = formatManifest({
      kind: options.dataOnly ? 'data' : 'site',
      siteHash,
      base: basePath,
      parts: Object.fromEntries(Object.entries(partKeys).map(([id, key]) => [id, key ?? ''])),
    });
    await swapInto(staging, builtDir, { marker, background: true });
    staging = undefined;
    stage(undefined);
    if (context.cacheDir) await pruneCache(context.cacheDir).catch(() => 0);
    summary.exitCode = 0;
  } catch (err) {
    stage(undefined);
    const message = err instanceof Error ? err.message : String(err);
    summary.failure = err instanceof BuildFailure ? message : `internal error: ${message}`;
    if (!(err instanceof BuildFailure) && err instanceof Error && err.stack && process.env.MOTIONAL_DEBUG) log(`${err.stack}\n`);
    if (staging) await discardStaging(staging).catch(() => undefined);
  }
  summary.errors = summary.issues.filter((i) => i.severity === 'error').length;
  summary.warnings += summary.issues.filter((i) => i.severity === 'warning').length;
  const usage = process.resourceUsage();
  summary.peakRssBytes.build = usage.maxRSS * 1024;
  summary.cpuSeconds.build = (usage.userCPUTime + usage.systemCPUTime) / 1e6;
  summary.stageMs.total = performance.now() - t0;
  return summary;
}

/** The circuits file: `<content>/oscillators.yaml`, else the project's demo one, else none. */
async function readOscillators(contentDir: string, issues: Issue[]): Promise<BuildTaskContext['oscillators']> {
  const candidates = [join(contentDir, 'oscillators.yaml'), join(PROJECT_ROOT, 'content', 'oscillators.yaml')];
  const file = candidates.find((f) => existsSync(f));
  if (!file) return undefined;
  const text = await readFile(file, 'utf8');
  const parsed = parseOscillatorsYaml(text, file);
  issues.push(...parsed.issues);
  return { file, text, hash: sha256(text) };
}

/** Below this many records to extract, no threads are started (their start-up costs more). */
const MIN_RECORDS_FOR_THREADS = 4;
/** Cache lookups (hash + link) running at once in the main thread. */
const LOOKUP_CONCURRENCY = 8;

/**
 * Every record, in two passes: cache lookups in the main thread (hits are finished there),
 * then the rest through the main thread and the worker threads, taking tasks from one queue.
 */
async function runRecords(
  records: string[],
  context: BuildTaskContext,
  jobs: number,
  validateOnly: boolean,
  progressStream: ProgressStream | undefined,
  signal: AbortSignal | undefined,
  memoFile: string | undefined,
): Promise<{ results: BuildTaskResult[]; threads: number }> {
  const progress = createProgress({ label: 'records', total: records.length, stream: progressStream, silent: !progressStream });
  const results = new Array<BuildTaskResult>(records.length);
  let failed = validateOnly;
  let hits = 0;
  const note = () => (hits > 0 ? `${hits} cached` : undefined);

  const todo: BuildTask[] = [];
  const memo = memoFile ? await loadFingerprintMemo(memoFile) : undefined;
  const lookup = createRecordLookup(context, memo);
  let nextLookup = 0;
  const lookupLane = async (stopped: () => boolean) => {
    while (nextLookup < records.length && !stopped()) {
      if (signal?.aborted) throw new BuildFailure('build stopped');
      const index = nextLookup++;
      const outcome = await lookup.lookup(index, records[index]);
      if ('done' in outcome) {
        results[index] = outcome.done;
        hits++;
        progress.tick(1, note());
      } else {
        todo.push(outcome.task);
      }
    }
  };
  await runLanes(Math.min(records.length, LOOKUP_CONCURRENCY), lookupLane);
  await memo?.save().catch(() => undefined);
  todo.sort((a, b) => a.index - b.index);

  // The main thread always takes tasks too (it starts in a fraction of a second, while a
  // worker thread needs a second or two to load its code), plus jobs − 1 worker threads when
  // there is enough to do.
  const threads = jobs > 1 && todo.length >= MIN_RECORDS_FOR_THREADS ? Math.min(jobs - 1, todo.length - 1) : 0;
  const pool = threads > 0
    ? createWorkerPool<BuildTask, BuildTaskResult>({ moduleUrl: new URL('./build-worker.ts', import.meta.url), size: threads, workerData: context })
    : undefined;
  let next = 0;
  let halted = false; // a lane failed: the others stop after their current task
  const lane = (run: (task: BuildTask) => Promise<BuildTaskResult>) => async (stopped: () => boolean) => {
    try {
      while (next < todo.length && !stopped() && !halted) {
        if (signal?.aborted) throw new BuildFailure('build stopped');
        const task = todo[next++];
        const result = await run({ ...task, validateOnly: failed });
        if (!result.valid) failed = true;
        results[task.index] = result;
        progress.tick(1, note());
      }
    } catch (err) {
      halted = true;
      throw err;
    }
  };
  try {
    const lanes: Array<Promise<void>> = [];
    // two tasks per worker keep it busy while results travel back
    if (pool) lanes.push(runLanes(Math.min(todo.length, threads * 2), lane((task) => pool.run(task))));
    if (todo.length > 0) {
      const runner = await createBuildTaskRunner(context);
      lanes.push(runLanes(1, lane((task) => runner.run(task))));
    }
    const settled = await Promise.allSettled(lanes);
    const rejected = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (rejected) throw rejected.reason;
  } finally {
    await pool?.close();
  }
  progress.done(`${hits} cached, ${todo.length} processed${failed ? ', invalid records found' : ''}`);
  return { results, threads };
}

/**
 * The search index: every part's row, in catalogue order (index-order.ts).
 */
async function writeIndex(dataDir: string, entries: IndexEntry[]): Promise<void> {
  await writeFile(join(dataDir, 'index.json'), JSON.stringify(sortById(entries)));
}

/** Errors for every record whose id an earlier record (in path order) already uses. */
function duplicateIds(results: BuildTaskResult[]): Issue[] {
  const first = new Map<string, string>();
  const issues: Issue[] = [];
  for (const r of results) {
    if (r.id === undefined) continue;
    const seen = first.get(r.id);
    if (seen === undefined) first.set(r.id, r.yamlFile);
    else issues.push({ severity: 'error', file: r.yamlFile, line: r.idLine, path: 'id', message: `duplicate part id "${r.id}" (also in ${seen})`, code: 'duplicate-id' });
  }
  return issues;
}

/** What {@link runAstroBuild} builds. */
export interface AstroBuildOptions {
  /** Catalogue data folder (MOTIONAL_DATA). */
  dataDir: string;
  /** Output folder of the site (MOTIONAL_SITE_OUT). */
  siteDir: string;
  /** Base path (MOTIONAL_BASE), normalised. */
  basePath: string;
  /** Expected number of pages, for the progress display. */
  pages: number;
  /** JSON file of the part ids whose pages to render (partial builds); absent = all. */
  pagesFile?: string;
  progress: ProgressStream | undefined;
  /** Receives Astro's output when the build fails. */
  log: (text: string) => void;
  signal: AbortSignal | undefined;
}

/**
 * Names Vite and Astro read into `import.meta.env` (and NODE_ENV, which switches Vite's mode):
 * inherited values (a test runner sets BASE_URL=/ and MODE=test, CI systems set BASE_URL too)
 * would override the site's base path and build mode, so the Astro build never sees them.
 */
export const ASTRO_ENV_DROPPED = ['BASE_URL', 'MODE', 'DEV', 'PROD', 'SSR', 'SITE', 'ASSETS_PREFIX', 'NODE_ENV'] as const;

/** The environment of the Astro build: this process's, without {@link ASTRO_ENV_DROPPED}. */
export function astroEnv(env: NodeJS.ProcessEnv): NodeJS.ProcessEnv {
  const out = { ...env };
  for (const name of ASTRO_ENV_DROPPED) delete out[name];
  return out;
}

// Preloaded into the Astro process: ends it when the build process dies without cleaning up
// (kill -9; its parent id changes, and a site half-written into a staging folder helps nobody),
// and reports its peak memory and CPU time at exit.
const ASTRO_PRELOAD = `data:text/javascript,${encodeURIComponent(
  [
    'import { writeFileSync } from "node:fs";',
    'const p = process.ppid;',
    'setInterval(() => { if (process.ppid !== p) process.exit(129); }, 500).unref();',
    'const f = process.env.MOTIONAL_USAGE_FILE;',
    'if (f) process.on("exit", () => { try { writeFileSync(f, JSON.stringify(process.resourceUsage())); } catch {} });',
  ].join('\n'),
)}`;

/** Peak memory and CPU time of the Astro process. */
export interface AstroUsage {
  peakRssBytes: number;
  cpuSeconds: number;
}

/**
 * Run `astro build` of the catalogue site in a child process, safe to run alongside other
 * builds; its output is kept and shown only when it fails.
 * @returns peak memory and CPU time of the Astro process
 * @throws Error when Astro fails or the build is stopped
 */
export async function runAstroBuild(run: AstroBuildOptions): Promise<AstroUsage> {
  const astro = join(PROJECT_ROOT, 'node_modules', 'astro', 'astro.js');
  const progress = createProgress({ label: 'site', total: run.pages, stream: run.progress, silent: !run.progress });
  // Astro writes its intermediate server chunks to `<cwd>/.astro/` when the output folder is
  // not under the working directory. With the project root as working directory every build
  // would share that folder, and concurrent builds overwrite each other's pages. So each build
  // runs in a working folder of its own inside the project (the chunks must still find
  // node_modules), with --root naming the project.
  const cwd = join(ASTRO_RUNS, `${process.pid}-${++astroRuns}`);
  await rm(cwd, { recursive: true, force: true });
  await mkdir(cwd, { recursive: true });
  const usageFile = join(cwd, 'usage.json');
  const child = spawn(process.execPath, ['--import', ASTRO_PRELOAD, astro, 'build', '--root', PROJECT_ROOT], {
    cwd,
    env: {
      ...astroEnv(process.env),
      MOTIONAL_DATA: run.dataDir,
      MOTIONAL_BASE: run.basePath,
      MOTIONAL_SITE_OUT: run.siteDir,
      ...(run.pagesFile ? { [PAGES_ENV]: run.pagesFile } : {}),
      MOTIONAL_USAGE_FILE: usageFile,
      ASTRO_TELEMETRY_DISABLED: '1',
      NO_COLOR: '1',
      FORCE_COLOR: '0',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
    signal: run.signal,
    killSignal: 'SIGTERM',
  });
  const output: string[] = [];
  let outputBytes = 0;
  let pending = '';
  const onData = (chunk: Buffer) => {
    const text = chunk.toString('utf8');
    outputBytes += text.length;
    output.push(text);
    // keep the last ~200 kB for the error report
    while (outputBytes > 200_000 && output.length > 1) outputBytes -= output.shift()!.length;
    pending += text;
    const lines = pending.split('\n');
    pending = lines.pop() ?? '';
    const pages = lines.filter((l) => /(├─|└─)\s+\S+\.html/.test(l)).length;
    if (pages > 0) progress.tick(pages);
  };
  child.stdout.on('data', onData);
  child.stderr.on('data', onData);
  let peak = 0;
  const sample = async () => {
    if (child.pid === undefined) return;
    const status = await readFile(`/proc/${child.pid}/status`, 'utf8').catch(() => '');
    const m = /VmHWM:\s+(\d+) kB/.exec(status);
    if (m) peak = Math.max(peak, Number(m[1]) * 1024);
  };
  const timer = setInterval(() => void sample(), 200);
  const code = await new Promise<number | string>((done) => {
    child.on('error', (err) => done((err as NodeJS.ErrnoException).code ?? err.message));
    child.on('close', (c, sig) => done(c ?? sig ?? 'unknown'));
  });
  clearInterval(timer);
  const usage = await readFile(usageFile, 'utf8').then((t) => JSON.parse(t) as NodeJS.ResourceUsage).catch(() => undefined);
  await rm(cwd, { recursive: true, force: true });
  if (code !== 0) {
    progress.done('failed');
    run.log(`${output.join('').trimEnd()}\n`);
    throw new BuildFailure(run.signal?.aborted ? 'build stopped' : `astro build failed (exit ${code})`);
  }
  progress.done();
  return {
    peakRssBytes: usage ? Math.max(peak, usage.maxRSS * 1024) : peak,
    cpuSeconds: usage ? (usage.userCPUTime + usage.systemCPUTime) / 1e6 : 0,
  };
}

/** Parts whose page exists in the built site: `<site>/parts/<id>/index.html` (or `parts/<id>.html`). */
async function countPublished(siteDir: string, ids: string[], _basePath: string): Promise<number> {
  let n = 0;
  for (const id of ids) {
    const page = join(siteDir, 'parts', id, 'index.html');
    const flat = join(siteDir, 'parts', `${id}.html`);
    if (existsSync(page) || existsSync(flat)) n++;
  }
  return n;
}

/** Parts whose data file was written: `<data>/parts/<id>.json`. */
async function countPublishedData(dataDir: string, ids: string[]): Promise<number> {
  let n = 0;
  for (const id of ids) if (existsSync(join(dataDir, 'parts', `${id}.json`))) n++;
  return n;
}

/** Human-readable summary lines of a build. */
export function formatSummary(s: BuildSummary): string {
  const sec = (ms: number | undefined) => (ms === undefined ? '-' : `${(ms / 1000).toFixed(1)} s`);
  const mb = (b: number) => `${Math.round(b / 1e6)} MB`;
  const stages = (['discover', 'records', 'emit', 'site', 'swap'] as const)
    .filter((k) => s.stageMs[k] !== undefined)
    .map((k) => `${k} ${sec(s.stageMs[k])}`)
    .join(', ');
  const lines = [
    `records found: ${s.recordsFound} (${s.recordsValid} valid, ${s.recordsInvalid} invalid)`,
    `parts published: ${s.partsPublished}`,
    `samples: ${s.samples}, modes: ${s.modes}, warnings: ${s.warnings}, errors: ${s.errors}`,
    `cache: ${s.cache.enabled ? `${s.cache.hits} hits, ${s.cache.misses} misses` : 'off'}; worker threads: ${s.threads}`,
    ...(s.site ? [`site: ${s.site.mode === 'full' ? `all ${s.site.pagesRendered} part pages rendered` : `${s.site.pagesRendered} changed part pages rendered, ${s.site.partsRemoved} removed, the rest kept from the previous build`}`] : []),
    `time: ${stages}; total ${sec(s.stageMs.total)}`,
    `record steps (summed over records; tasks overlap): fingerprint ${sec(s.recordMs.hash)}, load ${sec(s.recordMs.load)}, extract ${sec(s.recordMs.extract)}, page data ${sec(s.recordMs.data)}, write ${sec(s.recordMs.emit)}`,
    `peak memory: build ${mb(s.peakRssBytes.build)}${s.peakRssBytes.site ? `, site ${mb(s.peakRssBytes.site)}` : ''}; CPU time: build ${s.cpuSeconds.build.toFixed(1)} s${s.cpuSeconds.site ? `, site ${s.cpuSeconds.site.toFixed(1)} s` : ''}`,
  ];
  if (s.exitCode === 0) lines.push(`built ${relative(process.cwd(), s.outDir) || '.'}`);
  else lines.push(`build failed: ${s.failure ?? 'unknown'}; ${relative(process.cwd(), s.outDir) || '.'} left unchanged`);
  return `${lines.join('\n')}\n`;
}

/** Every issue as `FILE:LINE: message`, one per line. */
export function formatIssues(issues: Issue[]): string {
  return issues.map((i) => `${formatIssue(i)}\n`).join('');
}
