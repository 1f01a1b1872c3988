/**
 * Benchmark of the built site with a large catalogue (issue 6).
 *
 * The demo catalogue (content/) is built once, data only; its parts are then cloned under new
 * invented ids until the catalogue holds N parts (3,000; quick: 300), and the Astro site is
 * built from that data. Measured:
 *
 * - the catalogue page's transfer: every response Chromium loads for `index.html` (the page,
 *   its JS and CSS, data/index.json, anything else it fetches), bytes raw and gzip (node:zlib);
 * - keystroke → updated results in Chromium: time from the search box's `keydown` to the
 *   result count being rewritten (performance.now() in the page), median and 90th percentile
 *   over about 20 keystrokes; also to the next animation frame after the update;
 *   the same again with a circuit chosen in "fits circuit" (its columns filled on every update);
 * - the part pages' size: each page's HTML (inline SVG plots included) plus the CSS, JS and
 *   images it links, uncompressed; median and max over all part pages.
 *
 * Targets: keystroke → results ≤ 50 ms; part page ≤ 250 KB (1 KB = 1,000 bytes) uncompressed.
 *
 * Run alone: `npx tsx scripts/bench/site.ts [--quick] [--parts N] [--keep]`
 */
import { cp, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, posix } from 'node:path';
import { pathToFileURL } from 'node:url';
import { gzipSync } from 'node:zlib';
import { chromium, type Page } from 'playwright-core';
import { buildCatalogue, PROJECT_ROOT, runAstroBuild } from '../../src/pipeline/build-catalogue.ts';
import { startStaticServer } from '../../src/pipeline/static-server.ts';

export interface BenchSiteOptions {
  /** 300 parts instead of 3,000. */
  quick?: boolean;
  /** Catalogue size in parts (overrides quick). */
  parts?: number;
  /** Keep the temporary data and site (the folder is printed). */
  keep?: boolean;
}

export interface BenchSiteResult {
  parts: number;
  /** Seconds of the Astro build of the N-part site. */
  astroSeconds: number;
  /** Catalogue page transfer, bytes: everything Chromium loaded for it. */
  catalogueBytes: number;
  catalogueGzipBytes: number;
  /** The same split by kind (html, js, css, json, other): raw and gzip bytes. */
  catalogueBreakdown: Record<string, { raw: number; gzip: number; files: number }>;
  /** Keystroke → result count rewritten, ms. */
  keystrokeMedianMs: number;
  keystrokeP90Ms: number;
  keystrokeMaxMs: number;
  /** Keystroke → next animation frame after the update, ms (closer to what the eye sees). */
  keystrokeFrameMedianMs: number;
  keystrokes: number;
  /** The same with a circuit chosen (the "fits circuit" columns filled on every update), ms; NaN without circuits. */
  keystrokeCircuitMedianMs: number;
  keystrokeCircuitP90Ms: number;
  /** Part page, bytes uncompressed: HTML (plots inline) plus linked CSS, JS and images. */
  partPageMedianBytes: number;
  partPageMaxBytes: number;
  /** HTML alone, bytes. */
  partPageHtmlMedianBytes: number;
  partPageHtmlMaxBytes: number;
  partPages: number;
  targets: { keystrokeUnder50ms: boolean; keystrokeWithCircuitUnder50ms: boolean; partPageUnder250KB: boolean };
}

const CHROMIUM = '/usr/bin/chromium';
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

interface IndexRow {
  id: string;
  title: string;
  fsHz: number;
  r1Ohm: number;
  [k: string]: unknown;
}

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (pos - lo);
}

/** Replace every JSON string equal to `from` by `to` (ids appear as whole strings). */
function renameId(value: unknown, from: string, to: string): unknown {
  if (typeof value === 'string') return value === from ? to : value;
  if (Array.isArray(value)) return value.map((v) => renameId(v, from, to));
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = renameId(v, from, to);
    return out;
  }
  return value;
}

/**
 * Data folder of `parts` parts: the demo data plus clones with invented ids (`<id>-c<k>`),
 * slightly moved in frequency and ESR so sorting and filters see distinct values. Clones have
 * no downloads of their own (their links point nowhere; sizes are not affected).
 */
