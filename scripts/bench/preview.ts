/**
 * Benchmark of `motional preview` (issue 14): save-to-page time. A synthetic catalogue is
 * previewed (in process); a record's title is saved again and again, and each time the part page
 * is fetched every 25 ms until it shows the new title. Target: median ≤ 3 s on the 2-core machines.
 *
 * Run alone: `npx tsx scripts/bench/preview.ts [--parts N]`
 */
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { startPreview } from '../../src/pipeline/preview.ts';
import { syntheticPartId, writeSyntheticCatalogueParallel } from './lib/synthetic-catalogue.ts';

export interface BenchPreviewResult {
  parts: number;
  /** 1-minute load average before and after (other work on the machine skews times). */
  loadAverage: { before: number; after: number };
  /** First build of the preview, seconds. */
  firstBuildSeconds: number;
  /** Save-to-page times, seconds, in order. */
  saveToPageSeconds: number[];
  medianSeconds: number;
  targets: { medianUnder3s: boolean };
}

export async function benchPreview(options: { quick?: boolean; parts?: number } = {}): Promise<BenchPreviewResult> {
  const parts = options.parts ?? (options.quick ? 30 : 300);
  const saves = options.quick ? 3 : 7;
  const loadBefore = loadavg()[0];
  const root = await mkdtemp(join(tmpdir(), 'motional-bench-preview-'));
  try {
    const content = join(root, 'content');
    await writeSyntheticCatalogueParallel(content, parts, { samples: 3 });
    const t0 = performance.now();
    const preview = await startPreview({
      contentDir: content,
      outDir: join(root, 'preview', 'site'),
      cacheDir: join(root, 'cache'),
      port: 0,
    });
    const firstBuildSeconds = (performance.now() - t0) / 1000;
    const times: number[] = [];
    try {
      const id = syntheticPartId(1);
      const yaml = join(content, 'parts', id, 'part.yaml');
      const url = `${preview.url}parts/${id}/`;
      for (let i = 0; i < saves; i++) {
        const title = `previewed title ${i}`;
        const text = await readFile(yaml, 'utf8');
        const saved = performance.now();
        await writeFile(yaml, text.replace(/^title: .*$/m, `title: ${title}`));
        for (;;) {
          const page = await fetch(url)
            .then((r) => r.text())
            .catch(() => '');
          if (page.includes(title)) break;
          if (performance.now() - saved > 120_000) throw new Error('the preview never showed the saved title');
          await new Promise((r) => setTimeout(r, 25));
        }
        times.push((performance.now() - saved) / 1000);
        await preview.idle();
      }
    } finally {
      await preview.close();
    }
    const sorted = [...times].sort((a, b) => a - b);
    const medianSeconds = sorted[Math.floor(sorted.length / 2)];
    return {
      parts,
      loadAverage: { before: loadBefore, after: loadavg()[0] },
      firstBuildSeconds,
      saveToPageSeconds: times,
      medianSeconds,
      targets: { medianUnder3s: medianSeconds <= 3 },
    };
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}

export function formatBenchPreview(r: BenchPreviewResult): string {
  return [
    `${r.parts} parts; load average ${r.loadAverage.before.toFixed(1)} before, ${r.loadAverage.after.toFixed(1)} after; first build ${r.firstBuildSeconds.toFixed(1)} s`,
    `save to page: ${r.saveToPageSeconds.map((s) => s.toFixed(2)).join(', ')} s; median ${r.medianSeconds.toFixed(2)} s (target ≤ 3 s: ${r.targets.medianUnder3s ? 'met' : 'MISSED'})`,
  ].join('\n');
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const i = process.argv.indexOf('--parts');
  const result = await benchPreview({ parts: i > 0 ? Number(process.argv[i + 1]) : undefined });
  process.stdout.write(`${formatBenchPreview(result)}\n`);
}
