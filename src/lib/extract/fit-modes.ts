/**
 * The least-squares fits of a sample: one per mode on a window of its best-resolved sweep
 * (that branch free, the others held at their quick estimates), then one joint fit over every
 * reference-condition sweep (narrow, loaded, wide; trusted frequencies only) with every
 * well-fitted, unflagged branch and C0 free. The fitter itself is fit-bvd.ts (Levenberg–Marquardt).
 *
 * A per-mode window only holds C0 when it reaches away from the resonance (or covers the
 * anti-resonance); otherwise C0 is held at the capacitive-region estimate, since a window of a
 * few bandwidths barely constrains it. Between the two, the modes are screened
 * (screen-modes.ts): duplicates of a stronger mode and spurious sightings without a converged
 * fit are left out of the joint fit, so they cannot distort it. When the joint fit fails on one branch the data
 * do not determine, that branch is held at its window-fit value and the others are fitted
 * again; a joint fit that still fails is retried with the main modes only.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { ModeCandidate } from './classify-modes.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import { fitBvd, type FitBvdResult, type FitSweep } from './fit-bvd.ts';
import { impedanceSigmaOhm, noiseFromResiduals, type RecordedNoise } from './measurement-noise.ts';
import type { RecordedQuantity } from '../sweep/sweep.ts';
import { screenModes, type ModeEstimate, type ScreenModesResult } from './screen-modes.ts';
import { timed, type TimingCollector } from './timing.ts';

/** Window half-width around fs (and fa) in bandwidths. */
export const WINDOW_BANDWIDTHS = 8;
/** …and at least this many steps. */
export const WINDOW_STEPS = 12;

/** Fits of all modes. */
export interface ModeFits {
  /** Per-mode window fit, by mode index (undefined when not attempted). */
  perMode: Array<FitBvdResult | undefined>;
  joint?: FitBvdResult;
  /** Modes (indices into the mode list) free in the joint fit. */
  jointFree: number[];
  /** Branch index of each mode in the joint model, −1 when left out. */
  jointIndex: number[];
  /** Model the joint fit started from. */
  jointStart?: BvdModel;
  /** Duplicates and unreportable spurious modes (not to be reported; `excluded` ones left out of the joint fit). */
  screen: ScreenModesResult;
  /** Noise of each sweep of the joint fit as its final weights used it (from the fit's residuals). */
  jointNoise: Array<{ source: string; noise: RecordedNoise }>;
}

/** Bandwidth fs/Q = 2π·fs²·R1·C1 of a branch, Hz (derived from the BVD model). */
function bandwidthOf(b: { fsHz: number; r1Ohm: number; c1F: number }): number {
  return 2 * Math.PI * b.fsHz * b.fsHz * b.r1Ohm * b.c1F;
}

/** The points of a sweep that `keep` accepts, with their recorded quantity and noise. */
interface SelectedSweep extends FitSweep {
  sigmaZOhm: Float64Array;
  recorded: RecordedQuantity;
  /** The sweep's noise estimate before any fit. */
  noise: RecordedNoise;
}

function selectPoints(s: PreparedSweep, keep: (f: number) => boolean): SelectedSweep | undefined {
  const f = s.impedance.freqHz;
  const idx: number[] = [];
  for (let i = 0; i < f.length; i++) if (keep(f[i])) idx.push(i);
  if (idx.length === 0) return undefined;
  const base = {
    source: s.source,
    noise: s.noise,
    addedCapacitanceF: s.loaded ? s.addedCF : undefined,
    addedConnection: s.loaded ? s.connection : undefined,
  };
  if (idx.length === f.length)
    return {
      freqHz: f,
      zRe: s.impedance.zRe,
      zIm: s.impedance.zIm,
      sigmaZOhm: s.sigmaZOhm,
      recorded: s.recorded,
      ...base,
    };
  const pick = (a: Float64Array) => Float64Array.from(idx, (i) => a[i]);
  const r = s.recorded;
  return {
    freqHz: pick(f),
    zRe: pick(s.impedance.zRe),
    zIm: pick(s.impedance.zIm),
    sigmaZOhm: pick(s.sigmaZOhm),
    recorded: {
      name: r.name,
      re: pick(r.re),
      im: pick(r.im),
      map: Float64Array.from({ length: 8 * idx.length }, (_, j) => r.map[8 * idx[j >> 3] + (j & 7)]),
    },
    ...base,
  };
}

/**
 * Rounds of noise re-estimation after the joint fit: each takes the noise of every sweep from
 * the fit's residuals (measurement-noise.ts) and fits again with the new weights. Two rounds
 * settle the weights (the second changes the parameters by a small part of their uncertainty).
 */
export const NOISE_ROUNDS = 1;

/** Stopping rule of the first joint fit, in standard errors (the refit uses the optimiser's default). */
const FIRST_FIT_OFFSET_TOLERANCE = 0.01;

/** Refit with each sweep's noise taken from the residuals of `fit`; returns the last converged fit and the noise used. */
function reweighted(
  data: SelectedSweep[],
  fit: FitBvdResult,
  run: (d: SelectedSweep[], start: BvdModel) => FitBvdResult,
): { fit: FitBvdResult; noise: RecordedNoise[] } {
  let current = fit;
  const estimate = (fitted: FitBvdResult) => {
    const residuals = fitted.residualsBySweep!();
    return data.map((d, s) => noiseFromResiduals(d.recorded, d, residuals[s]));
  };
  let estimates = estimate(current);
  for (let round = 0; round < NOISE_ROUNDS; round++) {
    // Weights at the model's values, so no point's weight depends on its own noise.
    const next = data.map((d, s) => ({
      ...d,
      sigmaZOhm: impedanceSigmaOhm(d.recorded, estimates[s].noise, estimates[s].modelM),
      zForWeight: estimates[s].modelZ,
    }));
    const refit = run(next, current.model);
    if (!refit.converged || !refit.residualsBySweep) break;
    current = refit;
    if (round + 1 < NOISE_ROUNDS) estimates = estimate(current);
  }
  return { fit: current, noise: estimates.map((e) => e.noise) };
}

