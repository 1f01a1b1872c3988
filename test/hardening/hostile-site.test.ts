/**
 * Hostile text on the built site: a tiny catalogue of HOSTILE-1 (committed fixture), HOSTILE-2
 * (the same text plus file names with `"`, `<`, `>` and a folder named `<script>alert(8)<`,
 * written here because only POSIX file systems hold such names) and one ordinary synthetic part
 * is built with the real build (buildCatalogue, Astro stage included). Every page shows the
 * markup as text: no raw tag, event-handler attribute or javascript: link in any HTML file, and
 * in chromium no script runs (no dialog ever opens), nothing is even refused by the CSP (the
 * markup never becomes elements), and the CSP still blocks an inline handler injected on purpose.
 */
import { cpSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { type Browser, type Page } from 'playwright-core';
import { launchChromium } from '../support/chromium.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formatIssue } from '../../src/lib/issues.ts';
import { buildCatalogue } from '../../src/pipeline/build-catalogue.ts';
import { syntheticPartFiles } from '../../scripts/bench/lib/synthetic-catalogue.ts';
import { requireTool } from '../support/tools.ts';
import { startStaticServer, type TestServer } from '../support/static-server.ts';
import { HOSTILE, POSIX_NAMES, PORTABLE_NAMES, writeHostilePart } from '../fixtures/hostile/make.ts';
import { ROOT } from './fuzz-support.ts';

const BASE = '/cat/';

let work: string;
let site: string;
let built = false;
let buildLog = '';

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), 'motional-hostile-site-'));
  const content = join(work, 'content');
  cpSync(join(ROOT, 'test/fixtures/hostile/HOSTILE-1'), join(content, 'parts', 'HOSTILE-1'), { recursive: true });
  writeHostilePart(join(content, 'parts', 'HOSTILE-2'), 'HOSTILE-2', POSIX_NAMES);
  const good = join(content, 'parts', 'SYN-00001');
  mkdirSync(good, { recursive: true });
  for (const [name, text] of syntheticPartFiles(1, { points: 121, samples: 1 }))
    await writeFile(join(good, name), text);
  site = join(work, 'site');
  const summary = await buildCatalogue({
    contentDir: content,
    outDir: site,
    base: BASE,
    jobs: 1,
    cache: false,
    progress: false,
    log: (t) => void (buildLog += t),
  });
  buildLog += summary.issues.map(formatIssue).join('\n');
  built = summary.exitCode === 0;
  if (!built) throw new Error(`build failed: ${summary.failure}\n${buildLog}`);
  expect(summary.partsPublished).toBe(3);
}, 240_000);

afterAll(() => {
  if (work) rmSync(work, { recursive: true, force: true });
});

function filesUnder(dir: string, pattern: RegExp): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const n of readdirSync(d)) {
      const p = join(d, n);
      if (statSync(p).isDirectory()) walk(p);
      else if (pattern.test(n)) out.push(p);
    }
  };
  walk(dir);
  return out.sort();
}

