/**
 * Benchmark of the whole catalogue build on synthetic catalogues (invented parts generated on
 * the fly into a temporary folder: 3 samples × 3 sweeps each, see lib/synthetic-catalogue.ts).
 *
 * Per size: the cold build (empty cache) as its own process — wall time, time per part,
 * stage times, peak memory of the build process (all its threads) and of the Astro process —
 * then the warm rebuild after one record changed, and a bare Astro build of the same number
 * of empty pages for comparison.
 *
 * Also the weight of the pages: the catalogue page (raw and gzip) and the largest part page of
 * each synthetic site, and the largest part page of the demo catalogue (content/).
 *
 * Targets (2-core machine, issue 15): cold 1,000 parts ≤ 30 s and 3,000 ≤ 90 s (ratio to the
 * bare generator printed beside); warm rebuild after one record changed ≤ 4 s at 1,000 and
 * ≤ 6 s at 3,000; catalogue page ≤ 400 KB raw and ≤ 80 KB gzip at 3,000; largest demo part page
 * ≤ 150 KB; peak memory ≤ 2 GB; disk written per warm rebuild reported.
 *
 * Run alone: `npx tsx scripts/bench/build.ts [--sizes 100,1000] [--keep]`
 */
import { spawn } from 'node:child_process';
import { mkdir, mkdtemp, readFile, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { gzipSync } from 'node:zlib';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { PROJECT_ROOT, type BuildSummary } from '../../src/pipeline/build-catalogue.ts';
import { syntheticPartId, writeSyntheticCatalogueParallel } from './lib/synthetic-catalogue.ts';

export interface BenchBuildOptions {
  /** Catalogue sizes in parts (default 100, 1000, 3000; quick: 30, 100). */
  sizes?: number[];
  /** Small sizes only. */
  quick?: boolean;
  /** Keep the temporary catalogues and sites (their folder is printed). */
  keep?: boolean;
}

/** Measured numbers of one catalogue size. */
export interface BenchBuildSize {
  parts: number;
  /** Seconds to generate the synthetic catalogue (not part of the build). */
  generateSeconds: number;
  /** Megabytes (1e6 bytes) of record and sweep files. */
  catalogueMB: number;
  cold: BuildRun;
  warm: BuildRun & { pctOfCold: number };
  /** Bare Astro build of `parts` empty pages, seconds (wall, one process). */
  bareAstroSeconds: number;
  /** Cold build wall time over the bare Astro build's. */
  ratioToBareAstro: number;
  /** Page weight of the synthetic site after the warm rebuild. */
  pages: PageWeights;
}

/** Bytes of the catalogue page and of the largest part page of a built site. */
export interface PageWeights {
  catalogueKB: number;
  catalogueGzipKB: number;
  /** The catalogue's data file (data/index.json), raw and gzip. */
  catalogueDataKB: number;
  catalogueDataGzipKB: number;
  largestPartKB: number;
  largestPartId: string;
}

/** One build run, seen from outside (wall time of the whole command) and from its summary. */
export interface BuildRun {
  /** Wall time of the `motional build` process, seconds. */
  seconds: number;
  /** Wall seconds per part. */
  perPartMs: number;
  /** Stage wall times from the summary, seconds. */
  stages: Record<string, number>;
  /** Thread time over all records, seconds: load + validate, extract, page data, writing files. */
  threadSeconds: { load: number; extract: number; data: number; write: number };
  /** How the site was rendered ('full' or 'partial') and how many part pages. */
  site: { mode: string; pagesRendered: number };
  cacheHits: number;
  cacheMisses: number;
  /** CPU seconds: build process (all threads) and Astro process (less affected by other load than wall time). */
  cpuSeconds: { build: number; site: number };
  /** Peak resident memory, MB: build process (all threads), Astro process, and their sum. */
  peakRssMB: { build: number; site: number; sum: number };
  /** MB written to disk by the build process and the site generator (their I/O accounting). */
  diskWrittenMB: { build: number; site: number; sum: number };
  modes: number;
  warnings: number;
}

export interface BenchBuildResult {
  cores: number;
  /** 1-minute load average before and after the runs (other work on the machine skews times). */
  loadAverage: { before: number; after: number };
  sizes: BenchBuildSize[];
  /** Page weight of the demo catalogue (content/), built once. */
  demo?: PageWeights;
  /** Marginal cost per part between the smallest and largest size, ms (fixed costs removed). */
  marginalPerPartMs?: number;
  /** Targets and whether each was met (undefined: size not measured). */
  targets: {
    cold1000Under30s?: boolean;
    cold3000Under90s?: boolean;
    warm1000Under4s?: boolean;
    warm3000Under6s?: boolean;
    catalogue3000Under400KB?: boolean;
    catalogue3000GzipUnder80KB?: boolean;
    demoPartUnder150KB?: boolean;
    peakUnder2GB: boolean;
    perPartFlat?: boolean;
  };
}

const MB = 1e6;

function runBuild(args: string[]): Promise<{ code: number | null; seconds: number; stderr: string }> {
  return new Promise((resolve) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/motional.ts', 'build', ...args], {
      cwd: PROJECT_ROOT,
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' },
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    let stderr = '';
    child.stderr.on('data', (c: Buffer) => {
      stderr += c.toString();
      if (stderr.length > 100_000) stderr = stderr.slice(-50_000);
    });
    child.on('close', (code) => resolve({ code, seconds: (performance.now() - t0) / 1000, stderr }));
  });
}