async function cloneCatalogue(demoDir: string, dataDir: string, parts: number): Promise<number> {
  const index = JSON.parse(await readFile(join(demoDir, 'index.json'), 'utf8')) as IndexRow[];
  await mkdir(join(dataDir, 'parts'), { recursive: true });
  await mkdir(join(dataDir, 'compare'), { recursive: true });
  await cp(join(demoDir, 'downloads'), join(dataDir, 'downloads'), { recursive: true });
  const partText = new Map<string, unknown>();
  const compareText = new Map<string, unknown>();
  for (const e of index) {
    partText.set(e.id, JSON.parse(await readFile(join(demoDir, 'parts', `${e.id}.json`), 'utf8')));
    const cmp = await readFile(join(demoDir, 'compare', `${e.id}.json`), 'utf8').catch(() => undefined);
    if (cmp !== undefined) compareText.set(e.id, JSON.parse(cmp));
  }
  const big: IndexRow[] = [];
  const writes: Promise<void>[] = [];
  for (let n = 0; n < parts; n++) {
    const k = Math.floor(n / index.length);
    const e = index[n % index.length];
    const id = k === 0 ? e.id : `${e.id}-c${k}`;
    const title = k === 0 ? e.title : `${e.title} (copy ${k})`;
    const part = renameId(partText.get(e.id), e.id, id) as Record<string, unknown>;
    if (k > 0 && typeof part.title === 'string') part.title = title;
    writes.push(writeFile(join(dataDir, 'parts', `${id}.json`), JSON.stringify(part)));
    const cmp = compareText.get(e.id);
    if (cmp !== undefined)
      writes.push(writeFile(join(dataDir, 'compare', `${id}.json`), JSON.stringify(renameId(cmp, e.id, id))));
    const spread = k === 0 ? 1 : 1 + ((k % 41) - 20) * 1e-5;
    big.push({ ...e, id, title, fsHz: e.fsHz * spread, r1Ohm: e.r1Ohm * (1 + (k % 17) / 50) });
    if (writes.length >= 64) await Promise.all(writes.splice(0));
  }
  await Promise.all(writes);
  big.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  await writeFile(join(dataDir, 'index.json'), JSON.stringify(big));
  return big.length;
}

function kindOf(url: string, contentType: string): string {
  if (contentType.includes('html')) return 'html';
  if (contentType.includes('javascript') || /\.m?js(\?|$)/.test(url)) return 'js';
  if (contentType.includes('css')) return 'css';
  if (contentType.includes('json')) return 'json';
  return 'other';
}

/** Local assets a part page links: stylesheets, scripts, module preloads, images. */
function linkedAssets(html: string): string[] {
  const refs = new Set<string>();
  for (const m of html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"/g)) refs.add(m[1]);
  for (const m of html.matchAll(/<link\b[^>]*>/g)) {
    const tag = m[0];
    if (!/rel="(stylesheet|modulepreload|icon)"/.test(tag)) continue;
    const href = /href="([^"]+)"/.exec(tag);
    if (href) refs.add(href[1]);
  }
  for (const m of html.matchAll(/<img\b[^>]*\bsrc="([^"]+)"/g)) refs.add(m[1]);
  return [...refs].filter((r) => !/^[a-z]+:/i.test(r) && !r.startsWith('//'));
}

/** Static imports inside a built JS module (Astro's chunks import each other). */
function jsImports(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/(?:\bfrom\s*|\bimport\s*)["']([^"']+\.js)["']/g)) out.push(m[1]);
  return out;
}

