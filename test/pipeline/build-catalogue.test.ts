/**
 * The catalogue build end to end without the Astro stage (`dataOnly`): validation before
 * anything is written, accounting, the cache, and serial against parallel extraction.
 * The site stage is covered by build-site.test.ts.
 *
 * Catalogues are small synthetic ones (scripts/bench/lib/synthetic-catalogue.ts: invented parts,
 * seeded BVD models, labelled synthetic files).
 */
import { mkdir, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formatIssue } from '../../src/lib/issues.ts';
import { OUTPUT_MARKER } from '../../src/pipeline/atomic-dir.ts';
import { buildCatalogue, type BuildCatalogueOptions } from '../../src/pipeline/build-catalogue.ts';
import { syntheticPartId, writeSyntheticCatalogue } from '../../scripts/bench/lib/synthetic-catalogue.ts';

let tmp: string;
// four parts: fewer records to extract than that run in the main thread (MIN_RECORDS_FOR_THREADS)
const PARTS = 4;
const SMALL = { points: 121, samples: 1 };

beforeAll(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-build-'));
});
afterAll(async () => {
  await rm(tmp, { recursive: true, force: true });
});

function options(extra: BuildCatalogueOptions): BuildCatalogueOptions {
  return { progress: false, log: () => undefined, dataOnly: true, ...extra };
}

/** Every file under a folder: relative path → bytes. */
async function snapshot(dir: string): Promise<Map<string, Buffer>> {
  const out = new Map<string, Buffer>();
  const walk = async (d: string) => {
    for (const e of await readdir(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) await walk(p);
      else out.set(relative(dir, p), await readFile(p));
    }
  };
  await walk(dir);
  return out;
}

