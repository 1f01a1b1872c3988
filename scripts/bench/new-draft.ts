/**
 * Benchmark of `motional new` (issue 14 target: ≤ 2 s on a folder of ten sweeps): a synthetic
 * 16 MHz-class crystal (L1 9.9 mH, C1 10 fF, R1 20 Ω, C0 3 pF) recorded series-through as
 * Touchstone 1.x: a 1,601-point narrow sweep, six loaded ones (parallel 4–24 pF), a repeat, an
 * open/short pair and a 5,001-point wide sweep (ten sweeps and the compensation). Times the draft
 * in-process (median of 5, nothing written) and the whole command as a process (Node start-up
 * included, and start-up alone for comparison).
 *
 * Run alone: `npx tsx scripts/bench/new-draft.ts`
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import { formatSynthFile } from '../../src/lib/synth/synth-file.ts';
import { synthesizeCompensation } from '../../src/lib/synth/synth-compensation.ts';
import { synthesizeSweep } from '../../src/lib/synth/synth-sweep.ts';
import { draftFolder } from '../../src/pipeline/draft-folder.ts';

const MODEL: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 16e6, r1Ohm: 20, c1F: 10e-15 }] };

export interface BenchNewDraftResult {
  sweeps: number;
  /** Median in-process draft time, ms. */
  medianMs: number;
  /** `motional new` as a process, ms, and `motional --help` as a process (start-up alone), ms. */
  processMs: number;
  startupMs: number;
  targetMs: number;
}

function writeTenSweeps(folder: string): number {
  const common = {
    model: MODEL,
    fixture: 'series-thru' as const,
    ports: 2 as const,
    floorDb: -90,
    traceNoise: 2e-5,
    freqResolutionHz: 0.001,
    parasitics: { cpF: 0.5e-12 },
  };
  const narrow = { kind: 'centered' as const, centerHz: 16e6, spanHz: 4500, points: 1601 };
  let seed = 1;
  const put = (name: string, rec: Parameters<typeof formatSynthFile>[0]) =>
    writeFileSync(join(folder, name), formatSynthFile(rec, { kind: 'touchstone', version: 1 }));
  put('a1-narrow.s2p', synthesizeSweep({ ...common, grid: narrow, seed: seed++ }));
  put('a1-narrow-repeat.s2p', synthesizeSweep({ ...common, grid: narrow, seed: seed++ }));
  for (const pf of [4, 8, 12, 16, 20, 24])
    put(
      `a1-cl${pf}.s2p`,
      synthesizeSweep({
        ...common,
        grid: narrow,
        added: { capacitanceF: pf * 1e-12, connection: 'parallel' },
        seed: seed++,
      }),
    );
  put(
    'a1-wide.s2p',
    synthesizeSweep({
      ...common,
      grid: { kind: 'linear', startHz: 15.8e6, stopHz: 16.2e6, points: 5001 },
      seed: seed++,
    }),
  );
  const comp = synthesizeCompensation({
    fixture: 'series-thru',
    ports: 2,
    parasitics: { cpF: 0.5e-12 },
    grid: { kind: 'linear', startHz: 15.7e6, stopHz: 16.3e6, points: 801 },
    floorDb: -90,
    seed: 50,
  });
  put('open.s2p', { ...comp.open, seed: 50 });
  put('short.s2p', { ...comp.short, seed: 51 });
  return 10;
}

export async function benchNewDraft(): Promise<BenchNewDraftResult> {
  const dir = mkdtempSync(join(tmpdir(), 'motional-bench-new-'));
  try {
    const folder = join(dir, 'XO-BENCH');
    (await import('node:fs')).mkdirSync(folder);
    const sweeps = writeTenSweeps(folder);
    const times: number[] = [];
    for (let i = 0; i < 6; i++) {
      const t0 = performance.now();
      const r = await draftFolder(folder, { write: false });
      if (!r.ok) throw new Error(r.message);
      if (i > 0) times.push(performance.now() - t0);
    }
    times.sort((a, b) => a - b);
    const root = resolve(import.meta.dirname, '../..');
    const t0 = performance.now();
    execFileSync(process.execPath, ['--import', 'tsx', join(root, 'scripts/motional.ts'), 'new', folder], {
      cwd: root,
      stdio: 'pipe',
    });
    const processMs = performance.now() - t0;
    const t1 = performance.now();
    execFileSync(process.execPath, ['--import', 'tsx', join(root, 'scripts/motional.ts'), '--help'], {
      cwd: root,
      stdio: 'pipe',
    });
    const startupMs = performance.now() - t1;
    return { sweeps, medianMs: times[times.length >> 1], processMs, startupMs, targetMs: 2000 };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  benchNewDraft().then((r) => console.log(JSON.stringify(r, null, 2)));
}
