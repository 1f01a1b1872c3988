import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  checkPartFileName,
  findCaseCollisions,
  resolveInPartFolder,
  sweepFormatOf,
} from '../../src/pipeline/safe-path.ts';

// Rules: README: The part record ("a record may name only files inside its own folder") and
// README: Limits and robustness (no absolute paths, no `..`, no links that resolve outside);
// the Unicode list is common practice
// (Unicode TR #36 "Unicode Security Considerations" on bidi and invisible characters).

describe('checkPartFileName', () => {
  it.each([
    ['a1.s2p', 'a1.s2p'],
    ['./a1.s2p', 'a1.s2p'],
    ['raw//a1.s2p', 'raw/a1.s2p'],
    ['raw/./a1.s2p', 'raw/a1.s2p'],
    ['.hidden.s1p', '.hidden.s1p'],
    ['mesure-été.csv', 'mesure-été.csv'],
  ])('accepts "%s" as "%s"', (name, normalised) => {
    expect(checkPartFileName(name)).toEqual({ ok: true, name: normalised });
  });

  it.each([
    ['', 'path-empty', 'expected a file name, got an empty text'],
    ['/etc/a.s1p', 'path-escape', 'absolute path "/etc/a.s1p" not allowed; name a file inside the part folder'],
    [
      '../other/a.s1p',
      'path-escape',
      `'..' in "../other/a.s1p" not allowed; a record may only name files inside its own folder`,
    ],
    [
      'raw/../a.s1p',
      'path-escape',
      `'..' in "raw/../a.s1p" not allowed; a record may only name files inside its own folder`,
    ],
    ['C:a.s1p', 'path-escape', 'drive letter in "C:a.s1p" not allowed; name a file inside the part folder'],
    ['c:/data/a.s1p', 'path-escape', 'drive letter in "c:/data/a.s1p" not allowed; name a file inside the part folder'],
    ['raw\\a.s1p', 'path-unsafe', `file name "raw\\\\a.s1p" contains a backslash; use '/' between folders`],
    ['a.s1p:stream', 'path-unsafe', `file name "a.s1p:stream" contains ':'`],
    ['a\u0000.s1p', 'path-unsafe', 'file name "a<U+0000>.s1p" contains control character U+0000'],
    ['a\n.s1p', 'path-unsafe', 'file name "a<U+000A>.s1p" contains control character U+000A'],
    ['a\u0085.s1p', 'path-unsafe', 'file name "a<U+0085>.s1p" contains control character U+0085'],
    [
      'a\u202egnp.s1p',
      'path-unsafe',
      'file name "a<U+202E>gnp.s1p" contains invisible or direction-changing character U+202E',
    ],
    [
      'a\u2066b.s1p',
      'path-unsafe',
      'file name "a<U+2066>b.s1p" contains invisible or direction-changing character U+2066',
    ],
    [
      'a\u200bb.s1p',
      'path-unsafe',
      'file name "a<U+200B>b.s1p" contains invisible or direction-changing character U+200B',
    ],
    [' a.s1p', 'path-unsafe', 'file name " a.s1p" has leading or trailing spaces'],
    ['raw/', 'path-unsafe', '"raw/" names a folder, expected a file'],
  ])('refuses %j', (name, code, message) => {
    expect(checkPartFileName(name)).toEqual({ ok: false, code, message });
  });
});

describe('sweepFormatOf', () => {
  it('chooses the reader by the name ending, ignoring case', () => {
    expect(['a.s1p', 'a.S2P', 'a.ts'].map(sweepFormatOf)).toEqual(['touchstone', 'touchstone', 'touchstone']);
    expect(['a.csv', 'a.TSV', 'a.txt'].map(sweepFormatOf)).toEqual(['csv', 'csv', 'csv']);
    expect(['a.s3p', 'a.yaml', 'a', 's1p'].map(sweepFormatOf)).toEqual([undefined, undefined, undefined, undefined]);
  });
});

