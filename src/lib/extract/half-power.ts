/**
 * Half-power (±45°) bandwidth method on the conductance G = Re Y.
 *
 * The motional arm's reactance is ±R1 exactly where G = Gmax/2, so (derived from the BVD model;
 * IEC 60444-5 admittance-circle analysis):
 *   f+ − f− = Δf = R1/(2πL1),  f+·f− = fs²,  L1 = R1/(2πΔf),  C1 = 1/((2πfs)²L1),  Q = fs/Δf.
 * No C0 compensation is needed on G (C0 only adds susceptance). Each crossing is located by
 * quadratic interpolation of 1/G through three neighbouring points (1/G is a parabola in f
 * near a resonance), falling back to linear interpolation when the quadratic has no root there.
 */
import { parabolaVertex, quadraticCrossing } from './interpolate.ts';

/** Result of the half-power method; numbers finite when `ok`. */
export interface HalfPowerResult {
  ok: boolean;
  reason: string;
  fLowHz: number;
  fHighHz: number;
  bandwidthHz: number;
  /** √(f+·f−), Hz. */
  fsHz: number;
  r1Ohm: number;
  l1H: number;
  c1F: number;
  q: number;
}

const FAIL = (reason: string): HalfPowerResult => ({
  ok: false,
  reason,
  fLowHz: 0,
  fHighHz: 0,
  bandwidthHz: 0,
  fsHz: 0,
  r1Ohm: 0,
  l1H: 0,
  c1F: 0,
  q: 0,
});

/** Frequency where G falls to `half` between indices i (below) and j (above or at), from 3 points. */
function crossing(
  freqHz: ArrayLike<number>,
  gS: ArrayLike<number>,
  outer: number,
  inner: number,
  half: number,
): number {
  const n = freqHz.length;
  const dir = inner > outer ? 1 : -1;
  // Three points: outer, inner, and the next one toward the peak (or beyond outer at the edge).
  let third = inner + dir;
  if (third < 0 || third >= n) third = outer - dir;
  const idx = [outer, inner, third].filter((i) => i >= 0 && i < n).sort((a, b) => a - b);
  const target = 1 / half;
  if (idx.length === 3 && idx.every((i) => gS[i] > 0)) {
    const x = idx.map((i) => freqHz[i]);
    const y = idx.map((i) => 1 / gS[i]);
    const r = quadraticCrossing(x, y, target, freqHz[outer], freqHz[inner]);
    if (r !== undefined) return r;
  }
  // Linear interpolation in G.
  const t = (half - gS[outer]) / (gS[inner] - gS[outer]);
  return freqHz[outer] + t * (freqHz[inner] - freqHz[outer]);
}

/**
 * Half-power points of the conductance peak at `peakIndex`.
 * @param gMaxS the peak conductance 1/R1, S; default: the sampled maximum refined by a
 *   parabola through 1/G at the three top points
 */
export function halfPower(
  freqHz: ArrayLike<number>,
  gS: ArrayLike<number>,
  peakIndex: number,
  gMaxS?: number,
): HalfPowerResult {
  const n = freqHz.length;
  if (peakIndex <= 0 || peakIndex >= n - 1) return FAIL('conductance peak at the sweep edge');
  let gMax = gMaxS;
  if (gMax === undefined) {
    const v = parabolaVertex(
      [freqHz[peakIndex - 1], freqHz[peakIndex], freqHz[peakIndex + 1]],
      [1 / gS[peakIndex - 1], 1 / gS[peakIndex], 1 / gS[peakIndex + 1]],
    );
    gMax = v && v.y > 0 && v.y <= 1 / gS[peakIndex] ? 1 / v.y : gS[peakIndex];
  }
  if (!(gMax > 0)) return FAIL('no positive conductance peak');
  const half = gMax / 2;
  let i = peakIndex;
  while (i > 0 && gS[i] >= half) i--;
  if (gS[i] >= half) return FAIL('lower half-power point lies below the sweep start');
  let j = peakIndex;
  while (j < n - 1 && gS[j] >= half) j++;
  if (gS[j] >= half) return FAIL('upper half-power point lies above the sweep end');
  const fLow = crossing(freqHz, gS, i, i + 1, half);
  const fHigh = crossing(freqHz, gS, j, j - 1, half);
  const bw = fHigh - fLow;
  if (!(bw > 0)) return FAIL('half-power points out of order');
  const fs = Math.sqrt(fLow * fHigh);
  const r1 = 1 / gMax;
  const l1 = r1 / (2 * Math.PI * bw);
  const ws = 2 * Math.PI * fs;
  return {
    ok: true,
    reason: 'ok',
    fLowHz: fLow,
    fHighHz: fHigh,
    bandwidthHz: bw,
    fsHz: fs,
    r1Ohm: r1,
    l1H: l1,
    c1F: 1 / (ws * ws * l1),
    q: fs / bw,
  };
}
