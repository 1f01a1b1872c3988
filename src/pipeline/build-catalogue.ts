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
import { existsSync } from 'node:fs';
import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import {
  OUTPUT_MARKER,
  cleanStale,
  createStaging,
  discardStaging,
  refuseReplace,
  swapInto,
  type StagingDir,
} from './atomic-dir.ts';
import { findPartFiles } from './check-paths.ts';
import { nodeFileSource } from './file-source.ts';
import { linkFiles, placeResultFiles, type BuildTaskContext } from './build-task.ts';
import { pruneCache, sha256 } from './cache.ts';
import { extractionCodeHash } from './code-hash.ts';
import type { IndexEntry } from '../lib/report/types.ts';
import { sortById } from '../lib/report/index-order.ts';
import { writeCatalogueExport } from './emit.ts';
import {
  PAGES_ENV,
  formatManifest,
  sitePathsOf,
  linkTree,
  overlayTree,
  placeCatalogueData,
  planPartialSite,
  readManifest,
  siteCodeHash,
  siteSupportsPartialPages,
} from './partial-site.ts';
import { writeProblemPages, type RecordProblems } from './problem-pages.ts';
import { adoptRenderer, newRendererDir, startRenderer, type PageRendererThread } from './page-renderer.ts';
import { type ProgressStream } from './progress.ts';
import { defaultJobs } from './worker-pool.ts';
import { normalizeBase } from './static-server.ts';
import { PROJECT_ROOT } from './project-root.ts';
import { BuildFailure } from './build-failure.ts';
import { cleanAstroRuns, countPublished, runAstroBuild, type AstroUsage } from './astro-build.ts';
import type { BuildStage, BuildSummary } from './build-summary.ts';
import { duplicateIds, readOscillators, runRecords } from './run-records.ts';

