/**
 * Write the demo catalogue (content/parts/<id>/part.yaml and its sweep files) from the
 * documented model values in scripts/demo/parts.ts. Seeded: the same table gives the same
 * bytes. Every record says `synthetic: true`, and every sweep file starts with a comment line
 * saying it is synthetic. Parts whose datasheet realism check fails stop the run.
 *
 *   npm run demo                 # regenerate content/parts
 *   npm run demo -- --out DIR    # write elsewhere
 *   npm run demo -- --dry-run    # only check the table and print the summary
 */
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { DEMO_PARTS } from './demo/parts.ts';
import { writeDemo } from './demo/write-demo.ts';

const { values } = parseArgs({ options: { out: { type: 'string' }, 'dry-run': { type: 'boolean' } } });
const outDir = values.out ?? join(process.cwd(), 'content', 'parts');
const dryRun = values['dry-run'] ?? false;
let total = 0;
const reports = writeDemo(outDir, { dryRun });
for (const r of reports) {
  total += r.bytes;
  const noise = Number.isNaN(r.zNoiseMedian)
    ? ''
    : ` |dZ/Z| median ${r.zNoiseMedian.toExponential(1)} p95 ${r.zNoiseP95.toExponential(1)}`;
  const per = r.perBw === undefined ? '' : ` ${r.perBw.toFixed(1)} pts/bw`;
  console.log(
    `${r.file.padEnd(44)} ${String(r.points).padStart(5)} pts${per}${noise} ${(r.bytes / 1024).toFixed(0)} kB`,
  );
}
console.log(
  `${DEMO_PARTS.length} parts, ${reports.length} sweep files, ${(total / 1e6).toFixed(2)} MB${dryRun ? ' (dry run, nothing written)' : ` in ${outDir}`}`,
);
