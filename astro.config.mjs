// Astro configuration of the catalogue site: static output, no inline scripts or styles
// (the pages carry a strict Content-Security-Policy).
//
// Environment:
//   MOTIONAL_BASE      base path the site is served under (default '/')
//   MOTIONAL_SITE_OUT  output folder (default 'dist')
//   MOTIONAL_DATA      generated catalogue data, read at build time (default '.motional/catalogue')
//   MOTIONAL_RENDERER_OUT  when set, the server chunks of the build are kept in this folder, so
//                      later builds can render pages from them (src/pipeline/page-renderer.ts)
//
// The generated data folder holds index.json, compare/<id>.json and downloads/<id>/…; the
// integration below puts them into the output as data/index.json, data/compare/ and
// downloads/ (hard links: nothing is copied, a copy only across file systems), and serves them
// from the data folder in `astro dev`.
import { defineConfig } from 'astro/config';
import {
  copyFileSync,
  cpSync,
  createReadStream,
  existsSync,
  linkSync,
  mkdirSync,
  readdirSync,
  renameSync,
  rmSync,
  statSync,
} from 'node:fs';
import { join, normalize, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { SITE_DATA_COPIES } from './src/pipeline/site-data-copies.mjs';

const base = process.env.MOTIONAL_BASE || '/';
const siteOut = resolve(process.env.MOTIONAL_SITE_OUT || 'dist');
// Astro puts a static build's server chunks in ./.astro/ when outDir lies outside the working
// directory, so two builds at once (tests, parallel builds) would overwrite each other's files.
// Build inside the project instead, in a folder of this process, and move the result at the end.
const insideCwd = siteOut.startsWith(process.cwd() + sep);
const outDir = insideCwd ? siteOut : resolve('.motional', `site-build-${process.pid}`);
const dataDir = resolve(process.env.MOTIONAL_DATA || '.motional/catalogue');

/** Site path prefix → folder or file in the data folder (one list with the build's incremental path). */
const COPIES = SITE_DATA_COPIES;

/** Move a built folder to its destination (rename, or copy across file systems). */
function moveFolder(from, to) {
  rmSync(to, { recursive: true, force: true });
  mkdirSync(join(to, '..'), { recursive: true });
  try {
    renameSync(from, to);
  } catch {
    cpSync(from, to, { recursive: true });
    rmSync(from, { recursive: true, force: true });
  }
}

/**
 * Put every file under `from` at the same place under `to` as a hard link (the data folder's
 * files are never changed once written), copying only where a link cannot be made.
 */
function linkTreeSync(from, to) {
  if (!statSync(from).isDirectory()) {
    linkOrCopy(from, to);
    return;
  }
  mkdirSync(to, { recursive: true });
  for (const e of readdirSync(from, { withFileTypes: true })) {
    const src = join(from, e.name);
    const dest = join(to, e.name);
    if (e.isDirectory()) linkTreeSync(src, dest);
    else linkOrCopy(src, dest);
  }
}

function linkOrCopy(src, dest) {
  rmSync(dest, { force: true });
  try {
    linkSync(src, dest);
  } catch (err) {
    if (err.code === 'EXDEV' || err.code === 'EPERM' || err.code === 'EMLINK') copyFileSync(src, dest);
    else throw err;
  }
}

function catalogueData() {
  return {
    name: 'motional-catalogue-data',
    hooks: {
      'astro:build:done': ({ dir }) => {
        const out = fileURLToPath(dir);
        // Build leftovers of the content layer that a static site does not need.
        for (const f of ['content-assets.mjs', 'content-modules.mjs']) rmSync(join(out, f), { force: true });
        for (const [to, from] of COPIES) {
          const src = join(dataDir, from);
          if (!existsSync(src)) continue;
          const dest = join(out, to);
          mkdirSync(join(dest, '..'), { recursive: true });
          linkTreeSync(src, dest);
        }
        if (resolve(out) !== siteOut) moveFolder(resolve(out), siteOut);
      },
      'astro:server:setup': ({ server }) => {
        const prefix = base.endsWith('/') ? base : `${base}/`;
        server.middlewares.use((req, res, next) => {
          const url = decodeURIComponent((req.url || '').split('?')[0]);
          if (!url.startsWith(prefix)) return next();
          const rel = url.slice(prefix.length);
          const hit = COPIES.find(([to]) => rel === to || rel.startsWith(`${to}/`));
          if (!hit) return next();
          const file = normalize(join(dataDir, hit[1], rel.slice(hit[0].length)));
          if (!file.startsWith(dataDir + sep) || !existsSync(file) || !statSync(file).isFile()) return next();
          res.setHeader('Content-Type', file.endsWith('.json') ? 'application/json' : 'text/plain; charset=utf-8');
          createReadStream(file).pipe(res);
        });
      },
    },
  };
}

/** Keep the server chunks of the build (the pages as modules) in MOTIONAL_RENDERER_OUT. */
function keepServerChunks() {
  return {
    name: 'motional-keep-server-chunks',
    writeBundle(output, bundle) {
      const keep = process.env.MOTIONAL_RENDERER_OUT;
      const names = Object.keys(bundle);
      // the server build is the one whose chunks include the pages
      if (!keep || !output.dir || !names.some((f) => f.startsWith('pages/'))) return;
      for (const name of names) {
        if (!name.endsWith('.mjs')) continue;
        const dest = join(keep, name);
        mkdirSync(join(dest, '..'), { recursive: true });
        copyFileSync(join(output.dir, name), dest);
      }
    },
  };
}

export default defineConfig({
  publicDir: './src/public',
  output: 'static',
  base,
  outDir,
  trailingSlash: 'ignore',
  build: {
    format: 'directory',
    inlineStylesheets: 'never',
  },
  devToolbar: { enabled: false },
  integrations: [catalogueData()],
  vite: {
    build: {
      assetsInlineLimit: 0,
    },
    plugins: [keepServerChunks()],
  },
});
