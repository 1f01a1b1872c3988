/**
 * Finding the resonances of one sweep of the part alone.
 *
 * A series resonance is a peak of the conductance G = Re Y (Gmax = 1/R1 exactly at fs; C0 only
 * adds susceptance — derived from the BVD model). Peaks are accepted by topographic prominence
 * against the noise estimated from the data in a window around each peak (sweep-noise.ts),
 * whichever of these is higher, times `prominenceSigmas`:
 * - the relative noise of Y times |Y| (relative noise on Z is relative noise on Y), so noise
 *   wiggles on a resonance's flanks are not taken for modes;
 * - the absolute noise of G. A fixture converts its own noise into Z with the sensitivity
 *   |dZ/dS|, so where the part is far from the fixture's accurate range (reflection or
 *   shunt-through near the anti-resonance, derived from the fixture conversions) the noise of Y
 *   is many times the sweep's typical relative noise and roughly constant in absolute terms.
 * Being local, the estimates also keep a resonance in the fixture's accurate range from being
 * judged by the noise of a worse region elsewhere in the same sweep.
 * A peak must also be shaped like a resonance: the motional admittance traces a circle, so the
 * susceptance swings down by about Gmax across the peak; noise that happens to peak in G does
 * not. Each peak is then refined by the conductance-peak fit; two maxima refined onto the same
 * resonance (fs closer than half a bandwidth) are one, the higher kept. Finally the
 * zero-phase crossings above it (fr: B falls through 0, fa: B rises through 0; IEEE Std 177
 * symbols) and the |Z| maximum fn are located. Works unchanged for Q from a few hundred
 * (ceramic) to 10⁵ and for tuning forks: nothing depends on the absolute frequency or bandwidth.
 */
import type { Diagnostic } from './types.ts';
import type { AdmittanceSweep } from './part-alone.ts';
import { fitConductancePeak, type ConductancePeakResult } from './conductance-peak.ts';
import { crossingBetween, parabolaVertex } from './interpolate.ts';
import { median, sweepNoise } from './sweep-noise.ts';
import { susceptanceSwing } from './susceptance-swing.ts';
import { formatFrequency, formatFrequencyRange } from './format-frequency.ts';

/** One series resonance seen in one sweep. */
export interface Resonance {
  /** Index of the sampled conductance maximum. */
  peakIndex: number;
  /** Best estimate of fs in this sweep (conductance-peak fit, else the sampled peak), Hz. */
  fsHz: number;
  /** 1/Gmax, Ω. */
  r1Ohm: number;
  /** Half-power bandwidth fs/Q, Hz (estimated from the sampled peak when the fit failed). */
  bandwidthHz: number;
  /** Local frequency step at the peak, Hz. */
  stepHz: number;
  /** Points per half-power bandwidth (bandwidth / step). */
  pointsPerBandwidth: number;
  /** The peak is not fully inside the sweep (at the first/last points, or a half-power point outside). */
  atEdge: boolean;
  /**
   * The conductance does not fall on both sides of the maximum within the sweep (it is the first
   * or last point, or one flank runs off the sweep): the resonance may lie outside.
   */
  atBoundary: boolean;
  /** Two modes closer than the sweep can separate (merged peaks or a peak not shaped like one mode). */
  unresolved: boolean;
  /** The conductance-peak fit of this peak. */
  conductance: ConductancePeakResult;
  /** Lower zero-phase frequency above the peak (B falls through 0), Hz, when in the sweep. */
  frHz?: number;
  /** Upper zero-phase frequency (B rises through 0), Hz, when in the sweep. */
  faHz?: number;
  /** Maximum of |Z| between this peak and the next one, Hz, when inside the sweep. */
  fnHz?: number;
}

/** All resonances of a sweep plus what was noticed on the way. */
export interface FindResonancesResult {
  resonances: Resonance[];
  diagnostics: Diagnostic[];
  /** Estimated relative noise of Y (≈ relative noise of Z) over the whole sweep (median), dimensionless. */
  noiseRelative: number;
}

