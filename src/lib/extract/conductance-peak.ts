/**
 * Conductance-peak method: fs, R1 and L1 from the shape of G = Re Y around a resonance.
 *
 * C0 only adds susceptance, so G is exactly the motional branch's conductance (derived from the
 * BVD model):
 *   G = R1/(R1² + X²),  X = 2πL1·(f − fs²/f)
 * hence h = 1/G = R1 + K·v² with v = f − fs²/f and K = (2πL1)²/R1: a parabola in v whose
 * vertex is (fs, R1) and whose curvature gives L1. Gmax = 1/R1 sits exactly at fs (derived from
 * the BVD model; QCM usage R1 = 1/Gmax, Sensors 21(10):3490, 2021). The model is fitted by
 * Gauss–Newton on the points with G above a fraction of the peak, weighted for noise
 * proportional to |Y|. Other branches' conductance tails are neglected (they are many orders
 * smaller at a peak).
 */
import { invertSmall, propagate } from './small-linalg.ts';

/** Result of the conductance-peak fit; values finite when `ok`. */
export interface ConductancePeakResult {
  ok: boolean;
  reason: string;
  fsHz: number;
  r1Ohm: number;
  l1H: number;
  c1F: number;
  q: number;
  /** Half-power bandwidth fs/Q = R1/(2πL1), Hz. */
  bandwidthHz: number;
  /** Standard uncertainties (absent with no spare degrees of freedom). */
  uncertainty?: { fsHz: number; r1Ohm: number; l1H: number; c1F: number; q: number };
  /** Number of points used. */
  points: number;
  /** RMS of the weighted residual: misfit of G relative to |Y| (compare with the noise level). */
  rmsRelative: number;
}

/** Options of {@link fitConductancePeak}. */
export interface ConductancePeakOptions {
  /** Use the contiguous points with G ≥ this fraction of the peak value. Default 0.2. */
  minFraction?: number;
  /** At least this many points around the peak (widened when fewer qualify). Default 5. */
  minPoints?: number;
}

const FAIL = (reason: string, points = 0): ConductancePeakResult => ({
  ok: false,
  reason,
  fsHz: 0,
  r1Ohm: 0,
  l1H: 0,
  c1F: 0,
  q: 0,
  bandwidthHz: 0,
  points,
  rmsRelative: 0,
});

/**
 * Fit h = 1/G = R1 + (2πL1)²/R1·(f − fs²/f)² around the G peak at `peakIndex`.
 * @param freqHz frequencies, Hz (rising)
 * @param gS conductance of the part, S
 * @param yAbsS |Y| of the part, S (sets the weights; noise taken proportional to |Y|)
 */