async function measuredBuild(
  content: string,
  out: string,
  cache: string,
  summaryFile: string,
  parts: number,
): Promise<BuildRun> {
  const run = await runBuild([
    '--content',
    content,
    '--out',
    out,
    '--cache-dir',
    cache,
    '--summary',
    summaryFile,
    '--quiet',
  ]);
  if (run.code !== 0) throw new Error(`build of ${parts} parts failed (exit ${run.code}):\n${run.stderr.slice(-4000)}`);
  const s = JSON.parse(await readFile(summaryFile, 'utf8')) as BuildSummary;
  const stages: Record<string, number> = {};
  for (const k of ['discover', 'records', 'emit', 'site', 'swap', 'total'] as const) {
    const v = s.stageMs[k];
    if (typeof v === 'number') stages[k] = v / 1000;
  }
  return {
    seconds: run.seconds,
    perPartMs: (run.seconds * 1000) / parts,
    stages,
    threadSeconds: {
      load: s.recordMs.load / 1000,
      extract: s.recordMs.extract / 1000,
      data: s.recordMs.data / 1000,
      write: s.recordMs.emit / 1000,
    },
    site: { mode: s.site?.mode ?? 'none', pagesRendered: s.site?.pagesRendered ?? 0 },
    cacheHits: s.cache.hits,
    cacheMisses: s.cache.misses,
    cpuSeconds: { build: s.cpuSeconds.build, site: s.cpuSeconds.site },
    peakRssMB: {
      build: s.peakRssBytes.build / MB,
      site: s.peakRssBytes.site / MB,
      sum: (s.peakRssBytes.build + s.peakRssBytes.site) / MB,
    },
    diskWrittenMB: {
      build: (s.diskWrittenBytes?.build ?? 0) / MB,
      site: (s.diskWrittenBytes?.site ?? 0) / MB,
      sum: ((s.diskWrittenBytes?.build ?? 0) + (s.diskWrittenBytes?.site ?? 0)) / MB,
    },
    modes: s.modes,
    warnings: s.warnings,
  };
}

/**
 * A bare Astro project of `pages` empty pages, built once; its folder sits inside the project
 * (the build's chunks must resolve node_modules).
 * @returns wall seconds
 */
