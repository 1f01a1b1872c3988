/**
 * Browser tests of the built catalogue site: Debian's chromium driven by playwright-core against
 * the site served on 127.0.0.1 under a base path. The site is built once with the real command
 * (`motional build --content content`) when the demo content and the pipeline are present,
 * else from the synthetic fixture catalogue (test/site/fixture.ts) with the real emitter.
 * Expected values come from the command line (`extract --json`, `netlist`, `advise`) when the
 * real build ran, else from the same library calls the command line makes.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Browser, type BrowserContext, type Page } from 'playwright-core';
import { launchChromium } from '../support/chromium.ts';
import { requireTool } from '../support/tools.ts';
import { startStaticServer, type TestServer } from '../support/static-server.ts';
import { buildTestSite, ROOT } from './build-site.ts';
import type { CompareData, IndexEntry } from '../../src/site/types.ts';
import { advisePierce } from '../../src/lib/osc/pierce.ts';
import { sampleNetlist } from '../../src/lib/report/downloads.ts';
import { DEMO_CIRCUIT, fixtureCatalogue, makeFixturePart } from '../site/fixture.ts';

const ARTIFACTS = join(ROOT, 'test-artifacts');
const BASE = '/cat/';
const haveChromium = requireTool('chromium');

function cli(args: string[]): string {
  return execFileSync(
    process.execPath,
    [join(ROOT, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(ROOT, 'scripts', 'motional.ts'), ...args],
    { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 << 20 },
  );
}

/** Parse engineering text such as "15.9154943 MHz" or "20 Ω" into [value, relative half-step of its last digit]. */
function parseDisplayed(text: string): [number, number] {
  const m = /^([+−-]?[\d.]+)\s*([TGMkmµnpfa]?)/.exec(text.trim());
  if (!m) throw new Error(`not a number: ${text}`);
  const mult: Record<string, number> = {
    T: 1e12,
    G: 1e9,
    M: 1e6,
    k: 1e3,
    '': 1,
    m: 1e-3,
    µ: 1e-6,
    n: 1e-9,
    p: 1e-12,
    f: 1e-15,
    a: 1e-18,
  };
  const digits = m[1].replace(/^[+−-]/, '');
  const decimals = digits.includes('.') ? digits.split('.')[1].length : 0;
  const v = Number(m[1].replace('−', '-')) * mult[m[2]];
  return [v, (0.5 * 10 ** -decimals * mult[m[2]]) / Math.abs(v)];
}

