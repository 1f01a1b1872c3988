/**
 * File names in records, through `motional check` (README: The part record — a record may name
 * only files inside its own folder; README: Commands — every problem printed as
 * `FILE:LINE: message`): links that leave the folder, link loops, devices and FIFOs, `..` and
 * absolute paths in every spelling, control, invisible and direction-changing characters,
 * Unicode normalisation and letter case.
 * Each must be a located error at the record's field (or, for folders of parts, a located
 * problem), never a crash, a hang or a silent skip. Folders are built in a temp directory.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../scripts/motional.ts';
import { ROOT } from './fuzz-support.ts';

const SWEEP = readFileSync(join(ROOT, 'test/fixtures/good-records/xo-good-a/a2.s1p'), 'utf8');

let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'motional-paths-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

let n = 0;
/** A part folder whose record names `names` (one sweep each); `files` are written as sweeps. */
function part(names: string[], files: string[] = names): string {
  const dir = join(root, `p${++n}`);
  mkdirSync(dir, { recursive: true });
  const sweeps = names.map((f) => `      - file: ${JSON.stringify(f)}\n        fixture: reflection\n`).join('');
  writeFileSync(
    join(dir, 'part.yaml'),
    `id: P-${n}\ntitle: path test\nkind: quartz-at\nsamples:\n  - id: A1\n    sweeps:\n${sweeps}`,
  );
  for (const f of files) {
    mkdirSync(join(dir, f, '..'), { recursive: true });
    writeFileSync(join(dir, f), SWEEP);
  }
  return dir;
}

