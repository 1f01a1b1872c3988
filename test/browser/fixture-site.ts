/**
 * Build the site from the synthetic fixture catalogue (test/site/fixture.ts): emit the data
 * with the real emitter, then run `astro build`. Used while developing the pages and as the
 * fall-back when the real `motional build` cannot run.
 */
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { makeDownloads, writeCatalogueData, writeCatalogueExport } from '../../src/pipeline/emit.ts';
import { makePartData } from '../../src/lib/report/part-data.ts';
import { DEMO_CIRCUIT, fixtureCatalogue, makeFixturePart } from '../site/fixture.ts';

/** The environment without the variables a test runner sets for its own vite (BASE_URL, MODE, …). */
function cleanEnv(): NodeJS.ProcessEnv {
  const env = { ...process.env };
  for (const k of [
    'BASE_URL',
    'MODE',
    'DEV',
    'PROD',
    'SSR',
    'NODE_ENV',
    'VITEST',
    'VITEST_MODE',
    'VITEST_POOL_ID',
    'VITEST_WORKER_ID',
    'TEST',
  ])
    delete env[k];
  return env;
}

/** Emit fixture data into `dataDir` and build the site into `siteDir`; returns the build's stderr on failure. */
export async function buildFixtureSite(dataDir: string, siteDir: string, base = '/'): Promise<void> {
  const parts = fixtureCatalogue().map((spec) => {
    const { loaded, result } = makeFixturePart(spec);
    const downloads = makeDownloads(loaded, result, { readText: () => 'raw file\n' });
    return { data: makePartData(loaded, result, [DEMO_CIRCUIT], { basePath: base, downloads }), downloads };
  });
  await writeCatalogueData(dataDir, parts);
  await writeCatalogueExport(dataDir, parts.map((p) => p.data.id).sort());
  const root = resolve(import.meta.dirname, '..', '..');
  const run = spawnSync(process.execPath, [join(root, 'node_modules', 'astro', 'astro.js'), 'build'], {
    cwd: root,
    env: {
      ...cleanEnv(),
      MOTIONAL_DATA: dataDir,
      MOTIONAL_SITE_OUT: siteDir,
      MOTIONAL_BASE: base,
      ASTRO_TELEMETRY_DISABLED: '1',
    },
    encoding: 'utf8',
  });
  if (run.status !== 0) throw new Error(`astro build failed:\n${run.stdout}\n${run.stderr}`);
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  const [dataDir = '/tmp/motional-fixture/data', siteDir = '/tmp/motional-fixture/site', base = '/'] =
    process.argv.slice(2);
  buildFixtureSite(resolve(dataDir), resolve(siteDir), base).then(
    () => console.log(`built ${siteDir}`),
    (e) => {
      console.error(e);
      process.exit(1);
    },
  );
}
