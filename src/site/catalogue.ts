/**
 * Build-time access to the generated catalogue data (written by src/pipeline/emit.ts):
 * `<data>/index.json` and `<data>/parts/<id>.json`, with `<data>` from env MOTIONAL_DATA
 * (default `.motional/catalogue`). Site code only: it uses node:fs while Astro renders pages.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { IndexEntry, PartData } from './types.ts';

/** Folder of the generated data, absolute. */
export function dataDir(): string {
  return resolve(process.env.MOTIONAL_DATA || '.motional/catalogue');
}

let indexCache: { dir: string; entries: IndexEntry[] } | undefined;

/** The search index (every part, sorted by id). Empty when no data has been generated. */
export function readIndex(): IndexEntry[] {
  const dir = dataDir();
  if (indexCache?.dir === dir) return indexCache.entries;
  const file = join(dir, 'index.json');
  const entries: IndexEntry[] = existsSync(file) ? JSON.parse(readFileSync(file, 'utf8')) : [];
  indexCache = { dir, entries };
  return entries;
}

/** One part's page data. */
export function readPart(id: string): PartData {
  return JSON.parse(readFileSync(join(dataDir(), 'parts', `${id}.json`), 'utf8')) as PartData;
}

/**
 * The site base path ending in '/', from env MOTIONAL_BASE as astro.config.mjs reads it.
 * (Not import.meta.env.BASE_URL: a BASE_URL variable in the environment — vitest sets one —
 * would override it while the pages render.)
 */
export function siteBase(): string {
  const b = process.env.MOTIONAL_BASE || '/';
  const withLead = b.startsWith('/') ? b : `/${b}`;
  return withLead.endsWith('/') ? withLead : `${withLead}/`;
}

/**
 * Ids of the part pages to render. The build sets MOTIONAL_PAGES to a JSON file listing only the
 * parts whose data changed (an incremental rebuild keeps the other pages from the previous site);
 * otherwise every part. Rule that makes this safe: a part page depends only on its own data, the
 * base path and the site code.
 */
export function partPageIds(): string[] {
  const file = process.env.MOTIONAL_PAGES;
  if (file) return JSON.parse(readFileSync(file, 'utf8')) as string[];
  return readIndex().map((e) => e.id);
}
