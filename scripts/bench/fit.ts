/**
 * Benchmark of fitBvd: a 1,601-point sweep of an X1-like crystal (synthetic: 16 MHz-class AT
 * fundamental, L1 10 mH, C1 10 fF, R1 20 Ω, C0 3 pF) with −60 dB seeded complex noise, fitted
 * from a start as close-form estimates would give it (fs 1 ppm, R1 5 %, C1 1 %, C0 1 % off) and
 * from a poor start (fs 20 ppm, R1 30 %, C1 20 %, C0 5 % off). Also times a joint fit of a
 * sample-sized set: 1,601 plain + 1,601 with a 10 pF capacitor across the part + 5,001 wide.
 * Reports the median and best time over the runs after a warm-up.
 *
 * Run alone: `npx tsx scripts/bench/fit.ts`
 */
import { pathToFileURL } from 'node:url';
import { fitBvd, type FitSweep } from '../../src/lib/extract/fit-bvd.ts';
import { admittanceAt, type BvdModel } from '../../src/lib/models/bvd.ts';
import { createRng } from '../../src/lib/synth/rng.ts';

/** Timing of one case, ms. */
export interface BenchFitCase {
  label: string;
  points: number;
  medianMs: number;
  bestMs: number;
  iterations: number;
  converged: boolean;
}

/** Result of {@link benchFit}. */
export interface BenchFitResult {
  /** Median time of the 1,601-point fit from a close start, ms (the headline number). */
  medianMs: number;
  cases: BenchFitCase[];
}

const WARMUP = 20;
const RUNS = 60;

const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };

/** Seeded standard normal deviates from the generator the synthetic sweeps use. */
function normal(seed: number): () => number {
  const rng = createRng(seed);
  return () => rng.gaussian();
}

function sweep(lo: number, hi: number, n: number, seed: number, parallelCapF = 0): FitSweep {
  const freqHz = new Float64Array(n);
  const zRe = new Float64Array(n);
  const zIm = new Float64Array(n);
  const g = normal(seed);
  const sigma = 1e-3 / Math.SQRT2; // −60 dB relative
  for (let i = 0; i < n; i++) {
    const f = lo + ((hi - lo) * i) / (n - 1);
    const [yRe, yIm0] = admittanceAt(X1, f);
    const yIm = yIm0 + 2 * Math.PI * f * parallelCapF;
    const d = yRe * yRe + yIm * yIm;
    const mag = 1 / Math.sqrt(d);
    freqHz[i] = f;
    zRe[i] = yRe / d + sigma * mag * g();
    zIm[i] = -yIm / d + sigma * mag * g();
  }
  return parallelCapF > 0
    ? { freqHz, zRe, zIm, source: 'bench-loaded', addedCapacitanceF: parallelCapF, addedConnection: 'parallel' }
    : { freqHz, zRe, zIm, source: 'bench' };
}

function start(dfsPpm: number, kR: number, kC: number, kC0: number): BvdModel {
  const b = X1.branches[0];
  return {
    c0F: X1.c0F * kC0,
    branches: [{ fsHz: b.fsHz * (1 + dfsPpm * 1e-6), r1Ohm: b.r1Ohm * kR, c1F: b.c1F * kC }],
  };
}

function time(label: string, sweeps: FitSweep[], initial: BvdModel): BenchFitCase {
  let last = fitBvd(sweeps, initial);
  for (let i = 0; i < WARMUP; i++) last = fitBvd(sweeps, initial);
  const ms: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    last = fitBvd(sweeps, initial);
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  return {
    label,
    points: last.points,
    medianMs: ms[Math.floor(RUNS / 2)],
    bestMs: ms[0],
    iterations: last.iterations,
    converged: last.converged,
  };
}

/** Time fitBvd on the cases described in the module comment. */
export function benchFit(): BenchFitResult {
  const fs = X1.branches[0].fsHz;
  const fp = fs * Math.sqrt(1 + X1.branches[0].c1F / X1.c0F);
  const narrow = sweep(fs - 8e3, fp + 8e3, 1601, 1);
  const loaded = sweep(fs - 8e3, fp + 8e3, 1601, 2, 10e-12);
  const wide = sweep(14e6, 18e6, 5001, 3);
  const cases = [
    time('1601 points, close start', [narrow], start(1, 1.05, 1.01, 1.01)),
    time('1601 points, poor start', [narrow], start(20, 1.3, 0.8, 1.05)),
    time('joint 1601 + 1601 loaded + 5001 wide, close start', [narrow, loaded, wide], start(1, 1.05, 1.01, 1.01)),
  ];
  return { medianMs: cases[0].medianMs, cases };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = benchFit();
  for (const c of r.cases) {
    console.log(
      `fit-bvd: ${c.label}: ${c.points} points, median ${c.medianMs.toFixed(2)} ms, best ${c.bestMs.toFixed(2)} ms (${RUNS} runs), ${c.iterations} iterations${c.converged ? '' : ', NOT CONVERGED'}`,
    );
  }
}
