/**
 * Every part stays reachable with JavaScript off, however the catalogue page lists its rows
 * (a full table, paged static lists or an index per kind): a catalogue of 120 synthetic parts is
 * built with the real command, served on 127.0.0.1 under a base path, and Debian's chromium with
 * JavaScript disabled follows the site's own links from the catalogue page (downloads and data
 * files aside) until no new page appears. Every part's page must be among the pages reached.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Browser } from 'playwright-core';
import { launchChromium } from '../support/chromium.ts';
import { requireTool } from '../support/tools.ts';
import { startStaticServer, type TestServer } from '../support/static-server.ts';
import { syntheticPartId, writeSyntheticCatalogue } from '../../scripts/bench/lib/synthetic-catalogue.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
const BASE = '/nojs/';
const PARTS = 120;
/** More pages than this means the crawl is running away (a link loop with changing URLs). */
const MAX_PAGES = 2000;
const haveChromium = requireTool('chromium');

describe.skipIf(!haveChromium)('every part reachable with JavaScript off', () => {
  let work: string;
  let server: TestServer;
  let browser: Browser;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'motional-nojs-'));
    await writeSyntheticCatalogue(join(work, 'content'), PARTS, { points: 121, samples: 1 });
    const build = spawnSync(
      process.execPath,
      [
        join(ROOT, 'node_modules', 'tsx', 'dist', 'cli.mjs'),
        join(ROOT, 'scripts', 'motional.ts'),
        'build',
        '--content',
        join(work, 'content'),
        '--out',
        join(work, 'site'),
        '--base',
        BASE,
        '--cache-dir',
        join(work, 'cache'),
        '--quiet',
      ],
      { cwd: ROOT, encoding: 'utf8', env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' } },
    );
    if (build.status !== 0) throw new Error(`build failed (exit ${build.status}):\n${build.stdout}\n${build.stderr}`);
    server = await startStaticServer(join(work, 'site'), BASE);
    browser = await launchChromium();
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('reaches every part page by following links from the catalogue page', async () => {
    const ctx = await browser.newContext({ javaScriptEnabled: false });
    const page = await ctx.newPage();
    const origin = new URL(server.url).origin;
    const seen = new Set<string>();
    const queue = [new URL(server.url).pathname];
    const partPath = new RegExp(`^${BASE}parts/([^/]+)/$`);
    const reached = new Set<string>();
    while (queue.length > 0) {
      const path = queue.shift()!;
      if (seen.has(path)) continue;
      seen.add(path);
      expect(seen.size, 'pages crawled').toBeLessThanOrEqual(MAX_PAGES);
      const response = await page.goto(`${origin}${path}`);
      expect(response?.status(), path).toBe(200);
      const part = partPath.exec(path);
      if (part) {
        reached.add(decodeURIComponent(part[1]));
        continue; // a part page's links lead to downloads and back to the catalogue
      }
      // links read from the served HTML (no script runs in the page)
      const html = await page.content();
      for (const m of html.matchAll(/<a\b[^>]*\bhref="([^"#]+)/g)) {
        const url = new URL(m[1].replace(/&amp;/g, '&'), `${origin}${path}`);
        if (url.origin !== origin || !url.pathname.startsWith(BASE)) continue;
        const rest = url.pathname.slice(BASE.length);
        if (
          rest.startsWith('downloads/') ||
          rest.startsWith('data/') ||
          rest.startsWith('_astro/') ||
          /\.[a-z0-9]+$/i.test(rest)
        )
          continue;
        const next = `${url.pathname}${url.search}`;
        if (!seen.has(next)) queue.push(next);
      }
    }
    const missing = Array.from({ length: PARTS }, (_, i) => syntheticPartId(i + 1)).filter((id) => !reached.has(id));
    expect(missing).toEqual([]);
    await ctx.close();
  }, 300_000);
});
