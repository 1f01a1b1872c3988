/**
 * Synthetic catalogues for the build benchmark and the build tests: invented parts (ids
 * `SYN-00001`, …, supplier "Synthetic Test Supply"), each with its own seeded BVD model,
 * `samples` units per part and three sweeps per unit:
 *   1. a narrow reflection sweep (.s1p) around fs and fp;
 *   2. the same span through a series-thru fixture (.s2p) with a known 10 pF added in parallel;
 *   3. a wide impedance sweep (.csv, |Z| and phase) from 0.7·fs to 1.3·fs.
 * Every file is labelled synthetic. Same index and seed → same bytes.
 *
 * Not a benchmark itself (exports no `bench*` function); scripts/bench/build.ts and the build tests use it.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { createRng } from '../../../src/lib/synth/rng.ts';
import { formatSynthFile } from '../../../src/lib/synth/synth-file.ts';
import { synthesizeSweep } from '../../../src/lib/synth/synth-sweep.ts';
import { createWorkerPool, defaultJobs } from '../../../src/pipeline/worker-pool.ts';

/** One slice for the worker thread (synth-worker.ts): parts `first` … `first + count − 1` into `dir`. */
export interface SynthSliceTask {
  dir: string;
  first: number;
  count: number;
  options: SyntheticCatalogueOptions;
}

export interface SyntheticCatalogueOptions {
  /** Units per part (default 3). */
  samples?: number;
  /** Points of the narrow sweeps (default 401); the wide sweep has half as many. */
  points?: number;
  /** First part number (default 1). */
  first?: number;
  /** Seed mixed into every part's model (default 1). */
  seed?: number;
}

/** Id of synthetic part number `n`. */
export function syntheticPartId(n: number): string {
  return `SYN-${String(n).padStart(5, '0')}`;
}

/** The true model of synthetic part `n` and unit `k` (units differ by a few per cent). */
export function syntheticModel(n: number, k: number, seed = 1): BvdModel {
  const part = createRng(seed * 1_000_003 + n);
  const fsHz = Math.round(4e6 * 10 ** (part.uniform() * 1.2)); // 4–63 MHz, log-uniform
  const r1Ohm = 10 + 60 * part.uniform();
  const c1F = (5 + 20 * part.uniform()) * 1e-15;
  const c0F = (1.5 + 3.5 * part.uniform()) * 1e-12;
  const unit = createRng(seed * 1_000_003 + n * 101 + k + 7);
  const vary = (x: number, rel: number) => x * (1 + rel * (2 * unit.uniform() - 1));
  return {
    c0F: vary(c0F, 0.02),
    branches: [{ fsHz: vary(fsHz, 20e-6), r1Ohm: vary(r1Ohm, 0.1), c1F: vary(c1F, 0.03) }],
  };
}

function recordText(n: number, units: string[]): string {
  const id = syntheticPartId(n);
  const lines = [
    `id: ${id}`,
    `title: synthetic crystal ${n}`,
    'kind: quartz-at',
    'package: "3225"',
    'supplier: Synthetic Test Supply',
    `supplierPart: STS-${n}`,
    'synthetic: true',
    'notes: Invented part for build benchmarks and tests; every sweep is synthetic.',
    'samples:',
  ];
  for (const u of units) {
    lines.push(
      `  - id: ${u}`,
      '    instrument: bench analyser',
      '    temperature: 25 C',
      '    sweeps:',
      `      - file: ${u.toLowerCase()}-narrow.s1p`,
      '        fixture: reflection',
      `      - file: ${u.toLowerCase()}-cl10.s2p`,
      '        fixture: series-thru',
      '        addedCapacitance: 10 pF',
      '        addedConnection: parallel',
      `      - file: ${u.toLowerCase()}-wide.csv`,
      '        fixture: impedance',
    );
  }
  return `${lines.join('\n')}\n`;
}

