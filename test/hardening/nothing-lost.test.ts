/**
 * Nothing lost (issue "Hardening" item 6): a catalogue mixing good records with every case of
 * the bad-input suite (test/fixtures/bad-records) fails the build, and the build names every
 * bad record and touches no output; the same catalogue without the bad records publishes every
 * good one (pages and index entries counted). A record the build cannot reach (deeper than its
 * search depth, or behind a linked folder) is reported, not silently left out.
 * The interrupted-build case is test/pipeline/build-site.test.ts.
 */
import {
  cpSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  symlinkSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildCatalogue, type BuildCatalogueOptions } from '../../src/pipeline/build-catalogue.ts';
import { OUTPUT_MARKER } from '../../src/pipeline/atomic-dir.ts';
import { syntheticPartFiles, syntheticPartId } from '../../scripts/bench/lib/synthetic-catalogue.ts';
import { ROOT } from './fuzz-support.ts';

const BAD = join(ROOT, 'test/fixtures/bad-records');
const GOOD_FIXTURES = [
  ['test/fixtures/good-records/xo-good-a', 'XO-GOOD-A'],
  ['test/fixtures/good-records/nested/xo-good-b', 'XO-GOOD-B'],
  ['test/fixtures/good-records/nested/xo-good-warn', 'XO-GOOD-WARN'],
  ['test/fixtures/hostile/HOSTILE-1', 'HOSTILE-1'],
] as const;
const SYNTHETIC = 3;

let work: string;
const goodIds: string[] = [];
const badCases = readdirSync(BAD)
  .filter((d) => statSync(join(BAD, d)).isDirectory())
  .sort();

const opts = (extra: BuildCatalogueOptions): BuildCatalogueOptions => ({
  jobs: 2,
  cache: false,
  progress: false,
  log: () => undefined,
  ...extra,
});

function writeGood(content: string): void {
  for (const [dir, id] of GOOD_FIXTURES) cpSync(join(ROOT, dir), join(content, 'good', id), { recursive: true });
  for (let n = 1; n <= SYNTHETIC; n++) {
    const folder = join(content, 'good', syntheticPartId(n));
    mkdirSync(folder, { recursive: true });
    for (const [name, text] of syntheticPartFiles(n, { points: 121, samples: 1 }))
      writeFileSync(join(folder, name), text);
  }
}

function snapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) =>
    readdirSync(d).forEach((n) => {
      const p = join(d, n);
      if (statSync(p).isDirectory()) walk(p);
      else out[relative(dir, p)] = readFileSync(p, 'utf8');
    });
  walk(dir);
  return out;
}

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'motional-nothing-lost-'));
  goodIds.push(
    ...GOOD_FIXTURES.map(([, id]) => id),
    ...Array.from({ length: SYNTHETIC }, (_, i) => syntheticPartId(i + 1)),
  );
});
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('a catalogue of good and bad records', () => {
  it('fails the build, names every bad record, counts them, and leaves the previous output as it was', async () => {
    const content = join(work, 'mixed');
    writeGood(content);
    // every case of the bad-input suite, links kept as links
    for (const c of badCases)
      cpSync(join(BAD, c), join(content, 'bad', c), { recursive: true, verbatimSymlinks: true });
    const out = join(work, 'mixed-out');
    mkdirSync(out);
    writeFileSync(join(out, 'index.html'), 'previous site');
    writeFileSync(join(out, OUTPUT_MARKER), 'a previous build\n');
    const before = snapshot(out);

    const summary = await buildCatalogue(opts({ contentDir: content, outDir: out, dataOnly: true }));

    expect(summary.exitCode).toBe(1);
    expect(summary.failure).toBe('invalid records');
    expect(badCases.length).toBeGreaterThanOrEqual(25);
    // duplicate-part-id holds two records, one of them the duplicate
    expect(summary.recordsFound).toBe(goodIds.length + badCases.length + 1);
    expect(summary.recordsInvalid).toBe(badCases.length);
    expect(summary.recordsValid).toBe(goodIds.length + 1);
    expect(summary.partsPublished).toBe(0);
    const errorFiles = summary.issues.filter((i) => i.severity === 'error').map((i) => i.file);
    const missing = badCases.filter((c) => !errorFiles.some((f) => f.startsWith(join(content, 'bad', c) + '/')));
    expect(missing, 'bad records the build did not name').toEqual([]);
    // no good record is blamed
    expect(errorFiles.filter((f) => f.startsWith(join(content, 'good')))).toEqual([]);
    // every error names a line (or is about a whole file)
    for (const i of summary.issues.filter((x) => x.severity === 'error')) expect(i.file).toMatch(/\S/);
    expect(snapshot(out)).toEqual(before);
  }, 240_000);

  it('without the bad records, publishes every good record: one page and one index entry each', async () => {
    const content = join(work, 'good-only');
    writeGood(content);
    const out = join(work, 'good-out');
    const summary = await buildCatalogue(opts({ contentDir: content, outDir: out, base: '/' }));
    expect(summary.failure).toBeUndefined();
    expect(summary.exitCode).toBe(0);
    expect(summary.recordsFound).toBe(goodIds.length);
    expect(summary.partsPublished).toBe(goodIds.length);
    const index = JSON.parse(readFileSync(join(out, 'data', 'index.json'), 'utf8')) as Array<{ id: string }>;
    expect(index.map((e) => e.id).sort()).toEqual([...goodIds].sort());
    for (const id of goodIds) expect(existsSync(join(out, 'parts', id, 'index.html')), id).toBe(true);
  }, 240_000);
});

describe('records the build cannot reach', () => {
  it('are reported (deeper than the search depth, or behind a linked folder), not silently left out', async () => {
    const content = join(work, 'unreachable');
    const shallow = join(content, 'parts', syntheticPartId(1));
    mkdirSync(shallow, { recursive: true });
    for (const [name, text] of syntheticPartFiles(1, { points: 121, samples: 1 }))
      writeFileSync(join(shallow, name), text);
    const deep = join(content, ...Array.from({ length: 10 }, (_, i) => `d${i}`), syntheticPartId(2));
    mkdirSync(deep, { recursive: true });
    for (const [name, text] of syntheticPartFiles(2, { points: 121, samples: 1 }))
      writeFileSync(join(deep, name), text);
    const elsewhere = join(work, 'elsewhere', syntheticPartId(3));
    mkdirSync(elsewhere, { recursive: true });
    for (const [name, text] of syntheticPartFiles(3, { points: 121, samples: 1 }))
      writeFileSync(join(elsewhere, name), text);
    symlinkSync(elsewhere, join(content, 'parts', 'linked'));
    const summary = await buildCatalogue(
      opts({ contentDir: content, outDir: join(work, 'unreachable-out'), dataOnly: true }),
    );
    const said = summary.issues.map((i) => `${i.file}: ${i.message}`).join('\n');
    const reached = summary.recordsFound === 3;
    const reported = said.includes('d9') && said.includes('linked');
    expect(reached || reported, `found ${summary.recordsFound} records; issues:\n${said}`).toBe(true);
  }, 240_000);
});
