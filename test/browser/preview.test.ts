/**
 * `motional preview` in Debian's chromium: a two-part synthetic catalogue is previewed (in
 * process, startPreview), then files are saved on disk as an author would: a record's title, a
 * sweep file, a broken record, the fix. After each save the part page, reloaded, shows the
 * change; the broken record's page shows its located problem (file:line: message) and the fixed
 * one its part again. How fast the change shows is measured by the bench (scripts/bench), not
 * here: the waits below only bound a hung preview.
 */
import { copyFile, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Browser, type Page } from 'playwright-core';
import { launchChromium } from '../support/chromium.ts';
import { requireTool } from '../support/tools.ts';
import { startPreview, type Preview } from '../../src/pipeline/preview.ts';
import { syntheticPartId, writeSyntheticCatalogue } from '../../scripts/bench/lib/synthetic-catalogue.ts';

const haveChromium = requireTool('chromium');
/** Bound on a save showing up, ms: generous, a hung preview only (the speed target is in the bench). */
const WAIT_MS = 60_000;

describe.skipIf(!haveChromium)('motional preview in chromium', () => {
  let work: string;
  let content: string;
  let preview: Preview;
  let browser: Browser;
  let page: Page;
  const id = syntheticPartId(1);
  let yaml: string;

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), 'motional-preview-'));
    content = join(work, 'content');
    await writeSyntheticCatalogue(content, 2, { points: 121, samples: 1 });
    yaml = join(content, 'parts', id, 'part.yaml');
    preview = await startPreview({
      contentDir: content,
      outDir: join(work, 'preview', 'site'),
      cacheDir: join(work, 'cache'),
      port: 0,
      base: '/pv/',
    });
    browser = await launchChromium();
    page = await browser.newPage();
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
    await preview?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  /** Reload the part page until its text passes `check`. */
  async function pageShows(check: (text: string) => boolean): Promise<string> {
    const end = Date.now() + WAIT_MS;
    for (;;) {
      const response = await page.goto(`${preview.url}parts/${id}/`);
      const text = response?.status() === 200 ? await page.locator('body').innerText() : '';
      if (check(text)) return text;
      if (Date.now() > end) throw new Error(`the page never showed the change; it reads:\n${text.slice(0, 2000)}`);
      await new Promise((r) => setTimeout(r, 200));
    }
  }

  it('serves the catalogue and the part pages', async () => {
    const home = await page.goto(preview.url);
    expect(home?.status()).toBe(200);
    expect(await page.locator('body').innerText()).toContain(id);
    await pageShows((t) => t.includes('synthetic crystal 1'));
  });

  it('shows a new title after the record is saved', async () => {
    await writeFile(yaml, (await readFile(yaml, 'utf8')).replace(/^title: .*$/m, 'title: renamed while previewing'));
    await pageShows((t) => t.includes('renamed while previewing'));
  });

  it('shows new numbers after a sweep file is saved', async () => {
    const before = await page.locator('#summary-table').innerText();
    // the second part's sweep has another model: the extracted values change
    await copyFile(
      join(content, 'parts', syntheticPartId(2), 'a1-narrow.s1p'),
      join(content, 'parts', id, 'a1-narrow.s1p'),
    );
    const after = await pageShows((t) => t.includes('renamed while previewing') && !t.includes(before));
    expect(after).not.toContain(before);
  });

  it("shows a broken record's located problem on its page, and the part again once fixed", async () => {
    const good = await readFile(yaml, 'utf8');
    const line = good.split('\n').findIndex((l) => l.startsWith('kind:')) + 1;
    await writeFile(yaml, good.replace(/^kind: .*$/m, 'kind: no-such-kind'));
    const text = await pageShows((t) => t.includes('the record has problems'));
    expect(text).toContain(`part.yaml:${line}:`);
    expect(text).toMatch(/kind/);
    // the other part is still published
    expect((await page.goto(`${preview.url}parts/${syntheticPartId(2)}/`))?.status()).toBe(200);
    await writeFile(yaml, good);
    await pageShows((t) => t.includes('renamed while previewing') && !t.includes('the record has problems'));
  });
});