/** Start tags of an HTML text, with their attributes (quoted values may hold any text but their quote). */
function startTags(html: string): Array<{ name: string; attrs: Array<[string, string]>; text: string }> {
  const out: Array<{ name: string; attrs: Array<[string, string]>; text: string }> = [];
  const tag = /<([a-zA-Z][a-zA-Z0-9-]*)((?:\s+[^\s"'>/=]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s"'=<>`]+))?)*)\s*\/?>/g;
  const attr = /([^\s"'>/=]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'=<>`]+)))?/g;
  const decode = (v: string) =>
    v
      .replace(/&#(\d+);/g, (_, d) => String.fromCharCode(Number(d)))
      .replace(/&#x([0-9a-f]+);/gi, (_, h) => String.fromCharCode(parseInt(h, 16)))
      .replace(/&quot;/g, '"')
      .replace(/&lt;/g, '<')
      .replace(/&gt;/g, '>')
      .replace(/&amp;/g, '&');
  for (const m of html.matchAll(tag)) {
    const attrs = [...m[2].matchAll(attr)].map(
      (a) => [a[1].toLowerCase(), decode(a[2] ?? a[3] ?? a[4] ?? '')] as [string, string],
    );
    out.push({ name: m[1].toLowerCase(), attrs, text: m[0] });
  }
  return out;
}

/** A start tag the hostile text would create if it were not escaped, or undefined. */
function injected(t: ReturnType<typeof startTags>[number]): string | undefined {
  if (t.name === 'script' && !t.attrs.some(([n]) => n === 'src')) return 'inline script';
  if (['iframe', 'object', 'embed', 'svg'].includes(t.name) && t.attrs.some(([n]) => n.startsWith('on')))
    return 'element with a handler';
  if (['iframe', 'object', 'embed', 'base'].includes(t.name)) return `<${t.name}> element`;
  for (const [n, v] of t.attrs) {
    if (n.startsWith('on')) return `event-handler attribute ${n}`;
    if (
      ['href', 'src', 'action', 'formaction', 'xlink:href'].includes(n) &&
      /^\s*(javascript|vbscript|data:text\/html)/i.test(v)
    )
      return `${n}=${v.slice(0, 30)}`;
  }
  if (t.name === 'img' && t.attrs.some(([n, v]) => n === 'src' && v === 'x')) return 'injected <img src=x>';
  return undefined;
}

describe('hostile text in the built site files', () => {
  it('(the markup check itself finds unescaped payloads and passes escaped or attribute-quoted ones)', () => {
    const flagged = (html: string) => startTags(html).map(injected).filter(Boolean);
    expect(flagged('<p>"><img src=x onerror=alert(1)></p>')).toEqual(['event-handler attribute onerror']);
    expect(flagged('<script>alert(1)</script>')).toEqual(['inline script']);
    expect(flagged('<a href="javascript:alert(1)">x</a>')).toEqual(['href=javascript:alert(1)']);
    expect(flagged('<a href="&#106;avascript:alert(1)">x</a>')).toHaveLength(1);
    expect(
      flagged(
        '<p>&lt;img src=x onerror=alert(1)&gt;</p><meta content="<script>alert(1)</script>"><script type="module" src="/a.js"></script>',
      ),
    ).toEqual([]);
  });

  it('appears in no HTML file as markup, only as escaped text', () => {
    const pages = filesUnder(site, /\.html$/);
    expect(pages.length).toBeGreaterThanOrEqual(5);
    for (const p of pages) {
      const html = readFileSync(p, 'utf8');
      const bad = startTags(html)
        .map((t) => [injected(t), t.text.slice(0, 120)])
        .filter(([why]) => why);
      expect(bad, relative(site, p)).toEqual([]);
      expect(html, relative(site, p)).toContain("script-src 'self'");
      expect(html).not.toContain('unsafe-inline');
    }
    const part = readFileSync(join(site, 'parts', 'HOSTILE-1', 'index.html'), 'utf8');
    expect(part).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(part).toMatch(/&quot;&gt;&lt;img src(=|&#61;)x onerror(=|&#61;)alert\(1\)&gt;/);
    expect(part).toMatch(/<title>HOSTILE-1 — &lt;script&gt;alert\(1\)&lt;\/script&gt;/);
  });

  it('keeps every JSON file valid, with the text as data', () => {
    for (const f of filesUnder(site, /\.json$/)) {
      const text = readFileSync(f, 'utf8');
      expect(() => JSON.parse(text), relative(site, f)).not.toThrow();
    }
    const index = JSON.parse(readFileSync(join(site, 'data', 'index.json'), 'utf8')) as Array<{
      id: string;
      title: string;
    }>;
    expect(index.map((e) => e.id).sort()).toEqual(['HOSTILE-1', 'HOSTILE-2', 'SYN-00001']);
    expect(index.find((e) => e.id === 'HOSTILE-1')!.title).toBe(HOSTILE.title);
  });

  it('serves the raw sweeps under their own names, including the POSIX-only ones', () => {
    for (const [id, names] of [
      ['HOSTILE-1', PORTABLE_NAMES],
      ['HOSTILE-2', POSIX_NAMES],
    ] as const) {
      for (const n of Object.values(names)) expect(statSync(join(site, 'downloads', id, 'raw', n)).isFile()).toBe(true);
    }
  });
});

const haveChromium = requireTool('chromium');

describe.skipIf(!haveChromium)('hostile part pages in chromium', () => {
  let server: TestServer;
  let browser: Browser;
  const dialogs: string[] = [];
  const cspMessages: string[] = [];
  const pageErrors: string[] = [];

  beforeAll(async () => {
    server = await startStaticServer(site, BASE);
    browser = await launchChromium();
  }, 60_000);
  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  async function open(path: string): Promise<Page> {
    const page = await browser.newPage();
    page.on('dialog', (d) => {
      dialogs.push(`${path}: ${d.type()} ${d.message()}`);
      void d.dismiss();
    });
    page.on('console', (m) => {
      if (/Content Security Policy|Refused to (execute|load|apply)/i.test(m.text()))
        cspMessages.push(`${path}: ${m.text()}`);
    });
    page.on('pageerror', (e) => pageErrors.push(`${path}: ${e.message}`));
    await page.goto(`${server.url}${path}`);
    await page.waitForLoadState('load');
    return page;
  }

  /** Elements and attributes the injected markup would create if it were not text. */
  const injectedElements = (page: Page) =>
    page.evaluate(
      () =>
        document.querySelectorAll(
          'script:not([src]), img[src="x"], svg[onload], [onerror], [onload], [onmouseover], a[href^="javascript:" i], a[href^="data:" i], iframe, object, embed',
        ).length,
    );

  it.each(['parts/HOSTILE-1/', 'parts/HOSTILE-2/'])(
    '%s shows the title, supplier and notes as text and runs no injected script',
    async (path) => {
      const page = await open(path);
      expect(await injectedElements(page)).toBe(0);
      expect(await page.locator('h1 .part-title').textContent()).toBe(HOSTILE.title);
      expect(await page.locator('.notes').textContent()).toContain('<script>alert(1)</script>');
      expect(await page.textContent('body')).toContain(HOSTILE.supplier);
      // the download links of the raw sweeps lead to the files (names percent-encoded, not markup)
      const hrefs = await page
        .locator('#downloads a[href*="/raw/"]')
        .evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).href));
      expect(hrefs.length).toBe(3);
      for (const h of hrefs) expect((await page.request.get(h)).status()).toBe(200);
      await page.close();
    },
  );

  it('the catalogue, its search and the compare page show the hostile parts as text', async () => {
    const page = await open('');
    await page.waitForSelector('body[data-ready="true"]');
    await page.fill('#f-q', 'script');
    expect(await page.locator('#catalogue-table tbody tr:not([hidden])').count()).toBeGreaterThanOrEqual(1);
    await page.fill('#f-q', '<img src=x onerror=alert(1)>');
    expect(await injectedElements(page)).toBe(0);
    await page.close();
    const compare = await open('compare/?parts=HOSTILE-1,HOSTILE-2');
    await compare.waitForSelector('body[data-ready="true"]');
    expect(await injectedElements(compare)).toBe(0);
    await compare.close();
  });

  it('no dialog opened, no page error, and the CSP never had to refuse anything from the pages', () => {
    expect(dialogs).toEqual([]);
    expect(pageErrors).toEqual([]);
    expect(cspMessages).toEqual([]);
  });

  it('the CSP itself blocks an inline event handler injected into a part page', async () => {
    const page = await open('parts/HOSTILE-1/');
    const before = dialogs.length;
    const violated = await page.evaluate(
      () =>
        new Promise<string>((done) => {
          document.addEventListener('securitypolicyviolation', (e) => done(`${e.violatedDirective} ${e.blockedURI}`), {
            once: true,
          });
          const div = document.createElement('div');
          div.innerHTML = '<img src="no-such-image.png" onerror="alert(99)">';
          document.body.append(div);
          setTimeout(() => done('no violation'), 5000);
        }),
    );
    expect(violated).toMatch(/^script-src/);
    await page.waitForTimeout(200);
    expect(dialogs.length).toBe(before);
    cspMessages.length = 0; // this page's refusal was provoked on purpose
    await page.close();
  });
});
