/**
 * The site generator's child process: `astro build` of the catalogue site from a data folder
 * into a site folder, in a working folder of its own, with its progress, peak memory and CPU
 * time; and the count of part pages it published.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, readFile, readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { isProcessAlive } from './atomic-dir.ts';
import { BuildFailure } from './build-failure.ts';
import { RENDERER_ENV } from './page-renderer.ts';
import { PAGES_ENV } from './partial-site.ts';
import { createProgress, type ProgressStream } from './progress.ts';
import { PROJECT_ROOT } from './project-root.ts';

/** Working folders of Astro builds, one per build process (see runAstroBuild). */
const ASTRO_RUNS = join(PROJECT_ROOT, '.motional', 'astro-run');

/** Astro builds started by this process (names their working folders). */
let astroRuns = 0;

/** Remove Astro working folders of build processes that are gone. */
export async function cleanAstroRuns(): Promise<void> {
  for (const name of await readdir(ASTRO_RUNS).catch(() => [] as string[])) {
    const pid = Number(name.split('-')[0]);
    if (Number.isInteger(pid) && pid !== process.pid && !isProcessAlive(pid))
      await rm(join(ASTRO_RUNS, name), { recursive: true, force: true });
  }
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
  /** Keep the build's server chunks in this folder (page-renderer.ts). */
  keepChunksDir?: string;
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
export const ASTRO_ENV_DROPPED = [
  'BASE_URL',
  'MODE',
  'DEV',
  'PROD',
  'SSR',
  'SITE',
  'ASSETS_PREFIX',
  'NODE_ENV',
] as const;

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
  /** Bytes written to disk by the process (its I/O accounting, 512-byte blocks). */
  diskWrittenBytes: number;
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
      ...(run.keepChunksDir ? { [RENDERER_ENV]: run.keepChunksDir } : {}),
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
  const usage = await readFile(usageFile, 'utf8')
    .then((t) => JSON.parse(t) as NodeJS.ResourceUsage)
    .catch(() => undefined);
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
    diskWrittenBytes: usage ? usage.fsWrite * 512 : 0,
  };
}

/** Parts whose page exists in the built site: `<site>/parts/<id>/index.html` (or `parts/<id>.html`). */
export async function countPublished(siteDir: string, ids: string[], _basePath: string): Promise<number> {
  let n = 0;
  for (const id of ids) {
    const page = join(siteDir, 'parts', id, 'index.html');
    const flat = join(siteDir, 'parts', `${id}.html`);
    if (existsSync(page) || existsSync(flat)) n++;
  }
  return n;
}
