/**
 * Browser test of the catalogue's "fits circuit" columns: Debian's chromium driven by
 * playwright-core against the synthetic fixture catalogue (test/site/fixture.ts, one circuit
 * meant for every part) built with the real emitter and astro. Expected verdicts come from the
 * same library call the build makes (report/fits.ts through the index).
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
import { fitFor, FIT_VERDICT_LABEL } from '../../src/lib/report/fits.ts';
import { DEMO_CIRCUIT } from '../site/fixture.ts';

const BASE = '/cat/';
const haveChromium = requireTool('chromium');

describe.skipIf(!haveChromium)('catalogue "fits circuit" columns in chromium', () => {
  let work: string;
  let server: TestServer;
  let browser: Browser;
  let index: IndexEntry[];
  const circuit = DEMO_CIRCUIT.name;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'motional-fits-'));
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

  it('the index carries a fit for the circuit for parts with a main mode', () => {
    expect(index.some((e) => e.fits?.some((f) => f.circuit === circuit))).toBe(true);
  });

  it('a part page draws the negative-resistance curve with R1 and the chosen capacitors, the start-up and the budget', () => {
    const e = index.find((x) => x.fits?.some((f) => f.circuit === circuit))!;
    const html = readFileSync(join(work, 'site', 'parts', e.id, 'index.html'), 'utf8');
    expect(html).toContain(`Negative resistance against load capacitance, ${circuit}`);
    expect(html).toContain('R1 (extracted)');
    expect(html).toMatch(/>chosen</);
    expect(html).toContain('Start-up:');
    expect(html).toContain(`Frequency budget with the closest pair, ${circuit}`);
    expect(html).toContain('Root-sum-square');
  });

  it('choosing a circuit shows the verdict columns, the URL keeps it, a reload restores it', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(server.url);
    await page.waitForSelector('body[data-ready="true"]');
    expect(await page.locator('#catalogue-table th.fit-col').count()).toBe(0);
    await page.selectOption('#f-circuit', circuit);
    await expect.poll(() => page.locator('#catalogue-table thead th.fit-col').count()).toBe(5);
    expect(await page.locator('#catalogue-table thead th.fit-col').last().textContent()).toBe(`Fits ${circuit}`);
    const rows = await page.locator('#catalogue-table tbody tr').evaluateAll((trs) =>
      trs.map((tr) => ({
        id: (tr as HTMLElement).dataset.id ?? '',
        cells: Array.from(tr.querySelectorAll('td.fit-col')).map((td) => td.textContent ?? ''),
      })),
    );
    expect(rows.length).toBe(Math.min(index.length, 100));
    for (const r of rows) {
      expect(r.cells).toHaveLength(5);
      const e = index.find((x) => x.id === r.id)!;
      expect(r.cells[4]).toBe(FIT_VERDICT_LABEL[fitFor(e.fits, circuit).verdict]);
    }
    expect(new URL(page.url()).searchParams.get('circuit')).toBe(circuit);
    await page.reload();
    await page.waitForSelector('body[data-ready="true"]');
    expect(await page.inputValue('#f-circuit')).toBe(circuit);
    expect(await page.locator('#catalogue-table thead th.fit-col').count()).toBe(5);
    expect(await page.locator('#catalogue-table tbody tr').first().locator('td.fit-col').count()).toBe(5);
    // clearing the circuit removes the columns
    await page.selectOption('#f-circuit', '');
    await expect.poll(() => page.locator('#catalogue-table th.fit-col, #catalogue-table td.fit-col').count()).toBe(0);
    expect(new URL(page.url()).searchParams.get('circuit')).toBeNull();
    await page.close();
  });

  it('filters by verdict, and the URL keeps the filter', async () => {
    const verdict = fitFor(index.find((e) => e.fits?.length)?.fits, circuit).verdict;
    const expected = index.filter((e) => fitFor(e.fits, circuit).verdict === verdict).length;
    const page = await browser.newPage();
    await page.goto(`${server.url}?circuit=${encodeURIComponent(circuit)}&fit=${verdict}`);
    await page.waitForSelector('body[data-ready="true"]');
    expect(await page.inputValue('#f-fit')).toBe(verdict);
    expect(await page.locator('#catalogue-table tbody tr').count()).toBe(Math.min(expected, 100));
    expect(await page.textContent('#result-count')).toContain(`${expected} of ${index.length}`);
    await page.close();
  });

  it('without JavaScript the page still lists every part', async () => {
    const ctx = await browser.newContext({ javaScriptEnabled: false });
    const page = await ctx.newPage();
    await page.goto(`${server.url}?circuit=${encodeURIComponent(circuit)}`);
    expect(await page.locator('#catalogue-table tbody tr').count()).toBe(index.length);
    await ctx.close();
  });

  it('the compare page overlays the negative-resistance curves for the chosen circuit', async () => {
    const ids = index
      .filter((e) => e.fits?.some((f) => f.circuit === circuit))
      .slice(0, 2)
      .map((e) => e.id);
    expect(ids).toHaveLength(2);
    const page = await browser.newPage();
    await page.goto(`${server.url}compare/?parts=${ids.join(',')}&circuit=${encodeURIComponent(circuit)}`);
    await page.waitForSelector('body[data-ready="true"]');
    expect(await page.inputValue('#cmp-circuit')).toBe(circuit);
    const caption = await page.locator('.compare-circuit figcaption').textContent();
    expect(caption).toBe(`Negative resistance against load capacitance in ${circuit}`);
    // one curve per part in the legend
    const figure = await page.locator('.compare-circuit figure').textContent();
    for (const id of ids) expect(figure).toContain(id);
    expect(new URL(page.url()).searchParams.get('circuit')).toBe(circuit);
    await page.close();
  });
});
