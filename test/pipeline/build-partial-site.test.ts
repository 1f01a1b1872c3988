import { mkdir, mkdtemp, readFile, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { OUTPUT_MARKER } from '../../src/pipeline/atomic-dir.ts';
import {
  MAX_PARTIAL_SHARE,
  belongsTo,
  formatManifest,
  linkTree,
  overlayTree,
  planPartialSite,
  readManifest,
  siteCodeHash,
} from '../../src/pipeline/partial-site.ts';

let tmp: string;
beforeEach(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-partial-'));
});
afterEach(async () => {
  await rm(tmp, { recursive: true, force: true });
});

const ids = (n: number) => Array.from({ length: n }, (_, i) => `P${i}`);
const keys = (n: number, tag = 'k') => Object.fromEntries(ids(n).map((id) => [id, `${tag}-${id}`]));

describe('partial site builds', () => {
  const previous = {
    tool: 'motional build' as const,
    version: 1 as const,
    kind: 'site' as const,
    siteHash: 'h',
    base: '/',
    parts: keys(10),
  };

  it('renders only parts whose data changed, and drops parts that are gone', () => {
    const parts: Record<string, string | undefined> = { ...keys(10), P3: 'new', P10: 'k-P10' };
    delete parts.P7;
    expect(planPartialSite(previous, { siteHash: 'h', base: '/', parts })).toEqual({
      changed: ['P10', 'P3'],
      removed: ['P7'],
    });
  });

  it('renders everything when the site code, the base or too many parts changed, or nothing was built before', () => {
    expect(planPartialSite(previous, { siteHash: 'other', base: '/', parts: keys(10) })).toBeUndefined();
    expect(planPartialSite(previous, { siteHash: 'h', base: '/x/', parts: keys(10) })).toBeUndefined();
    expect(planPartialSite(undefined, { siteHash: 'h', base: '/', parts: keys(10) })).toBeUndefined();
    expect(
      planPartialSite({ ...previous, kind: 'data' }, { siteHash: 'h', base: '/', parts: keys(10) }),
    ).toBeUndefined();
    const many = { ...keys(10) };
    for (const id of ids(Math.floor(10 * MAX_PARTIAL_SHARE) + 1)) many[id] = 'changed';
    expect(planPartialSite(previous, { siteHash: 'h', base: '/', parts: many })).toBeUndefined();
    // a part without a cache key (cache off) counts as changed
    expect(planPartialSite(previous, { siteHash: 'h', base: '/', parts: { ...keys(10), P1: undefined } })).toEqual({
      changed: ['P1'],
      removed: [],
    });
  });

  it('keeps the manifest in the output marker', async () => {
    await writeFile(
      join(tmp, OUTPUT_MARKER),
      formatManifest({ kind: 'site', siteHash: 'h', base: '/', parts: { A: 'k' } }),
    );
    expect(await readManifest(tmp)).toEqual({
      tool: 'motional build',
      version: 1,
      kind: 'site',
      siteHash: 'h',
      base: '/',
      parts: { A: 'k' },
    });
    await writeFile(join(tmp, OUTPUT_MARKER), 'written by motional build\n');
    expect(await readManifest(tmp)).toBeUndefined();
  });

  it('tells which site files belong to a part', () => {
    const set = new Set(['A-1']);
    expect(belongsTo('parts/A-1/index.html', set)).toBe(true);
    expect(belongsTo('downloads/A-1/raw/a.s1p', set)).toBe(true);
    expect(belongsTo('data/compare/A-1.json', set)).toBe(true);
    expect(belongsTo('parts/A-10/index.html', set)).toBe(false);
    expect(belongsTo('data/index.json', set)).toBe(false);
    expect(belongsTo('index.html', set)).toBe(false);
    expect(belongsTo('parts/A-1', set)).toBe(false); // a file named like the folder is not inside it
  });

  it('merges the previous site with the freshly rendered pages', async () => {
    const prev = join(tmp, 'prev');
    for (const [rel, text] of [
      ['index.html', 'old home'],
      ['parts/A/index.html', 'A'],
      ['parts/B/index.html', 'old B'],
      ['downloads/B/b-old.cir', 'old'],
      ['parts/C/index.html', 'C'],
      [OUTPUT_MARKER, '{}'],
    ]) {
      await mkdir(join(prev, rel, '..'), { recursive: true });
      await writeFile(join(prev, rel), text);
    }
    const fresh = join(tmp, 'fresh');
    for (const [rel, text] of [
      ['index.html', 'new home'],
      ['parts/B/index.html', 'new B'],
      ['downloads/B/b.cir', 'new'],
    ]) {
      await mkdir(join(fresh, rel, '..'), { recursive: true });
      await writeFile(join(fresh, rel), text);
    }
    const merged = join(tmp, 'merged');
    const replaced = new Set(['B', 'C']); // B changed, C removed
    expect(await linkTree(prev, merged, (rel) => rel === OUTPUT_MARKER || belongsTo(rel, replaced))).toBe(2);
    await overlayTree(fresh, merged);
    expect((await readdir(merged)).sort()).toEqual(['downloads', 'index.html', 'parts']);
    expect((await readdir(join(merged, 'parts'))).sort()).toEqual(['A', 'B']);
    expect(await readdir(join(merged, 'downloads', 'B'))).toEqual(['b.cir']);
    expect(await readFile(join(merged, 'index.html'), 'utf8')).toBe('new home');
    expect(await readFile(join(merged, 'parts', 'B', 'index.html'), 'utf8')).toBe('new B');
    // the unchanged page is the previous file itself (a hard link), and the previous site is intact
    expect((await stat(join(merged, 'parts', 'A', 'index.html'))).ino).toBe(
      (await stat(join(prev, 'parts', 'A', 'index.html'))).ino,
    );
    expect(await readFile(join(prev, 'parts', 'B', 'index.html'), 'utf8')).toBe('old B');
  });

  it('fingerprints the site code', async () => {
    await mkdir(join(tmp, 'src', 'pages'), { recursive: true });
    await writeFile(join(tmp, 'src', 'pages', 'index.astro'), 'a');
    const a = await siteCodeHash(tmp);
    expect(await siteCodeHash(tmp)).toBe(a);
    await writeFile(join(tmp, 'src', 'pages', 'index.astro'), 'b');
    expect(await siteCodeHash(tmp)).not.toBe(a);
  });
});