describe('findCaseCollisions', () => {
  it('pairs names that differ only by letter case, and ignores exact repeats', () => {
    expect(findCaseCollisions(['a1.s1p', 'b.s1p', 'a1.s1p', 'A1.s1p', './B.S1P'])).toEqual([
      ['a1.s1p', 'A1.s1p'],
      ['b.s1p', './B.S1P'],
    ]);
    expect(findCaseCollisions(['a.s1p', './a.s1p'])).toEqual([]);
  });
});

describe('resolveInPartFolder (real file system)', () => {
  let root: string;
  let part: string;
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), 'motional-safe-path-'));
    part = join(root, 'part');
    mkdirSync(join(part, 'raw'), { recursive: true });
    mkdirSync(join(root, 'outside'));
    writeFileSync(join(part, 'a1.s1p'), '# Hz S RI R 50\n');
    writeFileSync(join(part, 'raw', 'b.s1p'), '# Hz S RI R 50\n');
    writeFileSync(join(root, 'outside', 'secret.s1p'), 'not yours\n');
    mkdirSync(join(part, 'folder.s1p'));
    symlinkSync('a1.s1p', join(part, 'inner-link.s1p'));
    symlinkSync('../outside/secret.s1p', join(part, 'escape.s1p'));
    symlinkSync('../outside', join(part, 'linked-dir'));
    symlinkSync('missing.s1p', join(part, 'dangling.s1p'));
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it('resolves a plain name, a subfolder name and a link that stays inside', async () => {
    expect(await resolveInPartFolder(part, 'a1.s1p')).toEqual({ ok: true, path: join(part, 'a1.s1p'), sizeBytes: 15 });
    expect(await resolveInPartFolder(part, './raw/b.s1p')).toMatchObject({
      ok: true,
      path: join(part, 'raw', 'b.s1p'),
    });
    expect(await resolveInPartFolder(part, 'inner-link.s1p')).toMatchObject({
      ok: true,
      path: join(part, 'inner-link.s1p'),
    });
  });

  it('refuses a link to a file outside the folder', async () => {
    expect(await resolveInPartFolder(part, 'escape.s1p')).toEqual({
      ok: false,
      code: 'path-escape',
      message: '"escape.s1p" is a link that leads outside the part folder',
    });
  });

  it('refuses a file reached through a linked folder that leads outside', async () => {
    expect(await resolveInPartFolder(part, 'linked-dir/secret.s1p')).toMatchObject({ ok: false, code: 'path-escape' });
  });

  it('reports a missing file and suggests a name that differs only by case', async () => {
    expect(await resolveInPartFolder(part, 'nope.s1p')).toEqual({
      ok: false,
      code: 'missing',
      message: 'file "nope.s1p" not found in the part folder',
    });
    expect(await resolveInPartFolder(part, 'dangling.s1p')).toMatchObject({ ok: false, code: 'missing' });
    const upper = await resolveInPartFolder(part, 'A1.S1P');
    // Linux is case-sensitive (missing + hint); a case-insensitive system finds it and flags the case.
    expect(upper.ok).toBe(false);
    expect(!upper.ok && upper.message).toMatch(/"a1\.s1p"/);
  });

  it('refuses a folder where a file is expected', async () => {
    expect(await resolveInPartFolder(part, 'folder.s1p')).toEqual({
      ok: false,
      code: 'not-file',
      message: '"folder.s1p" is a folder, expected a file',
    });
  });

  it('refuses a FIFO, which would block a reader forever', async () => {
    try {
      execFileSync('mkfifo', [join(part, 'pipe.s1p')]);
    } catch {
      console.warn('mkfifo not available: FIFO case not checked');
      return;
    }
    expect(await resolveInPartFolder(part, 'pipe.s1p')).toMatchObject({
      ok: false,
      code: 'not-file',
      message: '"pipe.s1p" is not a regular file, expected a file',
    });
  });

  it('refuses unsafe names before touching the disk', async () => {
    expect(await resolveInPartFolder(part, '../outside/secret.s1p')).toMatchObject({ ok: false, code: 'path-escape' });
    expect(await resolveInPartFolder(part, join(root, 'outside', 'secret.s1p'))).toMatchObject({
      ok: false,
      code: 'path-escape',
    });
  });
});
