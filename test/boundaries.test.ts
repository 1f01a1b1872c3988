/**
 * Layers point one way (DEVELOPERS.md: Layers).
 * - The core in src/lib knows nothing of Node, Astro, the DOM or d3: it takes data and returns
 *   data. Only src/pipeline, src/site, src/pages, src/components and scripts/ may touch those.
 * - Inside src/lib a module imports only its own layer or lower ones (the table in
 *   test/support/layers.ts); across the project lib → pipeline → site | scripts.
 * - No file-level import cycles.
 * The checker is shown to fail on a recorded bad tree (test/fixtures/layers/) and to pass on this one.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkLayers, importSpecifiers, LIB_LAYERS, PROJECT_ROOT, TOP_LAYERS } from './support/layers.ts';

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? walk(p) : p.endsWith('.ts') ? [p] : [];
  });
}

const FORBIDDEN = [
  /from\s+['"]node:/,
  /from\s+['"](fs|path|os|child_process|worker_threads)['"]/,
  /from\s+['"]astro/,
  /from\s+['"]d3/,
  /\bdocument\./,
  /\bwindow\./,
];

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

describe('layer table', () => {
  it('gives every folder of src/lib a layer, and every top-level source folder one', () => {
    const libDirs = readdirSync(join(PROJECT_ROOT, 'src/lib')).map((n) =>
      n.endsWith('.ts') ? `src/lib/${n}` : `src/lib/${n}/`,
    );
    const libPaths = LIB_LAYERS.flatMap((l) => l.paths);
    expect(libDirs.filter((d) => !libPaths.includes(d))).toEqual([]);
    const topPaths = TOP_LAYERS.flatMap((l) => l.paths);
    const srcDirs = readdirSync(join(PROJECT_ROOT, 'src'), { withFileTypes: true })
      .filter((d) => d.isDirectory() && !['public', 'styles'].includes(d.name))
      .map((d) => `src/${d.name}/`);
    expect(srcDirs.filter((d) => !topPaths.includes(d))).toEqual([]);
  });

  it('reads every kind of import: static, type-only, re-export, side-effect and dynamic, relative only', () => {
    const text = [
      "import { a } from './a.ts';",
      "import type {\n  B,\n  C } from '../b.ts';",
      "export * from './c.ts';",
      "export { d as e } from './d.ts';",
      "import './e.ts';",
      "const f = await import('./f.ts');",
      "import { z } from 'zod';",
    ].join('\n');
    expect(importSpecifiers(text)).toEqual(['./a.ts', '../b.ts', './c.ts', './d.ts', './e.ts', './f.ts']);
  });
});

describe('layers point one way', () => {
  it('rejects the recorded bad tree: upward imports, side-by-side layers, pipeline → site, and a cycle', () => {
    const r = checkLayers(join(PROJECT_ROOT, 'test/fixtures/layers'));
    expect(r.files).toBe(9);
    expect(r.violations.sort()).toEqual([
      'src/lib/extract/side.ts (extract) imports src/lib/synth/seed.ts (synth): extract and synth are side by side and may not import each other',
      'src/lib/units/upward.ts (units) imports src/lib/report/summary.ts (report): report is above units',
      'src/pipeline/uses-site.ts (pipeline) imports src/site/view.ts (site): site is above pipeline',
    ]);
    expect(r.cycles).toEqual(['src/lib/osc/a.ts → src/lib/osc/b.ts → src/lib/osc/a.ts']);
  });

  it('passes on this project: no upward import, no cycle', () => {
    const r = checkLayers(PROJECT_ROOT);
    expect(r.files).toBeGreaterThan(150);
    expect(r.violations).toEqual([]);
    expect(r.cycles).toEqual([]);
  });
});