export function fitConductancePeak(
  freqHz: ArrayLike<number>,
  gS: ArrayLike<number>,
  yAbsS: ArrayLike<number>,
  peakIndex: number,
  options: ConductancePeakOptions = {},
): ConductancePeakResult {
  const minFraction = options.minFraction ?? 0.2;
  const minPoints = options.minPoints ?? 5;
  const n = freqHz.length;
  const gPeak = gS[peakIndex];
  if (!(gPeak > 0)) return FAIL('no positive conductance at the peak');
  let lo = peakIndex;
  let hi = peakIndex;
  while (lo > 0 && gS[lo - 1] >= minFraction * gPeak) lo--;
  while (hi < n - 1 && gS[hi + 1] >= minFraction * gPeak) hi++;
  while (hi - lo + 1 < minPoints && (lo > 0 || hi < n - 1)) {
    if (lo > 0) lo--;
    if (hi - lo + 1 < minPoints && hi < n - 1) hi++;
  }
  const m = hi - lo + 1;
  if (m < 3) return FAIL('fewer than 3 points around the conductance peak', m);
  const f0 = freqHz[peakIndex];
  const x = new Float64Array(m); // f − f0, Hz
  const h = new Float64Array(m);
  const w = new Float64Array(m);
  let count = 0;
  for (let i = lo; i <= hi; i++) {
    if (!(gS[i] > 0)) continue;
    x[count] = freqHz[i] - f0;
    h[count] = 1 / gS[i];
    const y = Math.max(yAbsS[i], gS[i]);
    w[count] = gS[i] ** 4 / (y * y);
    count++;
  }
  if (count < 3) return FAIL('fewer than 3 points with positive conductance around the peak', count);

  // Start: weighted parabola in (f − f0), scaled by the span for conditioning.
  const span = Math.max(Math.abs(x[0]), Math.abs(x[count - 1]), 1e-300);
  const ata = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const aty = [0, 0, 0];
  for (let i = 0; i < count; i++) {
    const u = x[i] / span;
    const row = [1, u, u * u];
    for (let a = 0; a < 3; a++) {
      aty[a] += w[i] * row[a] * h[i];
      for (let b = 0; b < 3; b++) ata[a][b] += w[i] * row[a] * row[b];
    }
  }
  const inv0 = invertSmall(ata);
  if (!inv0) return FAIL('conductance peak too poorly sampled to fit', count);
  const [pa, pb, pc] = inv0.map((r) => r[0] * aty[0] + r[1] * aty[1] + r[2] * aty[2]);
  if (!(pc > 0)) return FAIL('conductance does not peak (no curvature) at the found maximum', count);
  let delta = (-pb / (2 * pc)) * span; // fs − f0
  let r1 = pa - (pb * pb) / (4 * pc);
  let k = pc / (4 * span * span);
  if (!(r1 > 0)) {
    r1 = Infinity;
    for (let i = 0; i < count; i++) r1 = Math.min(r1, h[i]);
  }

  // Weighted SSE and (optionally) the normal equations JᵀWJ, JᵀWr at (delta, R1, K);
  // parameter order R1, K, fs.
  const normal = {
    a: [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ],
    g: [0, 0, 0],
  };
  const evaluate = (d0: number, rr: number, kk: number, withNormal: boolean): number => {
    const fs = f0 + d0;
    let sse = 0;
    if (withNormal)
      for (let p = 0; p < 3; p++) {
        normal.g[p] = 0;
        for (let q = 0; q < 3; q++) normal.a[p][q] = 0;
      }
    for (let i = 0; i < count; i++) {
      const d = x[i] - d0; // f − fs
      const f = fs + d;
      const v = (d * (2 * fs + d)) / f;
      const r = h[i] - (rr + kk * v * v);
      const wi = w[i];
      sse += wi * r * r;
      if (!withNormal) continue;
      const j1 = v * v;
      const j2 = (-4 * kk * v * fs) / f;
      const a = normal.a;
      const gv = normal.g;
      gv[0] += wi * r;
      gv[1] += wi * j1 * r;
      gv[2] += wi * j2 * r;
      a[0][0] += wi;
      a[0][1] += wi * j1;
      a[0][2] += wi * j2;
      a[1][1] += wi * j1 * j1;
      a[1][2] += wi * j1 * j2;
      a[2][2] += wi * j2 * j2;
    }
    if (withNormal) for (let p = 0; p < 3; p++) for (let q = 0; q < p; q++) normal.a[p][q] = normal.a[q][p];
    return sse;
  };

  let sse = evaluate(delta, r1, k, true);
  let lambda = 1e-6;
  for (let iter = 0; iter < 30; iter++) {
    let accepted = false;
    let gain = 0;
    for (let tries = 0; tries < 12; tries++) {
      const damped = normal.a.map((row, i) => row.map((v, j) => (i === j ? v * (1 + lambda) : v)));
      const inv = invertSmall(damped);
      if (!inv) break;
      const g = normal.g;
      const step = inv.map((row) => row[0] * g[0] + row[1] * g[1] + row[2] * g[2]);
      const nr = r1 + step[0];
      const nk = k + step[1];
      const nd = delta + step[2];
      if (nr > 0 && nk > 0) {
        const next = evaluate(nd, nr, nk, false);
        if (next <= sse) {
          gain = sse - next;
          delta = nd;
          r1 = nr;
          k = nk;
          sse = next;
          lambda = Math.max(lambda / 10, 1e-12);
          accepted = true;
          break;
        }
      }
      lambda *= 10;
    }
    if (!accepted) break;
    sse = evaluate(delta, r1, k, true);
    if (!(gain > 1e-10 * sse) || sse === 0) break;
  }
  const cur = { sse };
  const xLen = count;
  const fsHz = f0 + delta;
  const l1H = Math.sqrt(k * r1) / (2 * Math.PI);
  const ws = 2 * Math.PI * fsHz;
  const c1F = 1 / (ws * ws * l1H);
  const q = (ws * l1H) / r1;
  const bandwidthHz = fsHz / q;
  if (![fsHz, r1, l1H, c1F, q].every((v) => Number.isFinite(v) && v > 0))
    return FAIL('conductance-peak fit gave non-physical values', xLen);
  // The vertex must be at the sampled peak (within a bandwidth or two steps), not elsewhere.
  const stepHz = Math.max(
    Math.abs(x[Math.min(xLen - 1, peakIndex - lo + 1)] - x[Math.max(0, peakIndex - lo - 1)]) / 2,
    0,
  );
  if (Math.abs(delta) > Math.max(bandwidthHz, 2 * stepHz))
    return FAIL('conductance-peak vertex lies away from the sampled peak', xLen);

  let uncertainty: ConductancePeakResult['uncertainty'];
  const dof = xLen - 3;
  if (dof > 0) {
    evaluate(delta, r1, k, true);
    const inv = invertSmall(normal.a);
    if (inv) {
      const s2 = cur.sse / dof;
      const cov = inv.map((row) => row.map((v) => v * s2)); // order R, K, fs
      // ln L1 = ½ ln K + ½ ln R − ln 2π; ln C1 = −2 ln fs − ln L1 + const; ln Q = ln fs + ln L1 − ln R.
      const gL = [l1H / (2 * r1), l1H / (2 * k), 0];
      const gC = [-c1F / (2 * r1), -c1F / (2 * k), (-2 * c1F) / fsHz];
      const gQ = [q * (1 / (2 * r1) - 1 / r1), q / (2 * k), q / fsHz];
      uncertainty = {
        fsHz: Math.sqrt(Math.max(0, cov[2][2])),
        r1Ohm: Math.sqrt(Math.max(0, cov[0][0])),
        l1H: propagate(gL, cov),
        c1F: propagate(gC, cov),
        q: propagate(gQ, cov),
      };
    }
  }
  return {
    ok: true,
    reason: 'ok',
    fsHz,
    r1Ohm: r1,
    l1H,
    c1F,
    q,
    bandwidthHz,
    uncertainty,
    points: xLen,
    rmsRelative: Math.sqrt(cur.sse / xLen),
  };
}
