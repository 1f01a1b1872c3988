// Worker thread of page-renderer.ts (plain JavaScript: it loads no TypeScript, so it starts in
// a fraction of a second). It renders the site's pages from the server chunks an earlier Astro
// build of the same site code left behind, with Astro's container API, and writes each page where
// `astro build` (build.format 'directory') puts it.
//
// workerData: { rendererDir, mode: 'render' | 'probe', patch? }
// - 'probe': render the first and last path of every route and return their HTML (the caller
//   compares them with the pages Astro built and learns the head patch);
// - 'render': load the page modules at once, then wait for one message { outDir, env } and
//   render every path of every route (a dynamic route's paths come from its own getStaticPaths,
//   which reads the build's page list) and write it, patched. So the thread can be started
//   early and be ready when the build knows which pages to render.
// The environment (MOTIONAL_DATA, MOTIONAL_BASE, MOTIONAL_PAGES) is the caller's choice.
import { mkdir, readdir, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { parentPort, workerData } from 'node:worker_threads';
import { experimental_AstroContainer } from 'astro/container';

/** Page modules of the kept server chunks: `pages/**\/*.astro.mjs`. */
async function pageModules(dir) {
  const out = [];
  const walk = async (d) => {
    for (const e of (await readdir(d, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const p = join(d, e.name);
      if (e.isDirectory()) await walk(p);
      else if (e.name.endsWith('.astro.mjs')) out.push(p);
    }
  };
  await walk(join(dir, 'pages'));
  return out;
}

/** Site path of a route url with its params filled in, e.g. `/parts/[id]` → `/parts/XO-1`. */
function fill(url, params) {
  return url.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, (_, name) => {
    const v = params?.[name];
    if (v === undefined) throw new Error(`route ${url}: no value for [${name}]`);
    return String(v);
  });
}

/** Output file of a site path in build.format 'directory'. */
function fileOf(path) {
  const p = path.replace(/^\/+|\/+$/g, '');
  if (p === '') return 'index.html';
  if (p === '404' || p === '500') return `${p}.html`;
  return `${p}/index.html`;
}

async function main() {
  const { rendererDir, mode, patch } = workerData;
  const container = await experimental_AstroContainer.create();
  const pages = [];
  for (const file of await pageModules(rendererDir)) {
    const mod = await import(pathToFileURL(file).href);
    const page = await mod.page();
    if (typeof page.url !== 'string' || !page.default) throw new Error(`${file}: not a page module`);
    pages.push(page);
  }
  if (mode === 'probe') return render(container, pages, mode, patch, undefined);
  const job = await new Promise((resolve) => parentPort.once('message', resolve));
  Object.assign(process.env, job.env);
  return render(container, pages, mode, patch, job.outDir);
}

async function render(container, pages, mode, patch, outDir) {
  const base = process.env.MOTIONAL_BASE || '/';
  const origin = 'http://localhost';
  const written = [];
  const probes = [];
  const prefix = base.replace(/\/+$/, '');
  for (const page of pages) {
    const url = page.url;
    // a page module's url carries the base path it was built for
    const route = prefix && (url === prefix || url.startsWith(`${prefix}/`)) ? url.slice(prefix.length) || '/' : url;
    const paths = typeof page.getStaticPaths === 'function' ? await page.getStaticPaths({}) : [{ params: {} }];
    if (!Array.isArray(paths)) throw new Error(`${url}: getStaticPaths did not return a list`);
    const routePatch = patch?.[url];
    if (mode === 'render' && !routePatch) throw new Error(`route ${url} was never checked against an Astro build`);
    for (const [i, entry] of paths.entries()) {
      if (mode === 'probe' && i > 0 && i !== paths.length - 1) continue;
      const path = fill(route, entry.params);
      const request = new Request(new URL(`${prefix}${path}`, origin));
      let html = await container.renderToString(page.default, {
        params: entry.params ?? {},
        props: entry.props ?? {},
        request,
        partial: false,
      });
      const rel = fileOf(path);
      if (mode === 'probe') {
        probes.push({ url, rel, html });
        continue;
      }
      for (const [from, to] of routePatch.scripts) html = html.split(from).join(to);
      if (routePatch.styles) html = html.replace('</head>', `${routePatch.styles}</head>`);
      const dest = join(outDir, ...rel.split('/'));
      await mkdir(dirname(dest), { recursive: true });
      await writeFile(dest, html);
      written.push(rel);
    }
  }
  return mode === 'probe' ? { probes } : { written };
}

main().then(
  (result) => parentPort.postMessage({ ok: true, result }),
  (err) =>
    parentPort.postMessage({ ok: false, error: err instanceof Error ? (err.stack ?? err.message) : String(err) }),
);