describe('buildCatalogue', () => {
  it('fails on a broken record listing every problem, and leaves the previous output untouched', async () => {
    const content = join(tmp, 'broken');
    await writeSyntheticCatalogue(content, 2, SMALL);
    // one more record with three independent problems: a unit mismatch, a missing sweep file,
    // and a Touchstone row with too few numbers
    const bad = join(content, 'parts', 'BAD-1');
    await mkdir(bad, { recursive: true });
    await writeFile(
      join(bad, 'part.yaml'),
      [
        'id: BAD-1',
        'title: broken record',
        'kind: quartz-at',
        'datasheet:',
        '  loadCapacitance: 8 ohm',
        'samples:',
        '  - id: A1',
        '    sweeps:',
        '      - file: missing.s1p',
        '        fixture: reflection',
        '      - file: short-row.s1p',
        '        fixture: reflection',
        '',
      ].join('\n'),
    );
    await writeFile(join(bad, 'short-row.s1p'), '# Hz S RI R 50\n1000000 0.5 0.1\n1000100 0.5\n1000200 0.5 0.1\n');
    const out = join(tmp, 'broken-out');
    await mkdir(out);
    await writeFile(join(out, 'marker.html'), 'previous site');
    await writeFile(join(out, OUTPUT_MARKER), '');
    const before = await snapshot(out);

    const summary = await buildCatalogue(options({ contentDir: content, outDir: out, cache: false }));

    expect(summary.exitCode).toBe(1);
    expect(summary.recordsFound).toBe(3);
    expect(summary.recordsInvalid).toBe(1);
    expect(summary.partsPublished).toBe(0);
    const lines = summary.issues.filter((i) => i.severity === 'error').map(formatIssue);
    const yaml = join(bad, 'part.yaml');
    expect(lines).toEqual(
      expect.arrayContaining([
        expect.stringMatching(new RegExp(`^${yaml}:5: datasheet\\.loadCapacitance: .*`)),
        expect.stringMatching(new RegExp(`^${yaml}:9: samples\\[0\\]\\.sweeps\\[0\\]\\.file: .*missing\\.s1p.*`)),
        expect.stringMatching(new RegExp(`^${join(bad, 'short-row.s1p')}:3: .*`)),
      ]),
    );
    expect(await snapshot(out)).toEqual(before);
    // no staging or old folder left next to the output
    expect((await readdir(tmp)).filter((n) => n.includes('.broken-out.'))).toEqual([]);
  });

  it('refuses an output folder it did not write, and leaves it alone', async () => {
    const content = join(tmp, 'one');
    await writeSyntheticCatalogue(content, 1, SMALL);
    const out = join(tmp, 'someone-elses');
    await mkdir(out);
    await writeFile(join(out, 'thesis.tex'), 'precious');
    const s = await buildCatalogue(options({ contentDir: content, outDir: out, cache: false }));
    expect(s.exitCode).toBe(1);
    expect(s.issues.map(formatIssue)).toEqual([
      `${out}:1: the output folder ${out} is not empty and was not written by a build (no ${OUTPUT_MARKER}); remove it or choose another folder`,
    ]);
    expect(await readdir(out)).toEqual(['thesis.tex']);
    const inside = await buildCatalogue(options({ contentDir: content, outDir: tmp, cache: false }));
    expect(inside.exitCode).toBe(1);
    expect(inside.failure).toMatch(/contains/);
  });

  describe('on a valid catalogue', () => {
    let content: string;
    let cacheDir: string;
    beforeAll(async () => {
      content = join(tmp, 'good');
      cacheDir = join(tmp, 'cache');
      await writeSyntheticCatalogue(content, PARTS, SMALL);
    });

    it('publishes one part per valid record, with counts that add up', async () => {
      const out = join(tmp, 'good-out');
      const s = await buildCatalogue(options({ contentDir: content, outDir: out, cacheDir }));
      expect(s.exitCode).toBe(0);
      expect(s.recordsFound).toBe(PARTS);
      expect(s.recordsValid).toBe(PARTS);
      expect(s.partsPublished).toBe(s.recordsValid);
      expect(s.samples).toBe(PARTS * SMALL.samples);
      expect(s.modes).toBeGreaterThanOrEqual(s.samples);
      const index = JSON.parse(await readFile(join(out, 'index.json'), 'utf8')) as Array<{ id: string }>;
      expect(index.map((e) => e.id)).toEqual(Array.from({ length: PARTS }, (_, i) => syntheticPartId(i + 1)));
      expect((await readdir(join(out, 'parts'))).sort()).toEqual(index.map((e) => `${e.id}.json`));
      expect(s.cache).toEqual({ enabled: true, hits: 0, misses: PARTS });
    });

    it('answers every record from the cache on a rebuild, and only the touched record again', async () => {
      const out = join(tmp, 'good-out');
      const first = await snapshot(out);
      const again = await buildCatalogue(options({ contentDir: content, outDir: out, cacheDir }));
      expect(again.exitCode).toBe(0);
      expect(again.cache).toEqual({ enabled: true, hits: PARTS, misses: 0 });
      expect(await snapshot(out)).toEqual(first);

      const yaml = join(content, 'parts', syntheticPartId(2), 'part.yaml');
      await writeFile(
        yaml,
        (await readFile(yaml, 'utf8')).replace(/^title: .*$/m, 'title: retitled synthetic crystal'),
      );
      const touched = await buildCatalogue(options({ contentDir: content, outDir: out, cacheDir }));
      expect(touched.exitCode).toBe(0);
      expect(touched.cache).toEqual({ enabled: true, hits: PARTS - 1, misses: 1 });
      const part = JSON.parse(await readFile(join(out, 'parts', `${syntheticPartId(2)}.json`), 'utf8')) as {
        title: string;
      };
      expect(part.title).toBe('retitled synthetic crystal');
    });

    it('writes byte-identical data with one thread and with two', async () => {
      const serial = join(tmp, 'serial');
      const parallel = join(tmp, 'parallel');
      const a = await buildCatalogue(options({ contentDir: content, outDir: serial, cache: false, jobs: 1 }));
      const b = await buildCatalogue(options({ contentDir: content, outDir: parallel, cache: false, jobs: 2 }));
      expect([a.exitCode, b.exitCode]).toEqual([0, 0]);
      expect([a.threads, b.threads]).toEqual([0, 1]);
      const sa = await snapshot(serial);
      const sb = await snapshot(parallel);
      expect([...sb.keys()].sort()).toEqual([...sa.keys()].sort());
      for (const [name, bytes] of sa) expect(sb.get(name)?.equals(bytes), name).toBe(true);
      // and the cached build gives the same bytes as the fresh ones (all but the marker, which
      // records the cache keys)
      const cached = await snapshot(join(tmp, 'good-out'));
      for (const [name, bytes] of sa)
        if (name !== OUTPUT_MARKER) expect(cached.get(name)?.equals(bytes), name).toBe(true);
    });
  });
});