export { PROJECT_ROOT } from './project-root.ts';
export { runAstroBuild, astroEnv, ASTRO_ENV_DROPPED, type AstroBuildOptions, type AstroUsage } from './astro-build.ts';
export { formatIssues, formatSummary, type BuildStage, type BuildSummary } from './build-summary.ts';

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
  /**
   * Preview mode (`motional preview`): an invalid record does not fail the build; it is left out
   * of the catalogue and its page shows its problems (file, line, message) instead. The
   * published build never uses this.
   */
  problemPages?: boolean;
  /** Called as each stage starts (tests, progress in other UIs). */
  onStage?: (stage: BuildStage, info: { stagingRoot?: string }) => void;
}

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
    exitCode: 1,
    recordsFound: 0,
    recordsValid: 0,
    recordsInvalid: 0,
    partsPublished: 0,
    samples: 0,
    modes: 0,
    warnings: 0,
    errors: 0,
    cache: { enabled: useCache, hits: 0, misses: 0 },
    jobs,
    threads: 0,
    stageMs: { total: 0 },
    recordMs: { hash: 0, load: 0, extract: 0, data: 0, emit: 0 },
    peakRssBytes: { build: 0, site: 0 },
    cpuSeconds: { build: 0, site: 0 },
    issues: [],
    outDir,
  };
  let stageStart = t0;
  let current: BuildStage | undefined;
  let siteWritten = 0;
  let carried: Promise<boolean> | undefined;
  let problems: RecordProblems[] = [];
  let renderer: PageRendererThread | undefined;
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
    for (const [dir, given] of [
      [outDir, options.outDir ?? 'dist'],
      ...(options.keepDataDir ? [[resolve(options.keepDataDir), options.keepDataDir]] : []),
    ]) {
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
      summary.issues.push({
        severity: 'error',
        file: contentDir,
        message: 'content folder not found',
        code: 'missing',
      });
      throw new BuildFailure('no content');
    }
    const exclude = new Set([
      outDir,
      ...[options.keepDataDir, cacheDir].filter((d): d is string => !!d).map((d) => resolve(d)),
    ]);
    // the search `check` does: links followed (loop-safe), a folder past the depth limit is an error
    const discovered = await findPartFiles(nodeFileSource, contentDir, { exclude });
    const records = discovered.files;
    summary.issues.push(...discovered.issues);
    summary.recordsFound = records.length;
    if (records.length === 0) {
      summary.issues.push({
        severity: 'error',
        file: contentDir,
        message: 'no part.yaml in this folder or its subfolders',
        code: 'no-parts',
      });
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

    // When the previous output was built from the same site code and base path, an
    // incremental site is likely: its files are linked into the staging site while the records
    // are read (a link per file costs the same however it is made, so it runs alongside), and
    // the renderer thread loads the page modules meanwhile.
    const siteHash = options.dataOnly ? '' : await siteCodeHash(PROJECT_ROOT);
    const previous = options.dataOnly || options.fullSite || !useCache ? undefined : await readManifest(outDir);
    const siteDir = join(staging.root, 'site');
    if (
      previous?.kind === 'site' &&
      previous.siteHash === siteHash &&
      previous.base === basePath &&
      (await siteSupportsPartialPages())
    ) {
      carried = linkTree(outDir, siteDir, (rel) => rel === OUTPUT_MARKER).then(() => true);
      carried.catch(() => undefined); // settled before the site stage or the clean-up
      renderer = await startRenderer(siteHash, basePath).catch(() => undefined);
    }

    stage('records');
    // fingerprints of this content folder's parts are remembered between builds
    const memoFile = cacheDir
      ? join(cacheDir, 'fingerprints', `${sha256(resolve(contentDir)).slice(0, 16)}.json`)
      : undefined;
    const { results: allResults, threads } = await runRecords(
      records,
      context,
      jobs,
      oscillatorsBad,
      progressStream,
      options.signal,
      memoFile,
      options.problemPages,
    );
    let results = allResults;
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
    if (summary.issues.some((i) => i.severity === 'error')) {
      if (!options.problemPages || oscillatorsBad) throw new BuildFailure('invalid records');
      // preview: the invalid records get a page of their problems, the others are published
      const bad = results.filter((r) => !r.valid || invalid.has(r.yamlFile));
      problems = bad.map((r) => ({
        id: r.id,
        yamlFile: r.yamlFile,
        issues: summary.issues.filter((i) => i.file === r.yamlFile || i.file.startsWith(`${dirname(r.yamlFile)}/`)),
      }));
      results = results.filter((r) => !bad.includes(r));
      if (results.length === 0 && problems.length > 0) throw new BuildFailure('invalid records');
    }
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
    // a cached part's rows stay in its cache entry until (and unless) its files are placed
    const filesDirOf = new Map(results.map((r) => [r.id!, r.filesDir ?? dataDir]));
    await writeIndex(dataDir, index, (id) => filesDirOf.get(id) ?? dataDir);
    await rm(scratchDir, { recursive: true, force: true });
    const ids = index.map((e) => e.id);
    const partKeys = Object.fromEntries(results.map((r) => [r.id!, r.key]));
    const plan = previous ? planPartialSite(previous, { siteHash, base: basePath, parts: partKeys }) : undefined;
    const partial = plan && (await siteSupportsPartialPages()) ? plan : undefined;
    // cached parts' files go into the data folder only when the whole data folder is needed
    if (!partial || options.keepDataDir) {
      if (!(await placeResultFiles(results, dataDir, dataDir)))
        throw new Error('a cache entry lost its files while the build ran');
    }
    checkAbort();

    let builtDir = dataDir;
    if (!options.dataOnly) {
      stage('site');
      const astro = { basePath, progress: progressStream, log, signal: options.signal };
      let astroUsage: AstroUsage = { peakRssBytes: 0, cpuSeconds: 0, diskWrittenBytes: 0 };
      if (partial) {
        // The changed parts' pages (and the pages over all parts: home, compare) are rendered
        // from a data folder holding just those parts and the whole index; the rest comes from
        // the previous site, which stays untouched until the swap. When an earlier full build
        // left a checked renderer for this site code (page-renderer.ts), the pages are rendered
        // in a worker thread without starting the site generator.
        const deltaDir = join(staging.root, 'delta');
        const freshDir = join(staging.root, 'site-fresh');
        const changed = new Set(partial.changed);
        // every file over all parts (the index, and any catalogue-wide file the emit step adds)
        // and the changed parts' own files
        const overAll = (await readdir(dataDir, { withFileTypes: true })).filter((e) => e.isFile()).map((e) => e.name);
        const placed =
          (await linkFiles(dataDir, overAll, deltaDir)) &&
          (await placeResultFiles(
            results.filter((r) => changed.has(r.id!)),
            dataDir,
            deltaDir,
          ));
        if (!placed) throw new Error('a part file vanished while the build ran');
        const pagesFile = join(staging.root, 'pages.json');
        await writeFile(pagesFile, JSON.stringify(partial.changed));
        let renderedBy: 'pages' | 'generator' = 'generator';
        const replaced = new Set([...partial.changed, ...partial.removed]);
        if (renderer) {
          try {
            await renderer.render(freshDir, { dataDir: deltaDir, basePath, pagesFile, pagesEnvName: PAGES_ENV });
            await placeCatalogueData(deltaDir, freshDir);
            renderedBy = 'pages';
          } catch (err) {
            log(
              `rendering the changed pages without the site generator failed, so it runs: ${err instanceof Error ? err.message : String(err)}\n`,
            );
            await rm(freshDir, { recursive: true, force: true });
          }
        }
        checkAbort();
        if (renderedBy === 'generator') {
          astroUsage = await runAstroBuild({
            ...astro,
            dataDir: deltaDir,
            siteDir: freshDir,
            pages: partial.changed.length,
            pagesFile,
          });
        }
        // the previous site's files, linked while the records were read (or now), without the
        // changed and removed parts' files
        if (!(await settle(carried))) {
          await rm(siteDir, { recursive: true, force: true });
          await linkTree(outDir, siteDir, (rel) => rel === OUTPUT_MARKER);
        }
        carried = undefined;
        for (const id of [...replaced, ...(previous?.problems ?? [])]) {
          for (const rel of sitePathsOf(id))
            await rm(join(siteDir, ...rel.split('/')), { recursive: true, force: true });
        }
        await overlayTree(freshDir, siteDir);
        summary.site = {
          mode: 'partial',
          pagesRendered: partial.changed.length,
          partsRemoved: partial.removed.length,
          renderer: renderedBy,
        };
      } else {
        // a build with the cache keeps the generator's server chunks for later partial builds
        const keep = useCache ? newRendererDir() : undefined;
        await settle(carried);
        carried = undefined;
        await rm(siteDir, { recursive: true, force: true });
        astroUsage = await runAstroBuild({ ...astro, dataDir, siteDir, pages: ids.length, keepChunksDir: keep });
        summary.site = { mode: 'full', pagesRendered: ids.length, partsRemoved: 0, renderer: 'generator' };
        if (keep) {
          const refused = await adoptRenderer(keep, siteDir, siteHash, {
            dataDir,
            basePath,
            pagesEnvName: PAGES_ENV,
          }).catch((err: Error) => err.message);
          if (refused && process.env.MOTIONAL_DEBUG)
            log(`pages of later partial builds will be rendered by the site generator: ${refused}\n`);
        }
      }
      summary.peakRssBytes.site = astroUsage.peakRssBytes;
      summary.cpuSeconds.site = astroUsage.cpuSeconds;
      siteWritten = astroUsage.diskWrittenBytes;
      builtDir = siteDir;
      summary.partsPublished = await countPublished(siteDir, ids, basePath);
    } else {
      summary.partsPublished = await countPublishedData(dataDir, ids);
    }
    if (summary.partsPublished !== summary.recordsValid) {
      throw new BuildFailure(
        `internal error: ${summary.partsPublished} parts published but ${summary.recordsValid} valid records found`,
      );
    }
    checkAbort();

    const problemIds = options.dataOnly ? [] : await writeProblemPages(builtDir, problems, new Set(ids), basePath);

    stage('swap');
    if (options.keepDataDir && builtDir !== dataDir) {
      const keep = resolve(options.keepDataDir);
      await writeFile(
        join(dataDir, OUTPUT_MARKER),
        'written by motional build (--keep-data); the whole folder is replaced on the next build\n',
      );
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
      ...(problemIds.length > 0 ? { problems: problemIds } : {}),
    });
    await swapInto(staging, builtDir, { marker, background: true });
    staging = undefined;
    stage(undefined);
    if (context.cacheDir) await pruneCache(context.cacheDir).catch(() => 0);
    summary.exitCode = 0;
  } catch (err) {
    stage(undefined);
    await settle(carried);
    const message = err instanceof Error ? err.message : String(err);
    summary.failure = err instanceof BuildFailure ? message : `internal error: ${message}`;
    if (!(err instanceof BuildFailure) && err instanceof Error && err.stack && process.env.MOTIONAL_DEBUG)
      log(`${err.stack}\n`);
    if (staging) await discardStaging(staging).catch(() => undefined);
  }
  await renderer?.close().catch(() => undefined);
  summary.errors = summary.issues.filter((i) => i.severity === 'error').length;
  summary.warnings += summary.issues.filter((i) => i.severity === 'warning').length;
  const usage = process.resourceUsage();
  summary.peakRssBytes.build = usage.maxRSS * 1024;
  summary.cpuSeconds.build = (usage.userCPUTime + usage.systemCPUTime) / 1e6;
  summary.diskWrittenBytes = { build: usage.fsWrite * 512, site: siteWritten };
  summary.stageMs.total = performance.now() - t0;
  return summary;
}

/** Wait for a background step: true when it succeeded, false when it failed or never ran. */
async function settle(step: Promise<boolean> | undefined): Promise<boolean> {
  return step ? step.catch(() => false) : false;
}

/**
 * The search index: every part's row, in catalogue order (index-order.ts).
 */
async function writeIndex(dataDir: string, entries: IndexEntry[], filesDirOf: (id: string) => string): Promise<void> {
  await writeFile(join(dataDir, 'index.json'), JSON.stringify(sortById(entries)));
  await writeCatalogueExport(
    dataDir,
    sortById(entries).map((e) => e.id),
    filesDirOf,
  );
}

/** Parts whose data file was written: `<data>/parts/<id>.json`. */
async function countPublishedData(dataDir: string, ids: string[]): Promise<number> {
  let n = 0;
  for (const id of ids) if (existsSync(join(dataDir, 'parts', `${id}.json`))) n++;
  return n;
}
