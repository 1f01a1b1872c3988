/**
 * Benchmark of the extraction engine: one sample of the X1 reference resonator (synthetic:
 * L1 10 mH, C1 10 fF, R1 20 Ω, C0 3 pF) with three sweeps — 1,601 points around fs, 1,601
 * points around the load anti-resonance with 10 pF across the part, and 5,001 points over ±0.5 % (fs and fa) —
 * with −70 dB seeded noise, extracted at least 20 times on one thread. Reports the median wall
 * time (target ≤ 20 ms), the median process CPU time (steadier on a busy machine) and the
 * per-step split from the engine's timing collector.
 *
 * Run alone: `npx tsx scripts/bench/extract.ts`
 */
import { pathToFileURL } from 'node:url';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { createTiming } from '../../src/lib/extract/timing.ts';
import { impedanceOver, type BvdModel } from '../../src/lib/models/bvd.ts';
import type { Part, SweepRef } from '../../src/lib/schema/part.ts';
import type { ImpedanceSweep } from '../../src/lib/sweep/sweep.ts';

/** Result of {@link benchExtract}. */
export interface BenchExtractResult {
  points: number;
  runs: number;
  /** Median wall time per extraction, ms. */
  medianMs: number;
  minMs: number;
  /** Median CPU time (user + system) per extraction, ms. */
  medianCpuMs: number;
  targetMs: number;
  /** Median wall time per engine step, ms (steps as named by the timing collector). */
  splitMs: Record<string, number>;
  /** Sanity: fs error of the extracted main mode, ppm. */
  fsErrorPpm: number;
}

const TARGET_MS = 20;

function grid(aHz: number, bHz: number, n: number): Float64Array {
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = aHz + ((bHz - aHz) * i) / (n - 1);
  return f;
}

/** mulberry32 + Box–Muller, seeded (common practice). */
function normal(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

function sweep(model: BvdModel, freqHz: Float64Array, seed: number, source: string, addedCF?: number): ImpedanceSweep {
  const z = impedanceOver(model, freqHz);
  const g = normal(seed);
  const sigma = 10 ** (-70 / 20) / Math.SQRT2;
  for (let i = 0; i < freqHz.length; i++) {
    let r = z.zRe[i];
    let x = z.zIm[i];
    if (addedCF) {
      const w = 2 * Math.PI * freqHz[i];
      const d = r * r + x * x;
      const gg = r / d;
      const b = -x / d + w * addedCF;
      const d2 = gg * gg + b * b;
      r = gg / d2;
      x = -b / d2;
    }
    const m = Math.hypot(r, x);
    z.zRe[i] = r + sigma * m * g();
    z.zIm[i] = x + sigma * m * g();
  }
  return { freqHz, zRe: z.zRe, zIm: z.zIm, source };
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Build the sample, extract it `runs` times (after warm-up), report times. */
export async function benchExtract(options: { quick?: boolean } = {}): Promise<BenchExtractResult> {
  const runs = options.quick ? 40 : 200;
  const fs = 1e8 / (2 * Math.PI);
  const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: fs, r1Ohm: 20, c1F: 10e-15 }] };
  const fL = fs * Math.sqrt(1 + 10e-15 / 13e-12);
  const refs: SweepRef[] = [
    { file: 'a1-narrow.s1p', fixture: 'impedance' },
    { file: 'a1-cl10.s1p', fixture: 'impedance', addedCapacitanceF: 10e-12, addedConnection: 'parallel' },
    { file: 'a1-wide.s1p', fixture: 'impedance' },
  ];
  const grids = [
    grid(fs - 1600, fs + 1600, 1601),
    grid(fL - 1600, fL + 1600, 1601),
    grid(fs * 0.995, fs * 1.005, 5001),
  ];
  const part: Part = {
    id: 'BENCH-X1',
    title: 'benchmark part (synthetic)',
    kind: 'quartz-at',
    samples: [{ id: 'A1', sweeps: refs }],
  };
  const inputs = refs.map((ref, i) => ({
    sampleId: 'A1',
    ref,
    file: ref.file,
    impedance: sweep(model, grids[i], 100 + i, ref.file, ref.addedCapacitanceF),
  }));
  const points = grids.reduce((n, g) => n + g.length, 0);

  // Warm-up: let the JIT compile the hot paths first, so the median is the steady state.
  for (let i = 0; i < (options.quick ? 20 : 100); i++) extractPart(part, inputs);
  const wall: number[] = [];
  const cpu: number[] = [];
  const steps: Record<string, number[]> = {};
  let fsErrorPpm = NaN;
  for (let i = 0; i < runs; i++) {
    const timing = createTiming();
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const result = extractPart(part, inputs, { timing });
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1e3);
    for (const [k, v] of Object.entries(timing.totals)) (steps[k] ??= []).push(v);
    fsErrorPpm = ((result.samples[0].modes[0]?.fsHz ?? NaN) / fs - 1) * 1e6;
    await new Promise((r) => setTimeout(r, 1));
  }
  const splitMs: Record<string, number> = {};
  for (const [k, v] of Object.entries(steps)) splitMs[k] = median(v);
  return {
    points,
    runs,
    medianMs: median(wall),
    minMs: Math.min(...wall),
    medianCpuMs: median(cpu),
    targetMs: TARGET_MS,
    splitMs,
    fsErrorPpm,
  };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = await benchExtract();
  const split = Object.entries(r.splitMs)
    .map(([k, v]) => `${k} ${v.toFixed(2)}`)
    .join(', ');
  console.log(
    `extract: ${r.points} points in 3 sweeps, ${r.runs} runs: median ${r.medianMs.toFixed(1)} ms wall (min ${r.minMs.toFixed(1)}), median ${r.medianCpuMs.toFixed(1)} ms CPU; target ≤ ${r.targetMs} ms`,
  );
  console.log(`  split (median ms): ${split}`);
  console.log(`  fs error ${r.fsErrorPpm.toExponential(2)} ppm`);
}
