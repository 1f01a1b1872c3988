/**
 * `motional build` as a command, with the real Astro stage: a site under a sub-path that the
 * static server serves, and a build killed half-way that leaves the previous site intact.
 * Catalogue: two small synthetic parts (scripts/bench/lib/synthetic-catalogue.ts).
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readFile, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUTPUT_MARKER } from '../../src/pipeline/atomic-dir.ts';
import { PROJECT_ROOT } from '../../src/pipeline/build-catalogue.ts';
import { siteSupportsPartialPages } from '../../src/pipeline/partial-site.ts';
import { startStaticServer } from '../../src/pipeline/static-server.ts';
import { syntheticPartId, writeSyntheticCatalogue } from '../../scripts/bench/lib/synthetic-catalogue.ts';

let tmp: string;
let content: string;
const BASE = '/tools/crystals/';

beforeAll(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-site-'));
  content = join(tmp, 'content');
  await writeSyntheticCatalogue(content, 2, { points: 121, samples: 1 });
});
afterAll(async () => {
  await rm(tmp, { recursive: true, force: true });
});

interface Run {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

function startBuild(args: string[]) {
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/motional.ts', 'build', ...args], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1', NO_COLOR: '1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (c) => (stdout += c));
  child.stderr.on('data', (c) => (stderr += c));
  const done = new Promise<Run>((resolve) =>
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr })),
  );
  return { child, done };
}

async function waitFor(check: () => boolean | Promise<boolean>, timeoutMs: number): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > end) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Processes whose environment names this site output folder (the Astro build of a staging folder). */
async function processesWriting(siteDir: string): Promise<number[]> {
  const pids: number[] = [];
  for (const name of await readdir('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    const env = await readFile(`/proc/${name}/environ`, 'utf8').catch(() => '');
    if (env.split('\0').includes(`MOTIONAL_SITE_OUT=${siteDir}`)) pids.push(Number(name));
  }
  return pids;
}

/** The build of the test catalogue into `out`, at the sub-path, with the test's own cache. */
function siteArgs(out: string): string[] {
  return ['--content', content, '--out', out, '--base', BASE, '--cache-dir', join(tmp, 'cache'), '--quiet'];
}

describe('motional build (with the site)', () => {
  it('builds a site that works from a sub-path, one page per part', async () => {
    const out = join(tmp, 'site');
    await mkdir(out);
    await writeFile(join(out, 'stale.html'), 'from an older build');
    await writeFile(join(out, OUTPUT_MARKER), '');
    const run = await startBuild(siteArgs(out)).done;
    expect(run.stderr).not.toMatch(/error/i);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^records found: 2 \(2 valid, 0 invalid\)$/m);
    expect(run.stdout).toMatch(/^parts published: 2$/m);
    expect(existsSync(join(out, 'stale.html'))).toBe(false);
    for (const n of [1, 2]) expect(existsSync(join(out, 'parts', syntheticPartId(n), 'index.html'))).toBe(true);

    const server = await startStaticServer({ root: out, base: BASE, port: 0 });
    try {
      const home = await fetch(server.url);
      expect(home.status).toBe(200);
      const html = await home.text();
      expect(html).toContain(`${BASE}parts/${syntheticPartId(1)}/`);
      // every site-local link and asset of the home page lives under the base and resolves
      const refs = [...html.matchAll(/(?:href|src)="(\/[^"#?]*)/g)].map((m) => m[1]);
      expect(refs.length).toBeGreaterThan(0);
      for (const ref of new Set(refs)) {
        expect(ref.startsWith(BASE), ref).toBe(true);
        expect((await fetch(new URL(ref, server.url))).status, ref).toBe(200);
      }
    } finally {
      await server.close();
    }
  });

  it('after one record changed renders only that part page again when the site supports it', async () => {
    const out = join(tmp, 'site');
    const keptPage = join(out, 'parts', syntheticPartId(1), 'index.html');
    const keptInode = (await stat(keptPage)).ino;
    const yaml = join(content, 'parts', syntheticPartId(2), 'part.yaml');
    await writeFile(yaml, (await readFile(yaml, 'utf8')).replace(/^title: .*$/m, 'title: retitled crystal two'));
    const run = await startBuild(siteArgs(out)).done;
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^parts published: 2$/m);
    expect(run.stdout).toMatch(/^cache: 1 hits, 1 misses/m);
    expect(await readFile(join(out, 'parts', syntheticPartId(2), 'index.html'), 'utf8')).toContain(
      'retitled crystal two',
    );
    expect(await readFile(join(out, 'index.html'), 'utf8')).toContain('retitled crystal two');
    if (await siteSupportsPartialPages()) {
      expect(run.stdout).toMatch(/^site: 1 changed part pages rendered, 0 removed/m);
      expect((await stat(keptPage)).ino).toBe(keptInode); // the unchanged page was carried over, not rendered
    } else {
      console.warn(
        '\n!!! the site cannot render a subset of part pages (src/site/catalogue.ts has no partPageIds): every page was rendered; see src/pipeline/partial-site.ts\n',
      );
      expect(run.stdout).toMatch(/^site: all 2 part pages rendered$/m);
    }
  });

  it('renders changed pages without the site generator, byte for byte as the generator renders them', async () => {
    const out = join(tmp, 'site');
    const yaml = join(content, 'parts', syntheticPartId(1), 'part.yaml');
    await writeFile(yaml, (await readFile(yaml, 'utf8')).replace(/^title: .*$/m, 'title: retitled crystal one'));
    const run = await startBuild(siteArgs(out)).done;
    expect(run.code).toBe(0);
    if (!(await siteSupportsPartialPages())) return;
    // the first build (full, with the cache) kept the generator's page modules and checked them
    expect(run.stdout).toMatch(
      /^site: 1 changed part pages rendered, 0 removed, .*\(without starting the site generator\)$/m,
    );
    const full = join(tmp, 'site-full');
    const reference = await startBuild([
      '--content',
      content,
      '--out',
      full,
      '--base',
      BASE,
      '--cache-dir',
      join(tmp, 'cache'),
      '--full-site',
      '--quiet',
    ]).done;
    expect(reference.code).toBe(0);
    expect(reference.stdout).toMatch(/^site: all 2 part pages rendered$/m);
    for (const rel of [
      'index.html',
      `parts/${syntheticPartId(1)}/index.html`,
      'compare/index.html',
      '404.html',
      'data/index.json',
    ]) {
      expect(await readFile(join(out, ...rel.split('/')), 'utf8'), rel).toBe(
        await readFile(join(full, ...rel.split('/')), 'utf8'),
      );
    }
    expect(await readFile(join(out, 'parts', syntheticPartId(1), 'index.html'), 'utf8')).toContain(
      'retitled crystal one',
    );
  });

  it('leaves the previous site intact when killed during the site stage, and stops its Astro process', async () => {
    const out = join(tmp, 'killed');
    await mkdir(out);
    await writeFile(join(out, 'index.html'), 'previous site');
    await writeFile(join(out, OUTPUT_MARKER), '');
    const build = startBuild(['--content', content, '--out', out, '--cache-dir', join(tmp, 'cache'), '--quiet']);
    const staging = join(tmp, `.killed.staging-${build.child.pid}`);
    // the index is written just before the Astro build starts
    await waitFor(() => existsSync(join(staging, 'data', 'index.json')), 90_000);
    await waitFor(async () => (await processesWriting(join(staging, 'site'))).length > 0, 30_000);
    build.child.kill('SIGKILL');
    const run = await build.done;
    expect(run.signal).toBe('SIGKILL');
    expect((await readdir(out)).sort()).toEqual([OUTPUT_MARKER, 'index.html']);
    expect(await readFile(join(out, 'index.html'), 'utf8')).toBe('previous site');
    // the orphaned Astro process notices its parent is gone and stops within a few seconds
    await waitFor(async () => (await processesWriting(join(staging, 'site'))).length === 0, 10_000);

    // the next build clears the leftovers of the killed one
    expect(existsSync(staging)).toBe(true);
    const next = await startBuild([
      '--content',
      content,
      '--out',
      out,
      '--cache-dir',
      join(tmp, 'cache'),
      '--quiet',
      '--data-only',
    ]).done;
    expect(next.code).toBe(0);
    expect(existsSync(staging)).toBe(false);
  });
});
