/**
 * Pages rendered without starting the site generator: a full `astro build` leaves its server
 * chunks (astro.config.mjs, env MOTIONAL_RENDERER_OUT); a later incremental build of the same
 * site code and base path imports them in a worker thread and renders just the pages it needs
 * with Astro's container API (page-render-worker.mjs). The worker starts in a fraction of a
 * second where the generator needs seconds.
 *
 * Trust is earned, not assumed: right after the full build, the first and last page of every
 * route are rendered from the kept chunks and compared with the pages Astro wrote. The only
 * differences the container API is known to make — the page's stylesheet links and the built
 * names of its scripts, which the generator adds from its asset manifest — are learned as a
 * per-route patch; with the patch applied the pages must be identical byte for byte, otherwise
 * the chunks are dropped and incremental builds run the generator as before.
 *
 * Kept chunks live in `<project>/.motional/renderer/<key>/` (inside the project: the chunks
 * import the site's packages from its node_modules), keyed by the site code fingerprint and the
 * base path; the newest {@link KEEP_RENDERERS} are kept.
 */
import { createHash } from 'node:crypto';
import { readFile, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { PROJECT_ROOT } from './project-root.ts';

/** Env variable telling astro.config.mjs where to keep the server chunks. */
export const RENDERER_ENV = 'MOTIONAL_RENDERER_OUT';

/** Kept renderers (different site code or base path) beyond this many are removed, oldest first. */
export const KEEP_RENDERERS = 3;

const RENDERERS = join(PROJECT_ROOT, '.motional', 'renderer');
const PATCH_FILE = 'patch.json';
const WORKER_URL = new URL('./page-render-worker.mjs', import.meta.url);

/** Per route url: stylesheet tags to add before `</head>`, script names to replace. */
export type RoutePatch = Record<string, { styles: string; scripts: Array<[string, string]> }>;

/** Folder of the kept renderer of a site fingerprint and base path. */
export function rendererDir(siteHash: string, basePath: string): string {
  return join(RENDERERS, createHash('sha256').update(`${siteHash}\0${basePath}`).digest('hex').slice(0, 20));
}

let fresh = 0;

/** A new folder for astro.config.mjs to keep the chunks of the coming full build in. */
export function newRendererDir(): string {
  return join(RENDERERS, `.new-${process.pid}-${++fresh}`);
}

/** True when a checked renderer exists for this site code and base path. */
export async function hasRenderer(siteHash: string, basePath: string): Promise<boolean> {
  return !!(await stat(join(rendererDir(siteHash, basePath), PATCH_FILE)).catch(() => undefined));
}

interface WorkerRun {
  rendererDir: string;
  mode: 'render' | 'probe';
  patch?: RoutePatch;
  env: Record<string, string>;
}

function runWorker<R>(run: WorkerRun, started?: (worker: Worker) => void): Promise<R> {
  return new Promise((resolvePromise, reject) => {
    const { env, ...data } = run;
    const worker = new Worker(WORKER_URL, { workerData: data, env: { ...process.env, ...env }, execArgv: [] });
    started?.(worker);
    let settled = false;
    worker.once('message', (msg: { ok: boolean; result?: R; error?: string }) => {
      settled = true;
      void worker.terminate();
      if (msg.ok) resolvePromise(msg.result as R);
      else reject(new Error(`page renderer: ${msg.error}`));
    });
    worker.once('error', (err) => {
      settled = true;
      reject(err);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`page renderer stopped (exit code ${code})`));
    });
  });
}

const STYLESHEET = /<link rel="stylesheet" href="[^"]*">/g;
const SCRIPT_SRC = /<script type="module" src="([^"]*)"><\/script>/g;

/**
 * The patch that turns a page rendered by the container into the page Astro built, or a reason
 * why there is none.
 */
export function learnPatch(
  container: string,
  built: string,
): { styles: string; scripts: Array<[string, string]> } | { reason: string } {
  const headEnd = built.indexOf('</head>');
  if (headEnd < 0) return { reason: 'no </head>' };
  const builtStyles = built.slice(0, headEnd).match(STYLESHEET) ?? [];
  const ownStyles = new Set(container.match(STYLESHEET) ?? []);
  const styles = builtStyles.filter((s) => !ownStyles.has(s)).join('');
  const from = [...container.matchAll(SCRIPT_SRC)].map((m) => m[1]);
  const to = [...built.matchAll(SCRIPT_SRC)].map((m) => m[1]);
  if (from.length !== to.length) return { reason: `${from.length} scripts rendered, ${to.length} built` };
  const scripts = from.map((f, i) => [`src="${f}"`, `src="${to[i]}"`] as [string, string]).filter(([a, b]) => a !== b);
  let patched = container;
  for (const [a, b] of scripts) patched = patched.split(a).join(b);
  if (styles) patched = patched.replace('</head>', `${styles}</head>`);
  if (patched !== built) {
    let i = 0;
    while (i < patched.length && patched[i] === built[i]) i++;
    return {
      reason: `differs at character ${i}: ${JSON.stringify(patched.slice(i, i + 60))} against ${JSON.stringify(built.slice(i, i + 60))}`,
    };
  }
  return { styles, scripts };
}