/** Options of {@link findResonances}. */
export interface FindResonancesOptions {
  /** Peaks need a prominence of this many noise standard deviations (relative and local). Default 8. */
  prominenceSigmas?: number;
  /** …and at least this fraction of |Y| at the peak (rejects fixture ripple). Default 3e-3. */
  minRelativeProminence?: number;
  /**
   * Flag a peak whose shape does not fit one mode as unresolved. Default true; off for sweeps
   * whose noise is not proportional to the part's |Y| (a series capacitor removed from Z).
   */
  shapeCheck?: boolean;
}

/** Stand-in for peaks that are not fitted (not confirmed on both sides). */
const NOT_FITTED: ConductancePeakResult = {
  ok: false,
  reason: 'peak not inside the sweep',
  fsHz: 0,
  r1Ohm: 0,
  l1H: 0,
  c1F: 0,
  q: 0,
  bandwidthHz: 0,
  points: 0,
  rmsRelative: 0,
};

/**
 * A peak's susceptance swing must be at least this fraction of the one its conductance peak
 * implies (1 for a lone resonance; see susceptance-swing.ts)…
 */
export const MIN_SWING = 0.5;

/** …and at least this many of its standard errors (noise gives 0 ± one). */
export const MIN_SWING_SIGMAS = 3;

/**
 * A peak this many local noise deviations above the median G of its window is not noise,
 * whatever its shape: the susceptance test is waived (a mode sampled far more coarsely than
 * its bandwidth shows no usable swing).
 */
export const STRONG_PEAK_SIGMAS = 20;

/**
 * Find every series resonance (and its anti-resonance, when swept) in a sweep of the part alone.
 * A sweep with no resonance gives an error diagnostic saying what the sweep does show.
 */
