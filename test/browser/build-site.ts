/**
 * Build the site once for a browser test file: the real command (`motional build --content
 * content`) when the demo content and the pipeline are present, else the synthetic fixture
 * catalogue with the real emitter (fixture-site.ts). MOTIONAL_SITE_TEST_FIXTURE=1 forces the
 * fixture site. The extraction cache is the build's own (a fresh folder), so a test never
 * depends on what an earlier build left in .motional/cache.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { buildFixtureSite } from './fixture-site.ts';

export const ROOT = resolve(import.meta.dirname, '..', '..');

export interface BuiltSite {
  /** Temporary folder holding the build (remove it when done). */
  work: string;
  site: string;
  /** Whether the real demo content was built (else the fixture catalogue). */
  real: boolean;
}

function realBuildPossible(): boolean {
  if (process.env.MOTIONAL_SITE_TEST_FIXTURE === '1') return false;
  const parts = join(ROOT, 'content', 'parts');
  return (
    existsSync(join(ROOT, 'src', 'lib', 'extract', 'extract-part.ts')) &&
    existsSync(parts) &&
    readdirSync(parts).some((d) => existsSync(join(parts, d, 'part.yaml')))
  );
}

export async function buildTestSite(base: string): Promise<BuiltSite> {
  const work = mkdtempSync(join(tmpdir(), 'motional-site-'));
  const site = join(work, 'site');
  const real = realBuildPossible();
  if (real) {
    const run = spawnSync(
      process.execPath,
      [
        join(ROOT, 'node_modules', 'tsx', 'dist', 'cli.mjs'),
        join(ROOT, 'scripts', 'motional.ts'),
        'build',
        '--content',
        'content',
        '--out',
        site,
        '--base',
        base,
        '--quiet',
        '--cache-dir',
        join(work, 'cache'),
      ],
      { cwd: ROOT, encoding: 'utf8', env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' } },
    );
    if (run.status !== 0) throw new Error(`motional build failed (${run.status}):\n${run.stdout}\n${run.stderr}`);
  } else {
    console.warn('browser test: demo content or pipeline missing — building the synthetic fixture catalogue instead');
    await buildFixtureSite(join(work, 'data'), site, base);
  }
  return { work, site, real };
}
