/**
 * Is a conductance peak shaped like a resonance? Its susceptance must swing with it.
 *
 * The motional admittance 1/(R1 + jX) traces a circle through the origin (derived from the BVD model): with
 * u = X/R1 = (f − fs²/f)/bandwidth, G = G0/(1 + u²) and B = −G0·u/(1 + u²), so across the peak
 * B falls by G0 between the half-power points. The measured B over ±3 bandwidths (at least
 * ±3.5 steps) is fitted by least squares as a + c·(f − fs) + γ·Bm(f), the line taking up C0 and
 * the far modes. γ is about 1 for a resonance (more for one sampled more coarsely than its
 * bandwidth, whose sampled peak understates G0), and 0 ± its standard error for noise that
 * happens to peak in G.
 */
import { invertSmall } from './small-linalg.ts';

/** Result of {@link susceptanceSwing}. */
export interface SusceptanceSwing {
  /** Measured swing over the one the conductance peak implies (1 for a lone resonance). */
  gamma: number;
  /** Standard error of gamma from the fit residual (0 with no spare points). */
  gammaSigma: number;
  /** Points used. */
  points: number;
}

/** Most points used on each side of the peak. */
const MAX_SIDE_POINTS = 400;

/**
 * Fit the susceptance swing around the conductance peak at index `peakIndex`.
 * @param freqHz frequencies, Hz (rising)
 * @param bS susceptance, S
 * @param fsHz, r1Ohm, bandwidthHz the peak's estimates (G0 = 1/R1, bandwidth fs/Q)
 * @param stepHz local frequency step, Hz
 * @returns undefined with fewer than 5 points in the window or a singular fit
 */
export function susceptanceSwing(
  freqHz: ArrayLike<number>,
  bS: ArrayLike<number>,
  peakIndex: number,
  fsHz: number,
  r1Ohm: number,
  bandwidthHz: number,
  stepHz: number,
): SusceptanceSwing | undefined {
  const n = freqHz.length;
  const half = Math.max(3 * bandwidthHz, 3.5 * stepHz);
  if (!(half > 0) || !(r1Ohm > 0) || !(bandwidthHz > 0)) return undefined;
  let lo = peakIndex;
  let hi = peakIndex;
  while (lo > 0 && peakIndex - lo < MAX_SIDE_POINTS && fsHz - freqHz[lo - 1] <= half) lo--;
  while (hi < n - 1 && hi - peakIndex < MAX_SIDE_POINTS && freqHz[hi + 1] - fsHz <= half) hi++;
  const m = hi - lo + 1;
  if (m < 5) return undefined;
  const g0 = 1 / r1Ohm;
  // Normal equations of B/G0 ≈ a + c·x + γ·p, x = (f − fs)/half, p = Bm/G0.
  const ata = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const aty = [0, 0, 0];
  const shape = (f: number): number => {
    const u = (f - (fsHz * fsHz) / f) / bandwidthHz;
    return -u / (1 + u * u);
  };
  for (let k = lo; k <= hi; k++) {
    const f = freqHz[k];
    const row = [1, (f - fsHz) / half, shape(f)];
    const y = bS[k] / g0;
    for (let a = 0; a < 3; a++) {
      aty[a] += row[a] * y;
      for (let c = 0; c < 3; c++) ata[a][c] += row[a] * row[c];
    }
  }
  const inv = invertSmall(ata);
  if (!inv) return undefined;
  const sol = inv.map((r) => r[0] * aty[0] + r[1] * aty[1] + r[2] * aty[2]);
  const gamma = sol[2];
  if (!Number.isFinite(gamma)) return undefined;
  let ssr = 0;
  for (let k = lo; k <= hi; k++) {
    const f = freqHz[k];
    const r = bS[k] / g0 - (sol[0] + sol[1] * ((f - fsHz) / half) + gamma * shape(f));
    ssr += r * r;
  }
  const gammaSigma = m > 3 ? Math.sqrt((ssr / (m - 3)) * Math.max(0, inv[2][2])) : 0;
  return { gamma, gammaSigma: Number.isFinite(gammaSigma) ? gammaSigma : 0, points: m };
}