describe.skipIf(!haveChromium)('catalogue site in chromium', () => {
  let work: string;
  let site: string;
  let server: TestServer;
  let browser: Browser;
  let real = false;
  let index: IndexEntry[];
  const external: string[] = [];
  const consoleErrors: string[] = [];

  async function newPage(ctx?: BrowserContext): Promise<Page> {
    const page = await (ctx ?? browser).newPage({ viewport: { width: 1280, height: 900 } });
    await page.route('**/*', (route) => {
      const url = new URL(route.request().url());
      if (url.hostname !== '127.0.0.1' && url.protocol !== 'data:') {
        external.push(url.href);
        return route.abort();
      }
      return route.continue();
    });
    page.on('console', (m) => {
      if (m.type() === 'error' || /Content Security Policy/i.test(m.text()))
        consoleErrors.push(`${page.url()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => consoleErrors.push(`${page.url()}: ${e.message}`));
    return page;
  }

  beforeAll(async () => {
    ({ work, site, real } = await buildTestSite(BASE));
    index = JSON.parse(readFileSync(join(site, 'data', 'index.json'), 'utf8'));
    server = await startStaticServer(site, BASE);
    browser = await launchChromium();
    mkdirSync(ARTIFACTS, { recursive: true });
  });

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    if (work && !process.env.MOTIONAL_KEEP_SITE) rmSync(work, { recursive: true, force: true });
  });

  it('every page is static HTML without inline scripts or styles, and part pages stay under 250 KB', () => {
    const pages: string[] = [];
    const walk = (d: string) =>
      readdirSync(d).forEach((n) => {
        const p = join(d, n);
        if (statSync(p).isDirectory()) walk(p);
        else if (n.endsWith('.html')) pages.push(p);
      });
    walk(site);
    expect(pages.length).toBeGreaterThanOrEqual(index.length + 2);
    for (const p of pages) {
      const html = readFileSync(p, 'utf8');
      expect(html, p).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
      expect(html, p).not.toMatch(/<style[\s>]/);
      expect(html, p).not.toMatch(/\sstyle="/);
      expect(html, p).not.toMatch(/\son[a-z]+="/);
      expect(html, p).toContain("script-src 'self'");
    }
    const sizes = index.map((e) => statSync(join(site, 'parts', e.id, 'index.html')).size);
    console.log(
      `part page sizes (bytes): min ${Math.min(...sizes)}, max ${Math.max(...sizes)}, mean ${Math.round(sizes.reduce((a, b) => a + b, 0) / sizes.length)}; catalogue ${statSync(join(site, 'index.html')).size}`,
    );
    for (const s of sizes) expect(s).toBeLessThanOrEqual(250_000);
  });

  it('search narrows the list and the URL reproduces it', async () => {
    const page = await newPage();
    await page.goto(server.url);
    await page.waitForSelector('body[data-ready="true"]');
    const all = await page.locator('#catalogue-table tbody tr:not([hidden])').count();
    expect(all).toBe(index.length);
    const target = index.find((e) => e.kind === 'quartz-tuning-fork') ?? index[index.length - 1];
    await page.fill('#f-q', target.id);
    const visible = await page
      .locator('#catalogue-table tbody tr:not([hidden])')
      .evaluateAll((rows) => rows.map((r) => (r as HTMLElement).dataset.id));
    expect(visible.length).toBeLessThan(all);
    expect(visible).toContain(target.id);
    expect(await page.textContent('#result-count')).toContain(`${visible.length} of ${index.length}`);
    const url = page.url();
    expect(new URL(url).searchParams.get('q')).toBe(target.id);
    await page.screenshot({ path: join(ARTIFACTS, 'catalogue-search.png'), fullPage: true });
    const again = await newPage();
    await again.goto(url);
    await again.waitForSelector('body[data-ready="true"]');
    expect(await again.inputValue('#f-q')).toBe(target.id);
    const visible2 = await again
      .locator('#catalogue-table tbody tr:not([hidden])')
      .evaluateAll((rows) => rows.map((r) => (r as HTMLElement).dataset.id));
    expect(visible2).toEqual(visible);
    await page.close();
    await again.close();
  });

  it('a frequency range and an ESR limit give exactly the parts the index says', async () => {
    const page = await newPage();
    await page.goto(server.url);
    await page.waitForSelector('body[data-ready="true"]');
    // Pick a frequency window around a 12 MHz-class part, or the first part.
    const pivot = index.find((e) => e.fsHz && e.fsHz > 11.5e6 && e.fsHz < 12.5e6) ?? index.find((e) => e.fsHz)!;
    const lo = pivot.fsHz! * 0.99;
    const hi = pivot.fsHz! * 1.01;
    const esr = Math.ceil(pivot.r1Ohm! * 1.2);
    const text = `${(lo / 1e6).toFixed(4)}M–${(hi / 1e6).toFixed(4)}M`;
    await page.fill('#f-f', text);
    await page.fill('#f-esr', `${esr} ohm`);
    const loR = Number((lo / 1e6).toFixed(4)) * 1e6;
    const hiR = Number((hi / 1e6).toFixed(4)) * 1e6;
    const expected = index
      .filter((e) => e.fsHz !== undefined && e.fsHz >= loR && e.fsHz <= hiR && e.r1Ohm !== undefined && e.r1Ohm <= esr)
      .map((e) => e.id)
      .sort();
    const visible = (
      await page
        .locator('#catalogue-table tbody tr:not([hidden])')
        .evaluateAll((rows) => rows.map((r) => (r as HTMLElement).dataset.id as string))
    ).sort();
    expect(expected.length).toBeGreaterThan(0);
    expect(visible).toEqual(expected);
    // Sorting by R1 descending through the header button keeps the same set, in order.
    await page.click('button.sort[data-key="r1Ohm"]');
    await page.click('button.sort[data-key="r1Ohm"]');
    expect(await page.getAttribute('th[data-key="r1Ohm"]', 'aria-sort')).toBe('descending');
    const sorted = await page
      .locator('#catalogue-table tbody tr:not([hidden])')
      .evaluateAll((rows) => rows.map((r) => (r as HTMLElement).dataset.id as string));
    const r1 = new Map(index.map((e) => [e.id, e.r1Ohm ?? 0]));
    expect(sorted.map((id) => r1.get(id)!)).toEqual([...sorted.map((id) => r1.get(id)!)].sort((a, b) => b - a));
    expect(new URL(page.url()).searchParams.get('f')).toBe(text);
    await page.screenshot({ path: join(ARTIFACTS, 'catalogue.png'), fullPage: true });
    await page.close();
  });

  it('a part page shows the same fs, R1, C1 and C0 as extract --json, and plots with labelled axes', async () => {
    const entry = index.find((e) => e.samples > 1) ?? index[0];
    const page = await newPage();
    await page.goto(`${server.url}parts/${entry.id}/`);
    let expected: { fsHz: number; r1Ohm: number; c1F: number; c0F: number };
    if (real) {
      const json = JSON.parse(cli(['extract', join('content', 'parts', entry.id), '--json']));
      const data: CompareData = JSON.parse(readFileSync(join(site, 'data', 'compare', `${entry.id}.json`), 'utf8'));
      const s0 = json.samples.find((s: { modes: unknown[] }) => s.modes.length > 0);
      const m = s0.modes.find((x: { fsHz: number }) => x.fsHz === data.summary.fsHz) ?? s0.modes[0];
      expected = { fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F, c0F: s0.c0F };
    } else {
      const spec = fixtureCatalogue().find((s) => s.id === entry.id)!;
      const b = spec.samples[0].branches[0];
      expected = { fsHz: b.fsHz, r1Ohm: b.r1Ohm, c1F: b.c1F, c0F: spec.samples[0].c0F };
    }
    const cells = await page
      .locator('#summary-table td[data-si]')
      .evaluateAll((tds) => tds.map((td) => [td.previousElementSibling?.textContent ?? '', td.textContent ?? '']));
    const shown = (label: string) => cells.find(([l]) => l.includes(label))![1];
    for (const [label, value] of [
      ['fs', expected.fsHz],
      ['R1', expected.r1Ohm],
      ['C1', expected.c1F],
      ['C0', expected.c0F],
    ] as const) {
      const [v, halfStep] = parseDisplayed(shown(label));
      expect(Math.abs(v / value - 1), `${label}: shown ${shown(label)}, extract ${value}`).toBeLessThanOrEqual(
        halfStep * 1.0000001,
      );
    }
    // Plots: SVG with a title, a description, and axis labels carrying units.
    const plots = page.locator('figure.plot svg.plot-svg');
    expect(await plots.count()).toBeGreaterThan(0);
    const labels = await page.locator('figure.plot .axis-label').allTextContents();
    expect(labels.some((l) => /Frequency \((M|k|)Hz\)/.test(l))).toBe(true);
    expect(labels.some((l) => /\|Z\| \(Ω\)/.test(l))).toBe(true);
    expect(labels.some((l) => /Phase \(°\)/.test(l))).toBe(true);
    expect(await page.locator('figure.plot desc').first().textContent()).toMatch(/fs/);
    // Hover read-out.
    const svg = plots.first();
    await svg.scrollIntoViewIfNeeded();
    const box = (await svg.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 3);
    expect(await page.locator('figure.plot output.readout').first().textContent()).toMatch(/Frequency .*Hz/);
    await page.screenshot({ path: join(ARTIFACTS, 'part.png'), fullPage: true });
    await page
      .locator('figure.plot')
      .first()
      .screenshot({ path: join(ARTIFACTS, 'part-plot.png') });
    await page.close();
  });

  it('the netlist link downloads exactly what the netlist command prints', async () => {
    const entry = index[0];
    const page = await newPage();
    await page.goto(`${server.url}parts/${entry.id}/`);
    const href = await page.getAttribute(`a[data-file="${entry.id}.cir"]`, 'href');
    expect(href).toBeTruthy();
    const downloaded = await page.evaluate(async (u) => (await fetch(u)).text(), href!);
    let printed: string;
    if (real) printed = cli(['netlist', join('content', 'parts', entry.id)]);
    else {
      const { part, result } = makeFixturePart(fixtureCatalogue().find((s) => s.id === entry.id)!);
      printed = sampleNetlist(part, result.samples[0]);
    }
    expect(downloaded).toBe(printed);
    expect(downloaded).toMatch(/^\.subckt /m);
    await page.close();
  });

  it('the calculator gives the same capacitors and offset as the advice code for the same circuit', async () => {
    const entry = index.find((e) => e.kind === 'quartz-at') ?? index[0];
    const page = await newPage();
    await page.goto(`${server.url}parts/${entry.id}/`);
    await page.waitForSelector('#calc-form[data-ready="true"]');
    const data = JSON.parse((await page.getAttribute('#calc-form', 'data-calc'))!);
    // Change the board stray and the target: the page must follow the library.
    await page.fill('#c-stray', '2.5');
    const target = data.datasheet?.frequencyHz ?? data.model.branches[data.mainBranch].fsHz;
    await page.fill('#c-target', String(target));
    const rows = await page
      .locator('#calc-table tr')
      .evaluateAll((trs) =>
        trs.map((tr) => [tr.querySelector('th')?.textContent ?? '', tr.querySelector('td')?.textContent ?? '']),
      );
    const got = Object.fromEntries(rows);
    const circuit = { ...data.circuits[0], boardStrayF: 2.5e-12 };
    const advice = advisePierce({
      partId: data.partId,
      datasheet: { ...(data.datasheet ?? {}), frequencyHz: target },
      model: data.model,
      mainBranch: data.mainBranch,
      circuit,
    });
    expect(advice.ok).toBe(true);
    if (!advice.ok) return;
    const pair = got['Closest pair (input / output)'];
    const [inF, outF] = pair
      .split('(')[0]
      .split('/')
      .map((t: string) => parseDisplayed(t)[0]);
    expect(inF / advice.best.inputCapF).toBeCloseTo(1, 6);
    expect(outF / advice.best.outputCapF).toBeCloseTo(1, 6);
    const offset = Number(got['Frequency offset'].replace('−', '-').replace(/[^\d.+-]/g, ''));
    expect(Math.abs(offset - advice.best.offsetPpm)).toBeLessThanOrEqual(0.0005);
    const margin = Number(got['Gain margin gm/gm,crit']);
    expect(margin / advice.best.gainMargin).toBeCloseTo(1, 2);
    if (real) {
      // The command line with the page's default circuit and the datasheet target.
      const out = cli(['advise', join('content', 'parts', entry.id), '--circuit', data.circuits[0].name, '--json']);
      const cliAdvice = JSON.parse(out);
      const first = Array.isArray(cliAdvice) ? cliAdvice[0] : (cliAdvice.advice?.[0] ?? cliAdvice);
      await page.fill('#c-stray', String(data.circuits[0].boardStrayF * 1e12));
      const rows2 = Object.fromEntries(
        await page
          .locator('#calc-table tr')
          .evaluateAll((trs) =>
            trs.map((tr) => [tr.querySelector('th')?.textContent ?? '', tr.querySelector('td')?.textContent ?? '']),
          ),
      );
      const off2 = Number(rows2['Frequency offset'].replace('−', '-').replace(/[^\d.+-]/g, ''));
      expect(Math.abs(off2 - first.best.offsetPpm)).toBeLessThanOrEqual(0.0005);
    } else {
      // The fixture build used DEMO_CIRCUIT: the page's default circuit is that one.
      expect(data.circuits[0].name).toBe(DEMO_CIRCUIT.name);
    }
    await page.locator('#calculator').screenshot({ path: join(ARTIFACTS, 'calculator.png') });
    await page.close();
  });

  it('the compare page overlays two parts and keeps them in the URL', async () => {
    const [a, b] = index.filter((e) => e.fsHz).slice(0, 2);
    const page = await newPage();
    await page.goto(`${server.url}compare/?parts=${a.id},${b.id}`);
    await page.waitForSelector('body[data-ready="true"]');
    const headers = await page.locator('#compare-table thead th a').allTextContents();
    expect(headers).toEqual([a.id, b.id]);
    const modePaths = page.locator('figure.plot path.s-c0, figure.plot path.s-c1');
    expect(await modePaths.count()).toBeGreaterThanOrEqual(4);
    expect(new URL(page.url()).searchParams.get('parts')).toBe(`${a.id},${b.id}`);
    expect(await page.locator('figure.plot .axis-label').allTextContents()).toContain('Offset from fs (ppm)');
    await page.screenshot({ path: join(ARTIFACTS, 'compare.png'), fullPage: true });
    await page.close();
  });

  it('part pages and the catalogue are readable with JavaScript off', async () => {
    const ctx = await browser.newContext({ javaScriptEnabled: false });
    const page = await newPage(ctx);
    await page.goto(server.url);
    expect(await page.locator('#catalogue-table tbody tr').count()).toBe(index.length);
    await page.goto(`${server.url}parts/${index[0].id}/`);
    expect(await page.locator('figure.plot svg path').count()).toBeGreaterThan(0);
    expect(await page.locator('#summary-table').textContent()).toMatch(/Hz/);
    await ctx.close();
  });

  it('no request left 127.0.0.1 and the console stayed clean (no CSP violations)', () => {
    if (process.env.MOTIONAL_KEEP_SITE)
      console.log(
        site,
        server.requests.filter((r) => r.status >= 400),
      );
    expect(external).toEqual([]);
    expect(consoleErrors).toEqual([]);
    expect(server.requests.filter((r) => r.status >= 400)).toEqual([]);
  });
  // Runs after the check above: its own 404 is deliberate.
  it("an unknown address answers with the site's own 404 page, status 404", async () => {
    expect(existsSync(join(site, '404.html'))).toBe(true);
    const res = await fetch(`${server.url}parts/no-such-part/`);
    expect(res.status).toBe(404);
    const html = await res.text();
    expect(html).toContain('Page not found');
    expect(html).toContain(`href="${BASE}"`);
  });
});
