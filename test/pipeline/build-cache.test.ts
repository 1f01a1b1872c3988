import { mkdir, mkdtemp, readdir, rm, symlink, utimes, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  RACY_MS,
  cacheKey,
  hashPartFolder,
  loadFingerprintMemo,
  openCache,
  pruneCache,
  sha256,
} from '../../src/pipeline/cache.ts';

let tmp: string;
beforeEach(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-cache-'));
});
afterEach(async () => {
  await rm(tmp, { recursive: true, force: true });
});

async function makePart(dir: string): Promise<void> {
  await mkdir(join(dir, 'raw'), { recursive: true });
  await writeFile(join(dir, 'part.yaml'), 'id: X\n');
  await writeFile(join(dir, 'a.s1p'), '# Hz S RI R 50\n1 0 0\n');
  await writeFile(join(dir, 'raw', 'open.s1p'), '# Hz S RI R 50\n1 1 0\n');
}

describe('build cache', () => {
  it('gives sha256 of the empty text as the standard digest', () => {
    // FIPS 180-4 test vector: sha256("") (NIST)
    expect(sha256('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('changes the folder hash when any file of the record changes, and only then', async () => {
    const part = join(tmp, 'p');
    await makePart(part);
    const a = await hashPartFolder(part);
    expect(a.files).toBe(3);
    expect((await hashPartFolder(part)).hash).toBe(a.hash);
    await writeFile(join(part, 'raw', 'open.s1p'), '# Hz S RI R 50\n1 0.9 0\n');
    const b = await hashPartFolder(part);
    expect(b.hash).not.toBe(a.hash);
    await writeFile(join(part, 'a2.s1p'), 'x');
    expect((await hashPartFolder(part)).hash).not.toBe(b.hash);
  });

  it('includes files in sub-folders, where a record may keep its sweeps', async () => {
    const part = join(tmp, 'p');
    await makePart(part);
    const before = await hashPartFolder(part);
    await writeFile(join(part, 'raw', 'short.s1p'), 'x');
    expect((await hashPartFolder(part)).hash).not.toBe(before.hash);
  });

  it('hashes where a link points, not only its content', async () => {
    const part = join(tmp, 'p');
    await makePart(part);
    await writeFile(join(part, 'b.s1p'), 'same');
    await writeFile(join(part, 'c.s1p'), 'same');
    await symlink('b.s1p', join(part, 'l.s1p'));
    const a = await hashPartFolder(part);
    await rm(join(part, 'l.s1p'));
    await symlink('c.s1p', join(part, 'l.s1p'));
    expect((await hashPartFolder(part)).hash).not.toBe(a.hash);
  });

  it('remembers the fingerprint of an unchanged folder and notices any change to it', async () => {
    const part = join(tmp, 'p');
    await makePart(part);
    // files older than the racy window, so the remembered hash may be used
    const old = new Date(Date.now() - 10 * RACY_MS);
    for (const f of ['part.yaml', 'a.s1p', 'raw/open.s1p']) await utimes(join(part, f), old, old);
    const memoFile = join(tmp, 'memo.json');
    const memo = await loadFingerprintMemo(memoFile);
    const first = await hashPartFolder(part, memo);
    await memo.save();
    const again = await loadFingerprintMemo(memoFile);
    expect(again.get(part)?.hash).toBe(first.hash);
    expect((await hashPartFolder(part, again)).hash).toBe(first.hash);
    // a same-size edit with the old time kept still changes ctime and is read again
    await writeFile(join(part, 'a.s1p'), '# Hz S RI R 50\n1 0 1\n');
    await utimes(join(part, 'a.s1p'), old, old);
    const changed = await hashPartFolder(part, again);
    expect(changed.hash).not.toBe(first.hash);
    expect(changed.hash).toBe((await hashPartFolder(part)).hash);
  });

  it('keys on every input', () => {
    const base = { folderHash: 'f', codeHash: '1', oscillatorsHash: 'o', options: 'base=/' };
    const k = cacheKey(base);
    expect(k).toMatch(/^[0-9a-f]{64}$/);
    for (const change of [{ folderHash: 'g' }, { codeHash: '2' }, { oscillatorsHash: 'p' }, { options: 'base=/x/' }]) {
      expect(cacheKey({ ...base, ...change })).not.toBe(k);
    }
  });

  it('moves a folder of files into an entry', async () => {
    const cache = openCache(join(tmp, 'cache'));
    const key = cacheKey({ folderHash: 'g', codeHash: '1', oscillatorsHash: '', options: '' });
    const files = join(tmp, 'files');
    await mkdir(join(files, 'parts'), { recursive: true });
    await writeFile(join(files, 'parts', 'X.json'), '{}');
    await cache.put(key, 'header', files);
    expect(await readdir(join(cache.filesOf(key), 'parts'))).toEqual(['X.json']);
    expect(await readdir(tmp)).not.toContain('files');
    expect(await cache.get(key)).toBe('header');
    const old = new Date(Date.now() - 40 * 86_400_000);
    await utimes(join(tmp, 'cache', key.slice(0, 2), `${key}.json`), old, old);
    expect(await pruneCache(join(tmp, 'cache'))).toBe(1);
    expect(await readdir(join(tmp, 'cache', key.slice(0, 2)))).toEqual([]);
  });

  it('stores and returns entries, and prunes old ones', async () => {
    const cache = openCache(join(tmp, 'cache'));
    const key = cacheKey({ folderHash: 'f', codeHash: '1', oscillatorsHash: '', options: '' });
    expect(await cache.get(key)).toBeUndefined();
    await cache.put(key, '{"a":1}');
    expect(await cache.get(key)).toBe('{"a":1}');
    const bucket = join(tmp, 'cache', key.slice(0, 2));
    expect(await readdir(bucket)).toEqual([`${key}.json`]);
    const old = new Date(Date.now() - 40 * 86_400_000);
    await utimes(join(bucket, `${key}.json`), old, old);
    expect(await pruneCache(join(tmp, 'cache'))).toBe(1);
    expect(await cache.get(key)).toBeUndefined();
  });
});