export function findResonances(sweep: AdmittanceSweep, options: FindResonancesOptions = {}): FindResonancesResult {
  const { freqHz: f, gS: g, bS: b } = sweep;
  const n = f.length;
  const diagnostics: Diagnostic[] = [];
  const yAbs = new Float64Array(n);
  for (let i = 0; i < n; i++) yAbs[i] = Math.hypot(g[i], b[i]);
  const noiseOf = sweepNoise(g, b, yAbs);
  const noise = noiseOf.relative;
  const sigmas = options.prominenceSigmas ?? 8;
  const minRel = options.minRelativeProminence ?? 3e-3;
  // Threshold relative to |Y|, but never below a tenth of the sweep's median |Y|: near an
  // anti-resonance |Y| collapses and a tiny absolute error (fixture compensation) would pass.
  const yFloor = 0.1 * median(yAbs);
  const floorThreshold = (i: number) => minRel * Math.max(yAbs[i], yFloor);
  // Prominence needed at i: the larger of the local relative noise (times |Y|, floored) and the
  // local absolute noise of G, times `sigmas`, and never below the ripple floor.
  const threshold = (i: number) =>
    Math.max(
      floorThreshold(i),
      sigmas * noiseOf.relativeAt(i) * Math.max(yAbs[i], yFloor),
      sigmas * noiseOf.conductanceAt(i),
    );

  // Walk each side of maximum i until a higher point (not a peak), a drop by `thr` (confirmed),
  // or the sweep end (judged by the other side; then flagged as one-sided).
  // Returns 0 not prominent, 1 one-sided, 2 confirmed on both sides.
  const prominence = (i: number, thr: number): number => {
    const level = g[i] - thr;
    let sides = 0;
    let edges = 0;
    for (let dir = -1; dir <= 1; dir += 2) {
      let side = 0; // 0 edge, 1 dropped, −1 higher
      for (let k = i + dir; k >= 0 && k < n; k += dir) {
        if (g[k] > g[i]) {
          side = -1;
          break;
        }
        if (g[k] < level) {
          side = 1;
          break;
        }
      }
      if (side < 0) return 0;
      if (side === 1) sides++;
      else edges++;
    }
    return sides === 0 ? 0 : edges > 0 ? 1 : 2;
  };

  // Candidate maxima with enough prominence on both sides (a side reaching the sweep end counts).
  const peaks: number[] = [];
  // Peaks confirmed on one side only (the other runs off the sweep): a resonance outside.
  const oneSided = new Set<number>();
  for (let i = 0; i < n; i++) {
    const left = i > 0 ? g[i - 1] : -Infinity;
    const right = i < n - 1 ? g[i + 1] : -Infinity;
    if (!(g[i] > left && g[i] >= right) || n < 3) continue;
    // The floor is the lowest threshold: a maximum not prominent against it is no peak, and
    // the local noise need not be estimated.
    const floor = floorThreshold(i);
    if (!(g[i] > floor) || prominence(i, floor) === 0) continue;
    const thr = threshold(i);
    if (!(g[i] > thr)) continue;
    const p = prominence(i, thr);
    if (p === 0) continue;
    peaks.push(i);
    if (p === 1) oneSided.add(i);
  }

  // Peaks within three samples of each other are one feature the sweep cannot separate.
  const merged: Array<{ i: number; unresolved: boolean; oneSided: boolean }> = [];
  for (const p of peaks) {
    const last = merged[merged.length - 1];
    if (last && p - last.i < 3) {
      if (g[p] > g[last.i]) {
        last.i = p;
        last.oneSided = oneSided.has(p);
      }
      last.unresolved = true;
    } else merged.push({ i: p, unresolved: false, oneSided: oneSided.has(p) });
  }

  // Refine each peak; keep those shaped like a resonance.
  const refined: Resonance[] = [];
  let noSwing = 0;
  for (const m of merged) {
    const { i } = m;
    const step = i === 0 ? f[1] - f[0] : i === n - 1 ? f[n - 1] - f[n - 2] : 0.5 * (f[i + 1] - f[i - 1]);
    const atBoundary = i === 0 || i === n - 1 || m.oneSided;
    const fit = atBoundary ? NOT_FITTED : fitConductancePeak(f, g, yAbs, i);
    let fsHz = f[i];
    let r1Ohm = 1 / g[i];
    let bandwidthHz: number;
    if (fit.ok && !atBoundary) {
      fsHz = fit.fsHz;
      r1Ohm = fit.r1Ohm;
      bandwidthHz = fit.bandwidthHz;
    } else {
      // Width of the sampled peak at half its height (at least one step).
      let lo = i;
      let hi = i;
      while (lo > 0 && g[lo] >= g[i] / 2) lo--;
      while (hi < n - 1 && g[hi] >= g[i] / 2) hi++;
      bandwidthHz = Math.max(step, f[hi] - f[lo]);
      if (!atBoundary) {
        const v = parabolaVertex([f[i - 1], f[i], f[i + 1]], [1 / g[i - 1], 1 / g[i], 1 / g[i + 1]]);
        if (v && v.y > 0 && v.y <= 1 / g[i] && Math.abs(v.x - f[i]) <= step) {
          fsHz = v.x;
          r1Ohm = v.y;
        }
      }
    }
    const strong = g[i] - noiseOf.backgroundAt(i) > STRONG_PEAK_SIGMAS * noiseOf.conductanceAt(i);
    if (!atBoundary && !strong) {
      // Judged against the sampled peak height when the fit extrapolates far above it.
      const swing = susceptanceSwing(f, b, i, fsHz, Math.max(r1Ohm, 0.5 / g[i]), bandwidthHz, step);
      if (swing && !(swing.gamma >= MIN_SWING && swing.gamma >= MIN_SWING_SIGMAS * swing.gammaSigma)) {
        noSwing++;
        continue;
      }
    }
    const ppbw = bandwidthHz / step;
    const fLow = fsHz - bandwidthHz / 2;
    const fHigh = fsHz + bandwidthHz / 2;
    const atEdge = atBoundary || i <= 1 || i >= n - 2 || fLow < f[0] || fHigh > f[n - 1];
    // Peak shape: a lone mode fits the conductance model to the noise; two close modes do not.
    const misfit = (options.shapeCheck ?? true) && fit.ok && ppbw >= 4 && fit.rmsRelative > Math.max(20 * noise, 2e-3);
    refined.push({
      peakIndex: i,
      fsHz,
      r1Ohm,
      bandwidthHz,
      stepHz: step,
      pointsPerBandwidth: ppbw,
      atEdge,
      atBoundary,
      unresolved: m.unresolved || misfit,
      conductance: fit,
    });
  }
  if (noSwing > 0) {
    diagnostics.push({
      code: 'signal-to-noise',
      severity: 'info',
      sweep: sweep.source,
      message: `sweep ${sweep.source}: ${noSwing} conductance peak${noSwing > 1 ? 's' : ''} without the susceptance swing of a resonance ignored as noise`,
    });
  }

  // Two maxima refined onto one resonance (fs closer than half a bandwidth): keep the higher.
  const resonances: Resonance[] = [];
  for (const r of refined) {
    const last = resonances[resonances.length - 1];
    if (
      last &&
      !r.atBoundary &&
      !last.atBoundary &&
      Math.abs(r.fsHz - last.fsHz) < 0.5 * Math.max(r.bandwidthHz, last.bandwidthHz)
    ) {
      if (g[r.peakIndex] > g[last.peakIndex]) resonances[resonances.length - 1] = r;
      continue;
    }
    resonances.push(r);
  }

  // Zero-phase crossings and |Z| maximum between each peak and the next.
  for (let k = 0; k < resonances.length; k++) {
    const res = resonances[k];
    const i = res.peakIndex;
    const next = k + 1 < resonances.length ? resonances[k + 1].peakIndex : n;
    let j = i;
    while (j < next - 1 && !(b[j] > 0 && b[j + 1] <= 0)) j++;
    if (j < next - 1 && b[j] > 0 && b[j + 1] <= 0) {
      res.frHz = crossingBetween(f, b, j, 0);
      let m = j + 1;
      while (m < next - 1 && !(b[m] < 0 && b[m + 1] >= 0)) m++;
      if (m < next - 1 && b[m] < 0 && b[m + 1] >= 0) res.faHz = crossingBetween(f, b, m, 0);
    }
    let best = -1;
    for (let m = i + 1; m < next; m++) if (best < 0 || yAbs[m] < yAbs[best]) best = m;
    if (best > i + 1 && best < Math.min(next, n) - 1 && best < n - 1) {
      const v = parabolaVertex([f[best - 1], f[best], f[best + 1]], [yAbs[best - 1], yAbs[best], yAbs[best + 1]]);
      res.fnHz = v && Math.abs(v.x - f[best]) <= f[best + 1] - f[best - 1] ? v.x : f[best];
    }
  }

  for (const r of resonances) {
    if (r.unresolved) {
      diagnostics.push({
        code: 'modes-unresolved',
        severity: 'warning',
        sweep: sweep.source,
        message: `sweep ${sweep.source}: two or more modes near ${formatFrequency(r.fsHz, 7)} are closer than the sweep resolves; use a finer step there`,
      });
    }
    if (r.atEdge && !r.atBoundary) {
      diagnostics.push({
        code: 'resonance-at-edge',
        severity: 'info',
        sweep: sweep.source,
        message: `sweep ${sweep.source}: resonance near ${formatFrequency(r.fsHz, 7)} is cut by the sweep edge; widen the span to ±5 bandwidths`,
      });
    } else if (r.atBoundary) {
      diagnostics.push({
        code: 'resonance-at-edge',
        severity: 'warning',
        sweep: sweep.source,
        message: `sweep ${sweep.source}: conductance rises to the sweep edge at ${formatFrequency(f[r.peakIndex], 7)}; a resonance may lie just outside — widen the span`,
      });
    }
  }

  if (!resonances.some((r) => !r.atBoundary) && n > 0) {
    diagnostics.push({
      code: 'no-resonance',
      severity: 'error',
      sweep: sweep.source,
      message: `sweep ${sweep.source}: no resonance: ${describeFlat(sweep)}`,
    });
  }
  return { resonances, diagnostics, noiseRelative: noise };
}

/**
 * What a sweep without a resonance shows, and what to do: "capacitive only between 3.97 and
 * 4.03 MHz; sweep across the expected resonance, and check the fixture and the frequency unit".
 */
function describeFlat(sweep: AdmittanceSweep): string {
  const { freqHz: f, bS: b } = sweep;
  const n = f.length;
  const range = formatFrequencyRange(f[0], f[n - 1]);
  let pos = 0;
  for (let i = 0; i < n; i++) if (b[i] > 0) pos++;
  const advice = 'sweep across the expected resonance, and check the fixture and the frequency unit';
  if (pos === n) return `capacitive only between ${range}; ${advice}`;
  if (pos === 0) return `inductive only between ${range}; ${advice}`;
  return `no conductance peak above the noise between ${range}; sweep across the expected resonance, or average to reduce the noise`;
}