/** Environment of the pages: the data folder, the base path, the part pages to render. */
export interface PageEnv {
  dataDir: string;
  basePath: string;
  /** JSON file of the part ids whose pages to render (partial-site.ts: PAGES_ENV). */
  pagesFile?: string;
  pagesEnvName: string;
}

function envOf(p: PageEnv): Record<string, string> {
  return {
    MOTIONAL_DATA: p.dataDir,
    MOTIONAL_BASE: p.basePath,
    ...(p.pagesFile ? { [p.pagesEnvName]: p.pagesFile } : {}),
  };
}

/**
 * Check the chunks a full build kept in `keptDir` against the site it built (see module doc);
 * when they render it exactly, store them as the renderer of this site code and base path.
 * @returns undefined when stored, else why not
 */
export async function adoptRenderer(
  keptDir: string,
  siteDir: string,
  siteHash: string,
  env: PageEnv,
): Promise<string | undefined> {
  try {
    if (!(await stat(join(keptDir, 'pages')).catch(() => undefined))) return 'the site build kept no server chunks';
    const { probes } = await runWorker<{ probes: Array<{ url: string; rel: string; html: string }> }>({
      rendererDir: keptDir,
      mode: 'probe',
      env: envOf(env),
    });
    const patch: RoutePatch = {};
    for (const p of probes) {
      const built = await readFile(join(siteDir, ...p.rel.split('/')), 'utf8').catch(() => undefined);
      if (built === undefined) return `${p.rel} was not built`;
      const learned = learnPatch(p.html, built);
      if ('reason' in learned) return `${p.rel}: ${learned.reason}`;
      const known = patch[p.url];
      if (known && JSON.stringify(known) !== JSON.stringify(learned))
        return `${p.url}: pages of one route need different patches`;
      patch[p.url] = learned;
    }
    await writeFile(join(keptDir, PATCH_FILE), JSON.stringify(patch));
    const target = rendererDir(siteHash, env.basePath);
    await rm(target, { recursive: true, force: true });
    await rename(keptDir, target);
    await pruneRenderers();
    return undefined;
  } finally {
    await rm(keptDir, { recursive: true, force: true });
  }
}

/** A renderer thread started ahead of time (see {@link startRenderer}). */
export interface PageRendererThread {
  /**
   * Render every page that is not a part page, and the part pages the page list names, into
   * `outDir`. Once only.
   * @returns the files written, relative to outDir, '/'-separated
   */
  render(outDir: string, env: PageEnv): Promise<string[]>;
  /** Stop the thread (when the build does not need it after all). */
  close(): Promise<void>;
}

/**
 * Start the renderer of this site code and base path in a worker thread, which loads the page
 * modules while the build goes on; undefined when there is no checked renderer.
 */
export async function startRenderer(siteHash: string, basePath: string): Promise<PageRendererThread | undefined> {
  if (!(await hasRenderer(siteHash, basePath))) return undefined;
  const dir = rendererDir(siteHash, basePath);
  const patch = JSON.parse(await readFile(join(dir, PATCH_FILE), 'utf8')) as RoutePatch;
  let worker: Worker | undefined;
  const done = runWorker<{ written: string[] }>(
    { rendererDir: dir, mode: 'render', patch, env: {} },
    (w) => (worker = w),
  );
  done.catch(() => undefined); // awaited by render()
  return {
    async render(outDir, env) {
      worker!.postMessage({ outDir, env: envOf(env) });
      return (await done).written;
    },
    async close() {
      await worker?.terminate();
    },
  };
}

/** Remove all but the {@link KEEP_RENDERERS} newest renderers, and leftovers of dead builds. */
async function pruneRenderers(): Promise<void> {
  const names = await readdir(RENDERERS).catch(() => [] as string[]);
  const dated: Array<{ name: string; mtimeMs: number }> = [];
  for (const name of names) {
    const st = await stat(join(RENDERERS, name)).catch(() => undefined);
    if (!st) continue;
    if (name.startsWith('.new-')) {
      if (st.mtimeMs < Date.now() - 3_600_000) await rm(join(RENDERERS, name), { recursive: true, force: true });
    } else dated.push({ name, mtimeMs: st.mtimeMs });
  }
  dated.sort((a, b) => b.mtimeMs - a.mtimeMs);
  for (const d of dated.slice(KEEP_RENDERERS)) await rm(join(RENDERERS, d.name), { recursive: true, force: true });
}
