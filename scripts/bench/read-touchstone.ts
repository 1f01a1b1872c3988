/**
 * Benchmark of the Touchstone reader: a synthetic 200,000-point two-port RI file (a crystal in
 * a 50 ohm series-through fixture, numbers in shortest round-trip form, i.e. up to 17 digits)
 * is built in memory and parsed several times. Reports the best throughput and the peak
 * resident memory sampled during the runs.
 *
 * Run alone: `npx tsx scripts/bench/read-touchstone.ts`
 */
import { pathToFileURL } from 'node:url';
import { formatTouchstone, parseTouchstone } from '../../src/lib/io/touchstone.ts';
import type { NetworkData } from '../../src/lib/sweep/sweep.ts';

/** Result of {@link benchReadTouchstone}. */
export interface BenchReadTouchstoneResult {
  /** Best parse throughput, megabytes (1e6 bytes) per second. */
  mbPerS: number;
  /** Highest resident set size seen, MB (1e6 bytes). */
  peakRssMB: number;
  /** Frequency points in the file. */
  points: number;
  /** File size, bytes. */
  bytes: number;
  /** Best throughput by process CPU time (user + system), MB/s: less sensitive to a busy machine. */
  cpuMbPerS: number;
}

const POINTS = 200_000;
const RUNS = 5;

/** Synthetic two-port S data of a BVD crystal (the invented reference crystal X1, values below) between two 50 ohm ports. */
function synthesise(points: number): NetworkData {
  const freqHz = new Float64Array(points);
  const re = [0, 1, 2, 3].map(() => new Float64Array(points));
  const im = [0, 1, 2, 3].map(() => new Float64Array(points));
  const [l1H, c1F, r1Ohm, c0F, z0] = [10e-3, 10e-15, 20, 3e-12, 50];
  for (let i = 0; i < points; i++) {
    const f = 15.9e6 + (i * 60e3) / points;
    const w = 2 * Math.PI * f;
    // Y = jwC0 + 1/(R1 + j(wL1 - 1/(wC1)))
    const x = w * l1H - 1 / (w * c1F);
    const d = r1Ohm * r1Ohm + x * x;
    const yRe = r1Ohm / d;
    const yIm = w * c0F - x / d;
    const yd = yRe * yRe + yIm * yIm;
    const zRe = yRe / yd;
    const zIm = -yIm / yd;
    // S21 = 2 z0 / (Z + 2 z0), S11 = Z / (Z + 2 z0)
    const dr = zRe + 2 * z0;
    const dd = dr * dr + zIm * zIm;
    const s21Re = (2 * z0 * dr) / dd;
    const s21Im = (-2 * z0 * zIm) / dd;
    freqHz[i] = f;
    re[0][i] = re[3][i] = 1 - s21Re;
    im[0][i] = im[3][i] = -s21Im;
    re[1][i] = re[2][i] = s21Re;
    im[1][i] = im[2][i] = s21Im;
  }
  return {
    parameter: 'S',
    ports: 2,
    z0Ohm: [50, 50],
    freqHz,
    re,
    im,
    source: 'bench.s2p',
    format: 'touchstone-1',
    comments: [],
  };
}

/** Build the synthetic file, parse it {@link RUNS} times, return speed and memory. */
export async function benchReadTouchstone(): Promise<BenchReadTouchstoneResult> {
  const text = formatTouchstone(synthesise(POINTS), { version: 1, format: 'RI', freqUnit: 'Hz' });
  let peak = process.memoryUsage().rss;
  const timer = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage().rss);
  }, 5);
  let best = Infinity;
  let bestCpu = Infinity;
  let points = 0;
  try {
    for (let run = 0; run < RUNS; run++) {
      const t0 = performance.now();
      const c0 = process.cpuUsage();
      const data = parseTouchstone(text, 'bench.s2p');
      const ms = performance.now() - t0;
      const cpu = process.cpuUsage(c0);
      bestCpu = Math.min(bestCpu, (cpu.user + cpu.system) / 1e3);
      peak = Math.max(peak, process.memoryUsage().rss);
      points = data.freqHz.length;
      best = Math.min(best, ms);
      // let the sampler run between parses
      await new Promise((r) => setTimeout(r, 10));
    }
  } finally {
    clearInterval(timer);
  }
  const bytes = text.length;
  return {
    mbPerS: bytes / 1e6 / (best / 1e3),
    peakRssMB: peak / 1e6,
    points,
    bytes,
    cpuMbPerS: bytes / 1e6 / (bestCpu / 1e3),
  };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = await benchReadTouchstone();
  console.log(
    `read-touchstone: ${r.points} points, ${(r.bytes / 1e6).toFixed(1)} MB, ${r.mbPerS.toFixed(1)} MB/s wall (${r.cpuMbPerS.toFixed(1)} MB/s by CPU time; best of ${RUNS}), peak RSS ${r.peakRssMB.toFixed(0)} MB`,
  );
}