/** The files of synthetic part `n`: name → text (part.yaml first). */
export function syntheticPartFiles(n: number, options: SyntheticCatalogueOptions = {}): Map<string, string> {
  const samples = options.samples ?? 3;
  const points = options.points ?? 401;
  const seed = options.seed ?? 1;
  const units = Array.from({ length: samples }, (_, k) => `A${k + 1}`);
  const files = new Map<string, string>([['part.yaml', recordText(n, units)]]);
  units.forEach((u, k) => {
    const model = syntheticModel(n, k, seed);
    const b = model.branches[0];
    const fpHz = b.fsHz * Math.sqrt(1 + b.c1F / model.c0F);
    const span = 4 * (fpHz - b.fsHz);
    const narrow = { kind: 'centered' as const, centerHz: (b.fsHz + fpHz) / 2, spanHz: span, points };
    const s = u.toLowerCase();
    const noise = { noiseDb: -70, seed: seed * 7919 + n * 31 + k, freqResolutionHz: 0.001 };
    const refl = synthesizeSweep({ model, grid: narrow, fixture: 'reflection', ...noise, source: `${s}-narrow.s1p` });
    files.set(`${s}-narrow.s1p`, formatSynthFile(refl, { kind: 'touchstone', format: 'RI' }, { digits: 8 }));
    // with 10 pF across the part fp moves down towards fs: the narrow span still covers it
    const thru = synthesizeSweep({
      model,
      grid: narrow,
      fixture: 'series-thru',
      added: { capacitanceF: 10e-12, connection: 'parallel' },
      ...noise,
      seed: noise.seed + 1,
      source: `${s}-cl10.s2p`,
    });
    files.set(`${s}-cl10.s2p`, formatSynthFile(thru, { kind: 'touchstone', format: 'RI' }, { digits: 8 }));
    const wide = synthesizeSweep({
      model,
      grid: {
        kind: 'linear',
        startHz: 0.7 * b.fsHz,
        stopHz: 1.3 * b.fsHz,
        points: Math.max(11, Math.round(points / 2)),
      },
      fixture: 'impedance',
      ...noise,
      seed: noise.seed + 2,
      source: `${s}-wide.csv`,
    });
    files.set(`${s}-wide.csv`, formatSynthFile(wide, { kind: 'csv', form: 'magphase' }, { digits: 8 }));
  });
  return files;
}

/**
 * Write `count` synthetic parts as `<dir>/parts/<id>/…`.
 * @returns the part folders written
 */
export async function writeSyntheticCatalogue(
  dir: string,
  count: number,
  options: SyntheticCatalogueOptions = {},
): Promise<string[]> {
  const first = options.first ?? 1;
  const folders: string[] = [];
  for (let n = first; n < first + count; n++) {
    const folder = join(dir, 'parts', syntheticPartId(n));
    await mkdir(folder, { recursive: true });
    for (const [name, text] of syntheticPartFiles(n, options)) await writeFile(join(folder, name), text);
    folders.push(folder);
  }
  return folders;
}

/**
 * {@link writeSyntheticCatalogue} on every core: slices of parts written by worker threads.
 * Same files as the serial version.
 */
export async function writeSyntheticCatalogueParallel(
  dir: string,
  count: number,
  options: SyntheticCatalogueOptions = {},
  threads = defaultJobs(),
): Promise<void> {
  const first = options.first ?? 1;
  const slice = 50;
  const pool = createWorkerPool<SynthSliceTask, number>({
    moduleUrl: new URL('./synth-worker.ts', import.meta.url),
    size: Math.max(1, Math.min(threads, Math.ceil(count / slice))),
  });
  try {
    const tasks: Array<Promise<number>> = [];
    for (let start = 0; start < count; start += slice) {
      tasks.push(pool.run({ dir, first: first + start, count: Math.min(slice, count - start), options }));
    }
    await Promise.all(tasks);
  } finally {
    await pool.close();
  }
}
