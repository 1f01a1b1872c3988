import { mkdir, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  OUTPUT_MARKER,
  cleanStale,
  createStaging,
  discardStaging,
  refuseReplace,
  swapInto,
} from '../../src/pipeline/atomic-dir.ts';

let tmp: string;
beforeEach(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-atomic-'));
});
afterEach(async () => {
  await rm(tmp, { recursive: true, force: true });
});

describe('atomic output folder', () => {
  it('replaces the output folder with the staged one and leaves no leftovers', async () => {
    const out = join(tmp, 'dist');
    await mkdir(out);
    await writeFile(join(out, 'old.txt'), 'old');
    const staging = await createStaging(out);
    await mkdir(join(staging.root, 'site'));
    await writeFile(join(staging.root, 'site', 'new.txt'), 'new');
    await swapInto(staging, join(staging.root, 'site'));
    expect((await readdir(out)).sort()).toEqual([OUTPUT_MARKER, 'new.txt']);
    expect(await readdir(tmp)).toEqual(['dist']);
  });

  it('can leave removing the previous output to a detached process', async () => {
    const out = join(tmp, 'dist');
    await mkdir(out);
    await writeFile(join(out, 'old.txt'), 'old');
    const staging = await createStaging(out);
    await mkdir(join(staging.root, 'site'));
    await writeFile(join(staging.root, 'site', 'new.txt'), 'new');
    await swapInto(staging, join(staging.root, 'site'), { background: true, marker: 'm' });
    expect((await readdir(out)).sort()).toEqual([OUTPUT_MARKER, 'new.txt']);
    expect(await readFile(join(out, OUTPUT_MARKER), 'utf8')).toBe('m');
    for (let i = 0; i < 100 && (await readdir(tmp)).length > 1; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await readdir(tmp)).toEqual(['dist']);
  });

  it('creates the output folder when there was none', async () => {
    const out = join(tmp, 'a', 'b', 'dist');
    const staging = await createStaging(out);
    await mkdir(join(staging.root, 'site'));
    await swapInto(staging, join(staging.root, 'site'));
    expect(await readdir(join(tmp, 'a', 'b'))).toEqual(['dist']);
  });

  it('keeps the previous output when the staged folder is missing', async () => {
    const out = join(tmp, 'dist');
    await mkdir(out);
    await writeFile(join(out, 'marker'), 'keep');
    const staging = await createStaging(out);
    await expect(swapInto(staging, join(staging.root, 'site'))).rejects.toThrow();
    expect(await readFile(join(out, 'marker'), 'utf8')).toBe('keep');
    await discardStaging(staging);
  });

  it('refuses to replace a folder holding the content, or a non-empty folder it did not write', async () => {
    const content = join(tmp, 'site', 'content');
    await mkdir(content, { recursive: true });
    expect(await refuseReplace(join(tmp, 'site'), [content])).toMatch(
      /contains .*content; choose a folder of its own$/,
    );
    expect(await refuseReplace(content, [content])).toMatch(/contains/);
    const other = join(tmp, 'notes');
    await mkdir(other);
    expect(await refuseReplace(other, [])).toBeUndefined(); // empty
    await writeFile(join(other, 'todo.txt'), 'mine');
    expect(await refuseReplace(other, [])).toMatch(/is not empty and was not written by a build/);
    await writeFile(join(other, 'index.html'), '');
    expect(await refuseReplace(other, [])).toMatch(/is not empty/);
    await mkdir(join(other, '_astro')); // a site Astro built by itself
    expect(await refuseReplace(other, [])).toBeUndefined();
    await rm(join(other, '_astro'), { recursive: true });
    await writeFile(join(other, OUTPUT_MARKER), '');
    expect(await refuseReplace(other, [])).toBeUndefined();
    expect(await refuseReplace(join(tmp, 'missing'), [content])).toBeUndefined();
  });

  it('removes leftovers of dead builds but not those of a live process', async () => {
    const out = join(tmp, 'dist');
    // pid 2^22 + 1 is above Linux's pid_max limit, so no such process exists (common practice)
    const dead = 4194305;
    await mkdir(join(tmp, `.dist.staging-${dead}`));
    await mkdir(join(tmp, `.dist.old-${dead}`));
    await mkdir(join(tmp, `.dist.staging-1`)); // pid 1 (init) is alive
    await mkdir(join(tmp, '.other.staging-4194305'));
    const removed = await cleanStale(out);
    expect(removed.map((p) => p.slice(tmp.length + 1)).sort()).toEqual([`.dist.old-${dead}`, `.dist.staging-${dead}`]);
    expect((await readdir(tmp)).sort()).toEqual(['.dist.staging-1', '.other.staging-4194305']);
  });
});