/** Window fit of mode k on its best sweep. */
export function fitModeWindow(
  mode: ModeCandidate,
  k: number,
  initial: BvdModel,
  sweeps: PreparedSweep[],
): FitBvdResult | undefined {
  const sweep = sweeps.find((s) => s.index === mode.best.sweepIndex);
  if (!sweep) return undefined;
  const res = mode.best.resonance;
  const fs = initial.branches[k].fsHz;
  const bw = Math.max(res.bandwidthHz, 1e-12);
  const w = Math.max(WINDOW_BANDWIDTHS * bw, WINDOW_STEPS * res.stepHz);
  const fa = res.faHz;
  const keep = (f: number) => Math.abs(f - fs) <= w || (fa !== undefined && Math.abs(f - fa) <= w);
  const data = selectPoints(sweep, keep);
  if (!data) return undefined;
  const q = fs / bw;
  let offResonance = 0;
  for (const f of data.freqHz) if (Math.abs(f / fs - 1) > 50 / q) offResonance++;
  const fitC0 = fa !== undefined || offResonance >= 10;
  const first = fitBvd([data], initial, { freeBranches: [k], fitC0 });
  if (first.converged || !fitC0) return first;
  const second = fitBvd([data], initial, { freeBranches: [k], fitC0: false });
  return second.converged ? second : first;
}

/**
 * Per-mode window fits, then the joint fit. Modes with neither a converged window fit nor a
 * usable quick estimate are left out of the joint model (they will be dropped), so a
 * spurious sighting cannot distort it; `joint.model.branches` is therefore indexed through
 * `jointIndex`.
 * @param quickOk modes whose conductance-peak estimate can stand in for a failed fit
 * @param flagged modes above the instrument's trusted range: held fixed in the joint fit
 * @param trustedMaxHz points above this frequency are left out of the joint fit
 */
export function fitModes(
  modes: ModeCandidate[],
  initial: BvdModel,
  sweeps: PreparedSweep[],
  quickOk: boolean[],
  flagged: boolean[],
  trustedMaxHz: number | undefined,
  timing?: TimingCollector,
): ModeFits {
  const perMode: Array<FitBvdResult | undefined> = modes.map((mode, k) =>
    timed(timing, 'fit-mode', () => fitModeWindow(mode, k, initial, sweeps)),
  );
  const converged = perMode.map((r) => r?.converged === true);
  const estimates: Array<ModeEstimate | undefined> = modes.map((_, k) => {
    if (!converged[k] && !quickOk[k]) return undefined;
    const b = converged[k] ? perMode[k]!.model.branches[k] : initial.branches[k];
    return { fsHz: b.fsHz, r1Ohm: b.r1Ohm, bandwidthHz: bandwidthOf(b), fitted: converged[k] };
  });
  const screen = screenModes(modes, estimates);
  const included = modes.map((_, k) => k).filter((k) => (converged[k] || quickOk[k]) && !screen.excluded[k]);
  const jointIndex = modes.map((_, k) => included.indexOf(k));
  const start: BvdModel = {
    ...initial,
    branches: included.map((k) => ({ ...(converged[k] ? perMode[k]!.model.branches[k] : initial.branches[k]) })),
  };
  let free = included.filter((k) => converged[k] && !flagged[k]);
  const none: ModeFits = { perMode, jointFree: [], jointIndex, screen, jointNoise: [] };
  if (free.length === 0) return none;
  const data = sweeps
    .map((s) => selectPoints(s, (f) => trustedMaxHz === undefined || f <= trustedMaxHz))
    .filter((d): d is SelectedSweep => d !== undefined);
  if (data.length === 0) return none;
  const fitJoint = (d: SelectedSweep[], from: BvdModel, ks: number[], offsetTolerance?: number) =>
    timed(timing, 'fit-joint', () =>
      fitBvd(d, from, { freeBranches: ks.map((k) => jointIndex[k]), fitC0: true, offsetTolerance }),
    );
  // The first joint fit only has to come close enough for the noise estimate: its weights are
  // refined and the fit run again from its result to full precision.
  const run = (ks: number[]) => fitJoint(data, start, ks, FIRST_FIT_OFFSET_TOLERANCE);
  let joint = run(free);
  // A branch the data do not determine is held at its window-fit value and the rest refitted.
  while (!joint.converged && joint.failedBranch !== undefined && free.length > 1) {
    const k = free.find((kk) => jointIndex[kk] === joint.failedBranch);
    if (k === undefined) break;
    free = free.filter((kk) => kk !== k);
    joint = run(free);
  }
  if (!joint.converged) {
    const mains = free.filter((k) => !modes[k].spurious);
    if (mains.length && mains.length < free.length) {
      const retry = run(mains);
      if (retry.converged) {
        joint = retry;
        free = mains;
      }
    }
  }
  let jointNoise: ModeFits['jointNoise'] = data.map((d) => ({ source: d.source, noise: d.noise }));
  if (joint.converged && joint.residualsBySweep) {
    const ks = free;
    const settled = reweighted(data, joint, (d, from) => fitJoint(d, from, ks));
    joint = settled.fit;
    jointNoise = data.map((d, s) => ({ source: d.source, noise: settled.noise[s] }));
  }
  return { perMode, joint, jointFree: free, jointIndex, jointStart: start, screen, jointNoise };
}
