/**
 * Browser test (Debian chromium via playwright-core) of picking parts to compare from the
 * catalogue table (issue 14, item 4): a checkbox per row, at most four, then Compare opens the
 * compare page with the picked ids; and the catalogue page's links to the catalogue export,
 * whose CSV has one line per part and per sample.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Browser } from 'playwright-core';
import { launchChromium } from '../support/chromium.ts';
import { requireTool } from '../support/tools.ts';
import { startStaticServer, type TestServer } from '../support/static-server.ts';
import { buildFixtureSite } from './fixture-site.ts';
import type { IndexEntry } from '../../src/site/types.ts';

const BASE = '/cat/';
const haveChromium = requireTool('chromium');

describe.skipIf(!haveChromium)('pick parts to compare from the catalogue, in chromium', () => {
  let work: string;
  let server: TestServer;
  let browser: Browser;
  let index: IndexEntry[];

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'motional-pick-'));
    await buildFixtureSite(join(work, 'data'), join(work, 'site'), BASE);
    index = JSON.parse(readFileSync(join(work, 'site', 'data', 'index.json'), 'utf8'));
    server = await startStaticServer(join(work, 'site'), BASE);
    browser = await launchChromium();
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('up to four boxes, then Compare opens the compare page with them', async () => {
    expect(index.length).toBeGreaterThanOrEqual(5);
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(server.url);
    const button = page.locator('#compare-picked');
    await expect.poll(() => button.isDisabled()).toBe(true);
    const ids = index.slice(0, 5).map((e) => e.id);
    for (const id of ids.slice(0, 4)) await page.locator(`input.pick[value="${id}"]`).check();
    // a fifth part cannot be picked
    expect(await page.locator(`input.pick[value="${ids[4]}"]`).isDisabled()).toBe(true);
    expect(await button.textContent()).toBe('Compare 4 parts');
    await page.locator(`input.pick[value="${ids[3]}"]`).uncheck();
    expect(await page.locator(`input.pick[value="${ids[4]}"]`).isDisabled()).toBe(false);
    await Promise.all([page.waitForURL(/\/compare\/\?parts=/), button.click()]);
    expect(decodeURIComponent(new URL(page.url()).searchParams.get('parts') ?? '')).toBe(ids.slice(0, 3).join(','));
    await page.close();
  }, 60_000);

  it('the catalogue page links the export, and the CSV has a line per part and per sample', async () => {
    const page = await browser.newPage();
    await page.goto(server.url);
    const href = await page.locator('a[href$="catalogue.csv"]').getAttribute('href');
    expect(href).toBe(`${BASE}catalogue.csv`);
    const csv = await (await fetch(`${server.url}catalogue.csv`)).text();
    const samples = index.reduce((n, e) => n + e.samples, 0);
    expect(csv.trimEnd().split('\r\n')).toHaveLength(1 + index.length + samples);
    const json = await (await fetch(`${server.url}catalogue.json`)).json();
    expect(json.schemaVersion).toBe(1);
    await page.close();
  }, 60_000);
});