async function bareAstroBuild(pages: number, keep: boolean): Promise<number> {
  const root = join(PROJECT_ROOT, '.motional', 'bench', `bare-${pages}-${process.pid}`);
  await rm(root, { recursive: true, force: true });
  await mkdir(join(root, 'src', 'pages', 'p'), { recursive: true });
  await writeFile(
    join(root, 'astro.config.mjs'),
    "export default { output: 'static', build: { format: 'directory' } };\n",
  );
  await writeFile(join(root, 'src', 'pages', 'index.astro'), '<html><body><h1>bare</h1></body></html>\n');
  await writeFile(
    join(root, 'src', 'pages', 'p', '[id].astro'),
    `---\nexport function getStaticPaths() {\n  return Array.from({ length: ${pages} }, (_, i) => ({ params: { id: String(i) } }));\n}\nconst { id } = Astro.params;\n---\n<html><body><p>{id}</p></body></html>\n`,
  );
  const astro = join(PROJECT_ROOT, 'node_modules', 'astro', 'astro.js');
  const t0 = performance.now();
  const code = await new Promise<number | null>((resolve) => {
    const child = spawn(process.execPath, [astro, 'build', '--root', root], {
      cwd: root,
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' },
      stdio: 'ignore',
    });
    child.on('close', resolve);
  });
  const seconds = (performance.now() - t0) / 1000;
  if (!keep) await rm(root, { recursive: true, force: true });
  if (code !== 0) throw new Error(`bare Astro build of ${pages} pages failed (exit ${code})`);
  return seconds;
}

/** Weights of the catalogue page, its data file and the largest part page of a built site. */
export async function pageWeights(site: string): Promise<PageWeights> {
  const KB = 1024;
  const home = await readFile(join(site, 'index.html'));
  const data = await readFile(join(site, 'data', 'index.json')).catch(() => Buffer.alloc(0));
  let largest = { bytes: 0, id: '' };
  for (const id of await readdir(join(site, 'parts'))) {
    const st = await stat(join(site, 'parts', id, 'index.html')).catch(() => undefined);
    if (st && st.size > largest.bytes) largest = { bytes: st.size, id };
  }
  return {
    catalogueKB: home.length / KB,
    catalogueGzipKB: gzipSync(home).length / KB,
    catalogueDataKB: data.length / KB,
    catalogueDataGzipKB: gzipSync(data).length / KB,
    largestPartKB: largest.bytes / KB,
    largestPartId: largest.id,
  };
}

