/**
 * The core in src/lib knows nothing of Node, Astro, the DOM or d3: it takes data and returns data.
 * Only src/pipeline, src/site, src/pages, src/components and scripts/ may touch those.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? walk(p) : p.endsWith('.ts') ? [p] : [];
  });
}

const FORBIDDEN = [/from\s+['"]node:/, /from\s+['"](fs|path|os|child_process|worker_threads)['"]/, /from\s+['"]astro/, /from\s+['"]d3/, /\bdocument\./, /\bwindow\./];

describe('core boundary', () => {
  const files = walk('src/lib');
  it('src/lib has modules to check', () => {
    expect(files.length).toBeGreaterThan(10);
  });
  it('no module in src/lib imports node:*, astro, d3 or touches the DOM', () => {
    const offenders = files.flatMap((f) => {
      const text = readFileSync(f, 'utf8');
      return FORBIDDEN.filter((re) => re.test(text)).map((re) => `${f}: ${re}`);
    });
    expect(offenders).toEqual([]);
  });
});