async function check(...paths: string[]): Promise<{ code: number; err: string; out: string }> {
  let out = '';
  let err = '';
  const code = await main(['check', ...paths], { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

/** Line of part.yaml holding the k-th `file:` entry (1-based line). */
function fileLine(dir: string, k = 0): number {
  const lines = readFileSync(join(dir, 'part.yaml'), 'utf8').split('\n');
  return lines.map((l, i) => [l, i + 1] as const).filter(([l]) => l.includes('- file:'))[k][1];
}

/** Expect exit 1 and a located error at the k-th sweep's file field matching `message`. */
async function expectFieldError(dir: string, message: RegExp, k = 0): Promise<void> {
  const r = await check(dir);
  expect(r.code, r.err).toBe(1);
  const prefix = `${join(dir, 'part.yaml')}:${fileLine(dir, k)}: samples[0].sweeps[${k}].file: `;
  const hit = r.err.split('\n').find((l) => l.startsWith(prefix));
  expect(hit, `stderr:\n${r.err}\nexpected a line starting ${prefix}`).toBeDefined();
  expect(hit).toMatch(message);
  expect(r.err).not.toMatch(/\n\s+at |TypeError|RangeError|internal error/);
}

describe('links', () => {
  it('accepts a link that stays inside the part folder', async () => {
    const dir = part(['a1.s1p']);
    symlinkSync('a1.s1p', join(dir, 'alias.s1p'));
    writeFileSync(
      join(dir, 'part.yaml'),
      readFileSync(join(dir, 'part.yaml'), 'utf8').replace('"a1.s1p"', '"alias.s1p"'),
    );
    expect(await check(dir)).toMatchObject({ code: 0, err: '' });
  });

  it('refuses a file reached through a linked folder that leaves the part folder', async () => {
    const outside = join(root, 'outside');
    mkdirSync(outside, { recursive: true });
    writeFileSync(join(outside, 'a1.s1p'), SWEEP);
    const dir = part(['data/a1.s1p'], []);
    symlinkSync(outside, join(dir, 'data'));
    await expectFieldError(dir, /"data\/a1\.s1p" is a link that leads outside the part folder/);
  });

  it('refuses an absolute link to a file elsewhere', async () => {
    const dir = part(['a1.s1p'], []);
    symlinkSync(join(ROOT, 'test/fixtures/good-records/xo-good-a/a2.s1p'), join(dir, 'a1.s1p'));
    await expectFieldError(dir, /is a link that leads outside the part folder/);
  });

  it('reports a link loop and a dangling link as missing files, without hanging', async () => {
    const dir = part(['loop.s1p', 'dangling.s1p'], []);
    symlinkSync('loop2.s1p', join(dir, 'loop.s1p'));
    symlinkSync('loop.s1p', join(dir, 'loop2.s1p'));
    symlinkSync('nowhere.s1p', join(dir, 'dangling.s1p'));
    await expectFieldError(dir, /file "loop\.s1p" not found in the part folder/, 0);
    await expectFieldError(dir, /file "dangling\.s1p" not found in the part folder/, 1);
  });

  it('never reads a device or a FIFO (reading one would block or never end)', async () => {
    const dir = part(['zero.s1p', 'fifo.s1p'], []);
    symlinkSync('/dev/zero', join(dir, 'zero.s1p'));
    execFileSync('mkfifo', [join(dir, 'fifo.s1p')]);
    await expectFieldError(dir, /"zero\.s1p" is not a regular file, expected a file/, 0);
    await expectFieldError(dir, /"fifo\.s1p" is not a regular file, expected a file/, 1);
  });
});

describe('names that leave the folder', () => {
  it.each([
    ['../x.s1p', /'\.\.' in "\.\.\/x\.s1p" not allowed/],
    ['sub/../../x.s1p', /'\.\.' in .* not allowed/],
    ['./../x.s1p', /'\.\.' in .* not allowed/],
    ['sub/../a1.s1p', /'\.\.' in .* not allowed/],
    ['..\\x.s1p', /contains a backslash/],
    ['/etc/passwd.s1p', /absolute path "\/etc\/passwd\.s1p" not allowed/],
    ['//server/share/x.s1p', /absolute path/],
    ['C:\\x.s1p', /backslash|drive letter in/],
    ['C:x.s1p', /drive letter in/],
    ['\\\\server\\share\\x.s1p', /backslash/],
    ['file:///etc/x.s1p', /contains ':'/],
    ['a1.s1p:stream', /contains ':'|expected a sweep file ending in/],
  ])('refuses %s with a located error', async (name, message) => {
    await expectFieldError(part([name], []), message);
  });

  it('reads %2e%2e as the literal name it is, never decoded into ..', async () => {
    const dir = part(['%2e%2e/x.s1p'], []);
    await expectFieldError(dir, /file "%2e%2e\/x\.s1p" not found in the part folder/);
  });
});

describe('odd characters', () => {
  it.each([
    ['a1\u202e1p2s.s1p', /invisible or direction-changing character U\+202E/],
    ['a1\u2066.s1p', /invisible or direction-changing character U\+2066/],
    ['a1\u200b.s1p', /invisible or direction-changing character U\+200B/],
    ['a1\ufeff.s1p', /invisible or direction-changing character U\+FEFF/],
    ['a1\u0000.s1p', /control character U\+0000/],
    ['a1\n.s1p', /control character U\+000A/],
    ['a1\u0085.s1p', /control character U\+0085/],
    [' a1.s1p', /leading or trailing spaces/],
  ])('refuses %j with a located error that shows the character', async (name, message) => {
    await expectFieldError(part([name], []), message);
  });

  it('names a file whose Unicode form (NFD) differs from the record (NFC) as not found, at the field', async () => {
    const nfc = 'caf\u00e9.s1p';
    const nfd = 'cafe\u0301.s1p';
    await expectFieldError(part([nfc], [nfd]), /file "café\.s1p" not found in the part folder/);
  });

  it('refuses two names in one record that differ only in Unicode normalisation (one file on some systems, two on others)', async () => {
    const nfc = 'caf\u00e9.s1p';
    const nfd = 'cafe\u0301.s1p';
    await expectFieldError(part([nfc, nfd]), /differ only/, 1);
  });
});

describe('letter case', () => {
  it('refuses two names that differ only by case, at the later one', async () => {
    await expectFieldError(part(['a1.s1p', 'A1.s1p']), /"A1\.s1p" and "a1\.s1p" differ only by letter case/, 1);
  });

  it('refuses a name whose case differs from the file on disk', async () => {
    await expectFieldError(
      part(['A1.S1P'], ['a1.s1p']),
      /letter case of "A1\.S1P" differs from the file on disk "a1\.s1p"|did you mean "a1\.s1p"/,
    );
  });
});

describe('folders of parts', () => {
  it('reports a part folder reached through a link instead of skipping it silently', async () => {
    const cat = join(root, 'catalogue-with-link');
    mkdirSync(cat, { recursive: true });
    const real = part(['a1.s1p']);
    symlinkSync(real, join(cat, 'linked-part'));
    const own = part(['a1.s1p']);
    mkdirSync(join(cat, 'own'));
    writeFileSync(
      join(cat, 'own', 'part.yaml'),
      readFileSync(join(own, 'part.yaml'), 'utf8').replace(/^id: .*/m, 'id: OWN-1'),
    );
    writeFileSync(join(cat, 'own', 'a1.s1p'), SWEEP);
    const r = await check(cat);
    // either checked (2 parts) or named as a problem; never silently left out
    const checked = /^2 parts/.test(r.out);
    const named = r.err.includes('linked-part');
    expect(checked || named, `stdout: ${r.out}\nstderr: ${r.err}`).toBe(true);
  });

  it('does not loop on a folder that links to its parent', async () => {
    const cat = join(root, 'catalogue-with-loop');
    mkdirSync(join(cat, 'p'), { recursive: true });
    writeFileSync(join(cat, 'p', 'part.yaml'), readFileSync(join(part(['a1.s1p']), 'part.yaml'), 'utf8'));
    writeFileSync(join(cat, 'p', 'a1.s1p'), SWEEP);
    symlinkSync('..', join(cat, 'loop'));
    const t0 = Date.now();
    const r = await check(cat);
    expect(Date.now() - t0).toBeLessThan(10_000);
    expect(r.code).toBe(0);
  });

  it('reports a record deeper than the search depth instead of skipping it silently', async () => {
    const cat = join(root, 'deep-catalogue');
    const deep = join(cat, ...Array.from({ length: 10 }, (_, i) => `d${i}`));
    mkdirSync(deep, { recursive: true });
    writeFileSync(join(deep, 'part.yaml'), readFileSync(join(part(['a1.s1p']), 'part.yaml'), 'utf8'));
    writeFileSync(join(deep, 'a1.s1p'), SWEEP);
    mkdirSync(join(cat, 'shallow'));
    writeFileSync(join(cat, 'shallow', 'part.yaml'), readFileSync(join(part(['a1.s1p']), 'part.yaml'), 'utf8'));
    writeFileSync(join(cat, 'shallow', 'a1.s1p'), SWEEP);
    const r = await check(cat);
    const checked = /^2 parts/.test(r.out);
    const named = r.err.includes('d9') || r.err.includes('deeper');
    expect(checked || named, `stdout: ${r.out}\nstderr: ${r.err}`).toBe(true);
  });
});
