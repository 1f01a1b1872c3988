import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkPaths } from '../../src/pipeline/check-paths.ts';
import { formatIssue } from '../../src/lib/issues.ts';

const CSV = 'f (Hz),r (ohm),x (ohm)\n1000,10,0\n2000,10,1\n';
const yaml = (id: string) =>
  `id: ${id}\ntitle: t\nkind: other\nsamples:\n  - id: A1\n    sweeps:\n      - file: a.csv\n        fixture: impedance\n`;

let root: string;
function part(rel: string, id: string): void {
  mkdirSync(join(root, rel), { recursive: true });
  writeFileSync(join(root, rel, 'part.yaml'), yaml(id));
  writeFileSync(join(root, rel, 'a.csv'), CSV);
}

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'motional-check-paths-'));
  part('cat/zeta', 'Z-1');
  part('cat/alpha', 'A-1');
  part('cat/group/beta', 'B-1');
  part('cat/.hidden/ghost', 'GHOST');
  part('cat/node_modules/dep', 'DEP');
  // A part folder is not searched further: this inner record is not a separate part.
  part('cat/alpha/inner', 'INNER');
  part('dups/one', 'SAME');
  part('dups/two', 'SAME');
  mkdirSync(join(root, 'empty'));
  writeFileSync(join(root, 'notes.txt'), 'hello\n');
  symlinkSync(join(root, 'cat'), join(root, 'cat', 'group', 'loop'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('checkPaths', () => {
  it('finds part folders at any depth, in sorted order, skipping hidden folders, node_modules and links', async () => {
    const r = await checkPaths([join(root, 'cat')]);
    expect(r.issues).toEqual([]);
    expect(r.parts.map((p) => p.id)).toEqual(['A-1', 'B-1', 'Z-1']);
  });

  it('accepts a part.yaml, a part folder and a folder of parts, loading each record once', async () => {
    const r = await checkPaths([join(root, 'cat', 'zeta', 'part.yaml'), join(root, 'cat', 'zeta'), join(root, 'cat')]);
    expect(r.parts.map((p) => p.id)).toEqual(['A-1', 'B-1', 'Z-1']);
  });

  it('reports a duplicate part id naming both files', async () => {
    const r = await checkPaths([join(root, 'dups')]);
    const two = join(root, 'dups', 'two', 'part.yaml');
    expect(r.issues.map(formatIssue)).toEqual([
      `${two}:1: id: duplicate part id "SAME" (also in ${join(root, 'dups', 'one', 'part.yaml')})`,
    ]);
    expect(r.parts[1].issues).toHaveLength(1);
  });

  it('reports paths that hold no part', async () => {
    const r = await checkPaths([join(root, 'empty'), join(root, 'nowhere'), join(root, 'notes.txt')]);
    expect(r.parts).toEqual([]);
    expect(r.issues.map((i) => [i.file, i.message])).toEqual([
      [join(root, 'empty'), 'no part.yaml in this folder or its subfolders'],
      [join(root, 'nowhere'), 'no such file or folder'],
      [join(root, 'notes.txt'), 'expected a part.yaml or a folder of parts, got another file'],
    ]);
  });

  it('returns the same result on every run', async () => {
    const a = await checkPaths([join(root, 'dups'), join(root, 'cat')]);
    const b = await checkPaths([join(root, 'cat'), join(root, 'dups')]);
    expect(b.parts.map((p) => p.yamlFile)).toEqual(a.parts.map((p) => p.yamlFile));
    expect(b.issues).toEqual(a.issues);
  });
});