async function partPageSizes(siteDir: string): Promise<{ total: number[]; html: number[] }> {
  const partsDir = join(siteDir, 'parts');
  const assetSize = new Map<string, { bytes: number; deps: string[] }>();
  const asset = async (sitePath: string): Promise<{ bytes: number; deps: string[] }> => {
    const known = assetSize.get(sitePath);
    if (known) return known;
    const file = join(siteDir, sitePath);
    const text = await readFile(file).catch(() => undefined);
    const info = {
      bytes: text?.length ?? 0,
      deps:
        text && sitePath.endsWith('.js')
          ? jsImports(text.toString('utf8')).map((d) => posix.join(posix.dirname(sitePath), d))
          : [],
    };
    assetSize.set(sitePath, info);
    return info;
  };
  const total: number[] = [];
  const html: number[] = [];
  for (const dir of await readdir(partsDir, { withFileTypes: true })) {
    const page = dir.isDirectory()
      ? join(partsDir, dir.name, 'index.html')
      : dir.name.endsWith('.html')
        ? join(partsDir, dir.name)
        : undefined;
    if (!page) continue;
    const text = await readFile(page, 'utf8').catch(() => undefined);
    if (text === undefined) continue;
    const bytes = Buffer.byteLength(text);
    const pageDir = posix.dirname(`/${posix.relative(siteDir, page).split('\\').join('/')}`);
    const seen = new Set<string>();
    const queue = linkedAssets(text).map((r) => (r.startsWith('/') ? r : posix.join(pageDir, r)).split(/[?#]/)[0]);
    let sum = bytes;
    while (queue.length) {
      const p = queue.shift()!;
      if (seen.has(p)) continue;
      seen.add(p);
      const a = await asset(p);
      sum += a.bytes;
      queue.push(...a.deps);
    }
    html.push(bytes);
    total.push(sum);
  }
  return { total: total.sort((a, b) => a - b), html: html.sort((a, b) => a - b) };
}

/** Load the catalogue page, sum what it transfers, then time keystrokes in the search box. */
async function measureBrowser(siteDir: string, log: (t: string) => void) {
  const server = await startStaticServer({ root: siteDir, port: 0 });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: CHROMIUM_ARGS });
  try {
    const page = await browser.newPage();
    const bodies: Array<Promise<{ url: string; kind: string; raw: number; gzip: number } | undefined>> = [];
    page.on('response', (res) => {
      bodies.push(
        res.body().then(
          (b) => ({
            url: res.url(),
            kind: kindOf(res.url(), res.headers()['content-type'] ?? ''),
            raw: b.length,
            gzip: gzipSync(b, { level: 9 }).length,
          }),
          () => undefined,
        ),
      );
    });
    await page.goto(server.url, { waitUntil: 'load' });
    await page.waitForSelector('body[data-ready="true"]', { timeout: 60_000 });
    await page.waitForLoadState('networkidle');
    const loaded = (await Promise.all(bodies)).filter((b): b is NonNullable<typeof b> => !!b);
    page.removeAllListeners('response');
    const breakdown: Record<string, { raw: number; gzip: number; files: number }> = {};
    for (const b of loaded) {
      const k = (breakdown[b.kind] ??= { raw: 0, gzip: 0, files: 0 });
      k.raw += b.raw;
      k.gzip += b.gzip;
      k.files += 1;
    }
    const catalogueBytes = loaded.reduce((s, b) => s + b.raw, 0);
    const catalogueGzipBytes = loaded.reduce((s, b) => s + b.gzip, 0);
    log(`catalogue page: ${loaded.length} responses, ${catalogueBytes} B (gzip ${catalogueGzipBytes} B)\n`);

    await page.click('#f-q');
    // Typing then deleting: every press changes the query, so every press rewrites the count.
    const keys = [...'crystal', ...Array(7).fill('Backspace'), ...'3225', ...Array(4).fill('Backspace'), ...'xt-1'];
    const typed = await typeAndTime(page, keys);
    // Again with a circuit chosen (issue 13): the fit columns are filled on every update.
    const circuits = await page
      .locator('#f-circuit option')
      .evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value).filter((v) => v));
    let withCircuit = { times: [] as number[], frames: [] as number[] };
    if (circuits.length) {
      await page.fill('#f-q', '');
      await page.selectOption('#f-circuit', circuits.includes('sensor-hub-pierce') ? 'sensor-hub-pierce' : circuits[0]);
      await page.click('#f-q');
      withCircuit = await typeAndTime(page, keys);
    }
    return {
      catalogueBytes,
      catalogueGzipBytes,
      breakdown,
      times: typed.times,
      frames: typed.frames,
      circuitTimes: withCircuit.times,
    };
  } finally {
    await browser.close();
    await server.close();
  }
}

