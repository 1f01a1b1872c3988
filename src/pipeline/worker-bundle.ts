/**
 * Worker threads that start without transpiling TypeScript: the worker module and everything it
 * imports from the project are bundled once into one JavaScript file with esbuild (packages
 * stay imports, resolved from the project's node_modules), kept in
 * `<project>/.motional/worker/<fingerprint>.mjs` and reused while the code is unchanged (the
 * fingerprint is code-hash.ts's, over the modules the worker reaches and the package lock).
 * A thread then loads one file instead of registering the TypeScript loader and transpiling
 * a hundred modules, so threads pay off for small catalogues too.
 *
 * When bundling fails (esbuild missing or refusing the code) the TypeScript module is used as
 * before, through worker-bootstrap.mjs and tsx.
 */
import { mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import { join, relative, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { moduleClosureHash } from './code-hash.ts';
import { PROJECT_ROOT } from './project-root.ts';

const BUNDLES = join(PROJECT_ROOT, '.motional', 'worker');

/** Bundles of other code versions beyond this many are removed, oldest first. */
const KEEP_BUNDLES = 4;

/**
 * The bundled form of a worker module (made on first use), or the module itself when it cannot
 * be bundled.
 */
export async function bundledWorker(moduleUrl: URL): Promise<URL> {
  try {
    const path = fileURLToPath(moduleUrl);
    const rel = relative(PROJECT_ROOT, path).split(sep).join('/');
    const hash = await moduleClosureHash(PROJECT_ROOT, [rel], ['package-lock.json']);
    const name = `${rel.replace(/[^\w.-]+/g, '_').replace(/\.ts$/, '')}-${hash.slice(0, 20)}.mjs`;
    const out = join(BUNDLES, name);
    if (await stat(out).catch(() => undefined)) return pathToFileURL(out);
    const { build } = await import('esbuild');
    await mkdir(BUNDLES, { recursive: true });
    const tmp = `${out}.${process.pid}.tmp`;
    await build({
      entryPoints: [path],
      outfile: tmp,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: `node${process.versions.node.split('.')[0]}`,
      packages: 'external',
      logLevel: 'silent',
      legalComments: 'none',
    });
    await rename(tmp, out);
    await prune();
    return pathToFileURL(out);
  } catch {
    return moduleUrl;
  }
}

async function prune(): Promise<void> {
  const names = (await readdir(BUNDLES).catch(() => [] as string[])).filter((n) => n.endsWith('.mjs'));
  const dated = await Promise.all(
    names.map(async (n) => ({ n, t: (await stat(join(BUNDLES, n)).catch(() => undefined))?.mtimeMs ?? 0 })),
  );
  dated.sort((a, b) => b.t - a.t);
  for (const d of dated.slice(KEEP_BUNDLES)) await rm(join(BUNDLES, d.n), { force: true });
}