/** Build the demo catalogue (content/) once into a temporary folder and weigh its pages. */
async function demoWeights(log: (t: string) => void): Promise<PageWeights> {
  const root = await mkdtemp(join(tmpdir(), 'motional-bench-demo-'));
  try {
    log('demo catalogue: building to weigh its pages\n');
    const run = await runBuild([
      '--content',
      join(PROJECT_ROOT, 'content'),
      '--out',
      join(root, 'site'),
      '--cache-dir',
      join(root, 'cache'),
      '--quiet',
    ]);
    if (run.code !== 0) throw new Error(`demo build failed (exit ${run.code}):\n${run.stderr.slice(-4000)}`);
    return await pageWeights(join(root, 'site'));
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}

async function folderMB(dir: string): Promise<number> {
  const { readdir, stat } = await import('node:fs/promises');
  let bytes = 0;
  const walk = async (d: string) => {
    for (const e of await readdir(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) await walk(p);
      else bytes += (await stat(p)).size;
    }
  };
  await walk(dir);
  return bytes / MB;
}

async function benchSize(parts: number, keep: boolean, log: (t: string) => void): Promise<BenchBuildSize> {
  const root = await mkdtemp(join(tmpdir(), `motional-bench-${parts}-`));
  const content = join(root, 'content');
  const out = join(root, 'site');
  const cache = join(root, 'cache');
  try {
    log(`${parts} parts: generating in ${root}\n`);
    const g0 = performance.now();
    await writeSyntheticCatalogueParallel(content, parts, { samples: 3 });
    const generateSeconds = (performance.now() - g0) / 1000;
    const catalogueMB = await folderMB(content);
    log(`${parts} parts: ${catalogueMB.toFixed(0)} MB generated in ${generateSeconds.toFixed(1)} s; cold build\n`);
    const cold = await measuredBuild(content, out, cache, join(root, 'cold.json'), parts);
    log(`${parts} parts: cold ${cold.seconds.toFixed(1)} s; warm rebuild after touching one record\n`);
    const yaml = join(content, 'parts', syntheticPartId(1), 'part.yaml');
    await writeFile(
      yaml,
      (await readFile(yaml, 'utf8')).replace(/^title: .*$/m, 'title: synthetic crystal 1 (touched)'),
    );
    const warmRun = await measuredBuild(content, out, cache, join(root, 'warm.json'), parts);
    const warm = { ...warmRun, pctOfCold: (100 * warmRun.seconds) / cold.seconds };
    log(`${parts} parts: warm ${warm.seconds.toFixed(1)} s (${warm.cacheMisses} re-extracted); bare Astro build\n`);
    const pages = await pageWeights(out);
    const bareAstroSeconds = await bareAstroBuild(parts, keep);
    return {
      parts,
      generateSeconds,
      catalogueMB,
      cold,
      warm,
      bareAstroSeconds,
      ratioToBareAstro: cold.seconds / bareAstroSeconds,
      pages,
    };
  } finally {
    if (!keep) await rm(root, { recursive: true, force: true });
  }
}

/** Run the build benchmark over the sizes. */
export async function benchBuild(options: BenchBuildOptions = {}): Promise<BenchBuildResult> {
  const sizes = options.sizes ?? (options.quick ? [30, 100] : [100, 1000, 3000]);
  const log = (t: string) => void process.stderr.write(`bench build: ${t}`);
  const loadBefore = loadavg()[0];
  const results: BenchBuildSize[] = [];
  const demo = options.quick ? undefined : await demoWeights(log);
  for (const n of sizes) results.push(await benchSize(n, options.keep ?? false, log));
  const first = results[0];
  const last = results[results.length - 1];
  const marginal =
    results.length > 1 && last.parts > first.parts
      ? ((last.cold.seconds - first.cold.seconds) * 1000) / (last.parts - first.parts)
      : undefined;
  const at1000 = results.find((r) => r.parts === 1000);
  const at3000 = results.find((r) => r.parts === 3000);
  const big = results.filter((r) => r.parts >= 100);
  return {
    cores: availableParallelism(),
    loadAverage: { before: loadBefore, after: loadavg()[0] },
    sizes: results,
    demo,
    marginalPerPartMs: marginal,
    targets: {
      cold1000Under30s: at1000 ? at1000.cold.seconds <= 30 : undefined,
      cold3000Under90s: at3000 ? at3000.cold.seconds <= 90 : undefined,
      warm1000Under4s: at1000 ? at1000.warm.seconds <= 4 : undefined,
      warm3000Under6s: at3000 ? at3000.warm.seconds <= 6 : undefined,
      catalogue3000Under400KB: at3000 ? at3000.pages.catalogueKB <= 400 : undefined,
      catalogue3000GzipUnder80KB: at3000 ? at3000.pages.catalogueGzipKB <= 80 : undefined,
      demoPartUnder150KB: demo ? demo.largestPartKB <= 150 : undefined,
      peakUnder2GB: results.every((r) => r.cold.peakRssMB.sum <= 2000 && r.warm.peakRssMB.sum <= 2000),
      // flat: the per-part cost at the largest size is not above the smallest size's (5 % slack)
      perPartFlat: big.length > 1 ? big[big.length - 1].cold.perPartMs <= 1.05 * big[0].cold.perPartMs : undefined,
    },
  };
}

function parseSizes(argv: string[]): number[] | undefined {
  const i = argv.findIndex((a) => a === '--sizes' || a.startsWith('--sizes='));
  if (i < 0) return undefined;
  const text = argv[i].includes('=') ? argv[i].slice(8) : argv[i + 1];
  const sizes = (text ?? '').split(',').map(Number);
  if (sizes.length === 0 || sizes.some((n) => !Number.isInteger(n) || n < 1))
    throw new Error(`--sizes expects whole numbers such as 100,1000, got "${text}"`);
  return sizes;
}

function weights(w: PageWeights): string {
  return `catalogue page ${w.catalogueKB.toFixed(0)} KB (gzip ${w.catalogueGzipKB.toFixed(0)} KB), its data file ${w.catalogueDataKB.toFixed(0)} KB (gzip ${w.catalogueDataGzipKB.toFixed(0)} KB); largest part page ${w.largestPartKB.toFixed(0)} KB (${w.largestPartId})`;
}

/** Plain-text table of the results. */
export function formatBenchBuild(r: BenchBuildResult): string {
  const rows = r.sizes.map((s) =>
    [
      String(s.parts).padStart(5),
      `${s.cold.seconds.toFixed(1)} s`.padStart(9),
      `${s.cold.perPartMs.toFixed(0)} ms`.padStart(8),
      `${s.warm.seconds.toFixed(1)} s`.padStart(8),
      `${s.warm.pctOfCold.toFixed(1)} %`.padStart(7),
      `${s.cold.peakRssMB.build.toFixed(0)}+${s.cold.peakRssMB.site.toFixed(0)} MB`.padStart(13),
      `${s.bareAstroSeconds.toFixed(1)} s`.padStart(8),
      `${s.ratioToBareAstro.toFixed(1)}×`.padStart(6),
      `${s.warm.diskWrittenMB.sum.toFixed(1)} MB`.padStart(9),
    ].join('  '),
  );
  const head = 'parts       cold  per part      warm  warm/cold  peak (build+site)  bare Astro  ratio  warm disk';
  const fmt = (o: Record<string, number>) =>
    Object.entries(o)
      .map(([k, v]) => `${k} ${v.toFixed(1)} s`)
      .join(', ');
  const stages = r.sizes.flatMap((s) => [
    `  ${s.parts} parts cold: ${fmt(s.cold.stages)}; task time ${fmt(s.cold.threadSeconds)}; CPU ${fmt(s.cold.cpuSeconds)}; site ${s.cold.site.mode}`,
    `  ${s.parts} parts warm: ${fmt(s.warm.stages)}; CPU ${fmt(s.warm.cpuSeconds)}; ${s.warm.cacheMisses} re-extracted; site ${s.warm.site.mode} (${s.warm.site.pagesRendered} part pages rendered); disk written ${s.warm.diskWrittenMB.sum.toFixed(1)} MB (cold ${s.cold.diskWrittenMB.sum.toFixed(0)} MB)`,
    `  ${s.parts} parts pages: ${weights(s.pages)}`,
  ]);
  const t = r.targets;
  const yes = (b: boolean | undefined) => (b === undefined ? 'not measured' : b ? 'met' : 'MISSED');
  const targets = [
    `cold 1,000 ≤ 30 s ${yes(t.cold1000Under30s)}`,
    `cold 3,000 ≤ 90 s ${yes(t.cold3000Under90s)}`,
    `warm 1,000 ≤ 4 s ${yes(t.warm1000Under4s)}`,
    `warm 3,000 ≤ 6 s ${yes(t.warm3000Under6s)}`,
    `catalogue page 3,000 ≤ 400 KB ${yes(t.catalogue3000Under400KB)}, ≤ 80 KB gzip ${yes(t.catalogue3000GzipUnder80KB)}`,
    `demo part page ≤ 150 KB ${yes(t.demoPartUnder150KB)}`,
    `peak ≤ 2 GB ${yes(t.peakUnder2GB)}`,
    `flat per part ${yes(t.perPartFlat)}`,
  ];
  return [
    `cores: ${r.cores}; load average ${r.loadAverage.before.toFixed(1)} before, ${r.loadAverage.after.toFixed(1)} after`,
    head,
    ...rows,
    ...stages,
    r.marginalPerPartMs !== undefined ? `marginal cost per part: ${r.marginalPerPartMs.toFixed(0)} ms` : '',
    r.demo ? `demo catalogue pages: ${weights(r.demo)}` : '',
    `targets: ${targets.join('; ')}`,
  ]
    .filter(Boolean)
    .join('\n');
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const argv = process.argv.slice(2);
  const result = await benchBuild({
    sizes: parseSizes(argv),
    quick: argv.includes('--quick'),
    keep: argv.includes('--keep'),
  });
  process.stdout.write(`${formatBenchBuild(result)}\n`);
}