/** Press each key in the focused search box; time keydown → result count rewritten (and → next frame). */
async function typeAndTime(page: Page, keys: string[]): Promise<{ times: number[]; frames: number[] }> {
  const times: number[] = [];
  const frames: number[] = [];
  for (const key of keys) {
    await page.evaluate(() => {
      const w = window as unknown as { __bench?: Promise<[number, number]> };
      const count = document.getElementById('result-count')!;
      w.__bench = new Promise<[number, number]>((done) => {
        let t0 = NaN;
        const timer = setTimeout(() => done([NaN, NaN]), 5000);
        window.addEventListener('keydown', () => (t0 = performance.now()), { once: true, capture: true });
        const obs = new MutationObserver(() => {
          const t1 = performance.now();
          obs.disconnect();
          requestAnimationFrame(() => {
            clearTimeout(timer);
            done([t1 - t0, performance.now() - t0]);
          });
        });
        obs.observe(count, { childList: true, characterData: true, subtree: true });
      });
    });
    await page.keyboard.press(key);
    const [ms, frame] = await page.evaluate(
      () => (window as unknown as { __bench: Promise<[number, number]> }).__bench,
    );
    if (Number.isFinite(ms)) {
      times.push(ms);
      frames.push(frame);
    }
    await page.waitForTimeout(120); // let the delayed chart update pass
  }
  times.sort((a, b) => a - b);
  frames.sort((a, b) => a - b);
  return { times, frames };
}

/** Run the site benchmark. */
export async function benchSite(options: BenchSiteOptions = {}): Promise<BenchSiteResult> {
  const parts = options.parts ?? (options.quick ? 300 : 3000);
  const log = (t: string) => void process.stderr.write(`bench site: ${t}`);
  const root = await mkdtemp(join(tmpdir(), `motional-site-${parts}-`));
  try {
    log(`building the demo catalogue data in ${root}\n`);
    const demoDir = join(root, 'demo');
    const summary = await buildCatalogue({
      contentDir: join(PROJECT_ROOT, 'content'),
      outDir: demoDir,
      dataOnly: true,
      progress: false,
      log: () => {},
    });
    if (summary.exitCode !== 0) throw new Error(`demo data build failed: ${summary.failure ?? 'unknown'}`);
    const dataDir = join(root, 'data');
    const n = await cloneCatalogue(demoDir, dataDir, parts);
    log(`${n} parts cloned from ${summary.partsPublished}; astro build\n`);
    const siteDir = join(root, 'site');
    const t0 = performance.now();
    await runAstroBuild({
      dataDir,
      siteDir,
      basePath: '/',
      pages: n,
      progress: undefined,
      log: (t) => process.stderr.write(t),
      signal: undefined,
    });
    const astroSeconds = (performance.now() - t0) / 1000;
    log(`astro build ${astroSeconds.toFixed(1)} s; part page sizes\n`);
    const sizes = await partPageSizes(siteDir);
    log(`${sizes.total.length} part pages; chromium\n`);
    const b = await measureBrowser(siteDir, log);
    const keystrokeMedianMs = quantile(b.times, 0.5);
    const partPageMaxBytes = sizes.total[sizes.total.length - 1] ?? NaN;
    return {
      parts: n,
      astroSeconds,
      catalogueBytes: b.catalogueBytes,
      catalogueGzipBytes: b.catalogueGzipBytes,
      catalogueBreakdown: b.breakdown,
      keystrokeMedianMs,
      keystrokeP90Ms: quantile(b.times, 0.9),
      keystrokeMaxMs: b.times[b.times.length - 1] ?? NaN,
      keystrokeFrameMedianMs: quantile(b.frames, 0.5),
      keystrokes: b.times.length,
      keystrokeCircuitMedianMs: quantile(b.circuitTimes, 0.5),
      keystrokeCircuitP90Ms: quantile(b.circuitTimes, 0.9),
      partPageMedianBytes: Math.round(quantile(sizes.total, 0.5)),
      partPageMaxBytes,
      partPageHtmlMedianBytes: Math.round(quantile(sizes.html, 0.5)),
      partPageHtmlMaxBytes: sizes.html[sizes.html.length - 1] ?? NaN,
      partPages: sizes.total.length,
      targets: {
        keystrokeUnder50ms: keystrokeMedianMs <= 50,
        keystrokeWithCircuitUnder50ms: !(quantile(b.circuitTimes, 0.5) > 50),
        partPageUnder250KB: partPageMaxBytes <= 250_000,
      },
    };
  } finally {
    if (options.keep) log(`kept ${root}\n`);
    else await rm(root, { recursive: true, force: true });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const argv = process.argv.slice(2);
  const i = argv.indexOf('--parts');
  const parts = i >= 0 ? Number(argv[i + 1]) : undefined;
  if (parts !== undefined && !(Number.isInteger(parts) && parts > 0))
    throw new Error(`--parts expects a whole number, got "${argv[i + 1]}"`);
  const result = await benchSite({ quick: argv.includes('--quick'), parts, keep: argv.includes('--keep') });
  process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
}
