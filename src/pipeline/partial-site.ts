/**
 * Incremental site builds: when only some parts changed since the site in the output folder
 * was built, Astro renders just their pages (plus the pages over all parts: home, compare)
 * and every other file is taken over from the previous site by hard link.
 *
 * Safe only when a part page depends on nothing but its own data, the base path and the site
 * code. So a partial build needs:
 * - the previous output's manifest (in its marker file): the same site code fingerprint
 *   (everything under src/, astro.config.mjs, package.json, package-lock.json, Node version),
 *   the same base path, and each part's cache key (which covers its data);
 * - a site that can render a subset of part pages: src/site/catalogue.ts exporting
 *   `partPageIds()`, which reads the ids from the JSON file named by env {@link PAGES_ENV};
 * - fewer than {@link MAX_PARTIAL_SHARE} of the parts changed.
 * Otherwise the build renders the whole site.
 *
 * Where a part's files sit in the site (astro.config.mjs copies the data folder's compare/ and
 * downloads/ into data/compare/ and downloads/): {@link sitePathsOf}.
 */
import { createHash } from 'node:crypto';
import { link, mkdir, readFile, readdir, rename, rm, stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { OUTPUT_MARKER } from './atomic-dir.ts';
import { runLanes } from './worker-pool.ts';
import { SITE_DATA_COPIES } from './site-data-copies.mjs';

export { SITE_DATA_COPIES };

/** Env variable naming the JSON file of part ids whose pages to render. */
export const PAGES_ENV = 'MOTIONAL_PAGES';

/** Above this share of changed parts the whole site is rendered. */
export const MAX_PARTIAL_SHARE = 0.5;

/** What an output folder was built from, stored as JSON in its marker file. */
export interface OutputManifest {
  tool: 'motional build';
  version: 1;
  kind: 'site' | 'data';
  /** Fingerprint of the site code ({@link siteCodeHash}). */
  siteHash: string;
  base: string;
  /** Part id → cache key of its data (empty when the cache was off). */
  parts: Record<string, string>;
  /** Ids of records shown as a page of their problems (preview builds only). */
  problems?: string[];
}

/** Marker text of an output folder. */
export function formatManifest(m: Omit<OutputManifest, 'tool' | 'version'>): string {
  const full: OutputManifest = { tool: 'motional build', version: 1, ...m };
  return `${JSON.stringify(full)}\n`;
}

/** The manifest of an output folder, or undefined (no marker, or an older kind of marker). */
export async function readManifest(outDir: string): Promise<OutputManifest | undefined> {
  try {
    const m = JSON.parse(await readFile(join(outDir, OUTPUT_MARKER), 'utf8')) as OutputManifest;
    return m.tool === 'motional build' && m.version === 1 && m.parts && typeof m.siteHash === 'string' ? m : undefined;
  } catch {
    return undefined;
  }
}

const SITE_CODE = ['src', 'astro.config.mjs', 'package.json', 'package-lock.json'];

/** sha256 over the site code: every file under src/, the Astro config, the package files, Node's version. */
export async function siteCodeHash(projectRoot: string): Promise<string> {
  const h = createHash('sha256');
  h.update(`node ${process.version}\0`);
  const walk = async (rel: string): Promise<void> => {
    const path = join(projectRoot, rel);
    const st = await stat(path).catch(() => undefined);
    if (!st) return;
    if (st.isDirectory()) {
      for (const name of (await readdir(path)).sort()) await walk(`${rel}/${name}`);
    } else if (st.isFile()) {
      h.update(`${rel}\0${st.size}\0`);
      h.update(await readFile(path));
    }
  };
  for (const rel of SITE_CODE) await walk(rel);
  return h.digest('hex');
}

/**
 * True when the site can render a subset of part pages (see module doc). Read from the site's
 * code as text, like the fingerprint: the pipeline builds the site but imports none of it
 * (DEVELOPERS.md: Layers).
 */
export async function siteSupportsPartialPages(): Promise<boolean> {
  try {
    const code = await readFile(new URL('../site/catalogue.ts', import.meta.url), 'utf8');
    return /^export function partPageIds\(/m.test(code);
  } catch {
    return false;
  }
}

/** Parts to render again and parts to drop, for a partial build. */
export interface PartialPlan {
  changed: string[];
  removed: string[];
}

/**
 * Decide whether a partial build is possible.
 * @param current the build's site fingerprint, base, and per-part cache keys (undefined key: unknown)
 * @returns the plan, or undefined for a full build
 */
export function planPartialSite(
  previous: OutputManifest | undefined,
  current: { siteHash: string; base: string; parts: Record<string, string | undefined> },
): PartialPlan | undefined {
  if (!previous || previous.kind !== 'site' || previous.siteHash !== current.siteHash || previous.base !== current.base)
    return undefined;
  const ids = Object.keys(current.parts);
  if (ids.length === 0) return undefined;
  const changed = ids.filter((id) => {
    const key = current.parts[id];
    return key === undefined || key === '' || previous.parts[id] !== key;
  });
  const removed = Object.keys(previous.parts).filter((id) => !Object.hasOwn(current.parts, id));
  if (changed.length + removed.length > MAX_PARTIAL_SHARE * ids.length) return undefined;
  return { changed: changed.sort(), removed: removed.sort() };
}

/** Paths of one part's files in the built site, relative: its page folder, downloads, compare data. */
export function sitePathsOf(id: string): string[] {
  return [`parts/${id}/`, `downloads/${id}/`, `data/compare/${id}.json`];
}

/** True when a site-relative path belongs to one of the parts (see {@link sitePathsOf}). */
export function belongsTo(rel: string, ids: ReadonlySet<string>): boolean {
  const [top, second, third] = rel.split('/');
  if ((top === 'parts' || top === 'downloads') && second !== undefined && rel.length > top.length + second.length + 1)
    return ids.has(second);
  if (top === 'data' && second === 'compare' && third?.endsWith('.json')) return ids.has(third.slice(0, -5));
  return false;
}

/** Lanes of concurrent file operations in {@link linkTree}. */
const LINK_CONCURRENCY = 16;

/**
 * Hard-link every file under `from` into the same place under `to`, except those `skip` names.
 * @returns files linked
 */
export async function linkTree(from: string, to: string, skip: (rel: string) => boolean): Promise<number> {
  const files: string[] = [];
  const walk = async (dir: string, rel: string): Promise<void> => {
    for (const e of await readdir(dir, { withFileTypes: true })) {
      const r = rel ? `${rel}/${e.name}` : e.name;
      if (e.isDirectory()) await walk(join(dir, e.name), r);
      else if (!skip(r)) files.push(r);
    }
  };
  await walk(from, '');
  const made = new Map<string, Promise<unknown>>();
  let next = 0;
  await runLanes(LINK_CONCURRENCY, async (stopped) => {
    while (next < files.length && !stopped()) {
      const rel = files[next++];
      const dest = join(to, ...rel.split('/'));
      const dir = dirname(dest);
      let ready = made.get(dir);
      if (!ready) {
        ready = mkdir(dir, { recursive: true });
        made.set(dir, ready);
      }
      await ready;
      await link(join(from, ...rel.split('/')), dest);
    }
  });
  return files.length;
}

/** Move every file under `from` to the same place under `to`, replacing what is there. */
export async function overlayTree(from: string, to: string): Promise<void> {
  for (const e of await readdir(from, { withFileTypes: true })) {
    const src = join(from, e.name);
    const dest = join(to, e.name);
    if (e.isDirectory()) {
      const st = await stat(dest).catch(() => undefined);
      if (!st) {
        await rename(src, dest);
        continue;
      }
      if (!st.isDirectory()) await rm(dest, { force: true });
      await mkdir(dest, { recursive: true });
      await overlayTree(src, dest);
    } else {
      await rename(src, dest);
    }
  }
}

/**
 * Put the data folder's published files into a site folder as astro.config.mjs does (hard links),
 * for pages rendered without the site generator (page-renderer.ts).
 */
export async function placeCatalogueData(dataDir: string, siteDir: string): Promise<void> {
  for (const [to, from] of SITE_DATA_COPIES) {
    const src = join(dataDir, from);
    const st = await stat(src).catch(() => undefined);
    if (!st) continue;
    const dest = join(siteDir, ...to.split('/'));
    if (st.isDirectory()) await linkTree(src, dest, () => false);
    else {
      await mkdir(dirname(dest), { recursive: true });
      await link(src, dest);
    }
  }
}
