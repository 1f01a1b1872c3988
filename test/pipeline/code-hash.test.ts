/**
 * Cache entries are keyed by the code that made them (src/pipeline/code-hash.ts): a change to
 * any module the build task reaches changes the key; a module it does not reach does not.
 * Real sources are never edited: the checks run on a temporary copy of the project's code.
 */
import { cp, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  CACHED_RESULT_ENTRY,
  extractionCodeHash,
  importedPaths,
  moduleClosureHash,
} from '../../src/pipeline/code-hash.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
let copy: string;

beforeAll(async () => {
  copy = await mkdtemp(join(tmpdir(), 'motional-code-hash-'));
  await cp(join(ROOT, 'src'), join(copy, 'src'), { recursive: true });
  await cp(join(ROOT, 'package-lock.json'), join(copy, 'package-lock.json'));
});
afterAll(async () => {
  await rm(copy, { recursive: true, force: true });
});

/** Append a comment to a file of the copy; returns a function that restores it. */
async function touch(rel: string): Promise<() => Promise<void>> {
  const path = join(copy, rel);
  const before = await readFile(path);
  await writeFile(path, `${before.toString('utf8')}\n// changed\n`);
  return () => writeFile(path, before);
}

describe('code hash of cached results', () => {
  it('finds static, re-exported, side-effect and dynamic imports, and no bare packages', () => {
    const text = [
      "import { a } from './a.ts';",
      "import type { B } from '../b/b.ts';",
      "export { c } from './c.ts';",
      "import './d.ts';",
      "const e = await import('./e.ts');",
      "import { z } from 'zod';",
      "import { readFile } from 'node:fs/promises';",
    ].join('\n');
    expect(importedPaths(text)).toEqual(['./a.ts', '../b/b.ts', './c.ts', './d.ts', './e.ts']);
  });

  it('is the same for an unchanged copy of the code', async () => {
    expect(await extractionCodeHash(copy)).toBe(await extractionCodeHash(copy));
  });

  for (const rel of ['src/lib/extract/fit-bvd.ts', 'src/lib/units/si.ts', CACHED_RESULT_ENTRY, 'package-lock.json']) {
    it(`changes when ${rel} changes`, async () => {
      const before = await extractionCodeHash(copy);
      const restore = await touch(rel);
      try {
        expect(await extractionCodeHash(copy)).not.toBe(before);
      } finally {
        await restore();
      }
      expect(await extractionCodeHash(copy)).toBe(before);
    });
  }

  it('reaches the extraction engine through the build task', async () => {
    // levenberg-marquardt.ts is reached only through the build task's dynamic import of the extraction
    const before = await moduleClosureHash(copy, [CACHED_RESULT_ENTRY]);
    const restore = await touch('src/lib/extract/levenberg-marquardt.ts');
    try {
      expect(await moduleClosureHash(copy, [CACHED_RESULT_ENTRY])).not.toBe(before);
    } finally {
      await restore();
    }
  });

  it('does not change for a module the build task does not reach', async () => {
    const before = await extractionCodeHash(copy);
    const restore = await touch('src/pages/index.astro');
    try {
      expect(await extractionCodeHash(copy)).toBe(before);
    } finally {
      await restore();
    }
  });
});
