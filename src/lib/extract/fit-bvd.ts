/**
 * Full complex least-squares fit of the BVD model to one or several impedance sweeps
 * (Levenberg–Marquardt; model of IEEE Std 177 / IEC 60444-5; crystal fitting as in Tsuzuki & Toki
 * 1976 and Byrne, Dyer, Peach & Doherty 1982).
 *
 * One parameter set explains every sweep given: a joint fit is a call with several sweeps
 * (narrow, wide, with a known capacitor across or in series with the part). Residuals are the
 * complex relative residuals (Zmeas − Zmod)/|Zmeas| and the Jacobian is analytic — see
 * residuals.ts for the model, the parameterisation (ppm offset of fs, ln R1, ln C1, ln C0,
 * Rs, Ls) and the derivatives; levenberg-marquardt.ts for the iteration and its stopping rules.
 *
 * Standard uncertainties come from the covariance (JᵀJ)⁻¹·s², s² = SSR/(m − n) the reduced χ²
 * (m residuals, two per point, n parameters), widened by √((1 + ρ)/(1 − ρ)) when the residuals'
 * lag-1 autocorrelation ρ shows structure the model does not explain, propagated to fs, R1, C1, L1 = 1/((2πfs)²C1) and
 * Q = 1/(2πfs R1 C1) through their gradients in the fitted parameters.
 *
 * Failure is a result: converged = false, a reason, the initial model and zero uncertainties.
 * Nothing here throws on bad data and no NaN reaches the model.
 */
import type { BvdModel } from '../models/bvd.ts';
import { levenbergMarquardt } from './levenberg-marquardt.ts';
import { createBvdResiduals, type BvdFitPoints } from './residuals.ts';
import type { FitSummary } from './types.ts';

/** One measured sweep given to the fit. */
export interface FitSweep {
  /** Frequencies, Hz (any order). */
  freqHz: Float64Array;
  /** Measured impedance of the part (plus the added capacitor, if any), Ω. */
  zRe: Float64Array;
  zIm: Float64Array;
  /** Source name (file) for messages. */
  source: string;
  /** Known capacitor present during this sweep, F, connected 'parallel' (across the part) or 'series' (in series). */
  addedCapacitanceF?: number;
  addedConnection?: 'parallel' | 'series';
  /** Optional relative weight (default 1); multiplies the squared residuals of this sweep. */
  weight?: number;
  /**
   * Standard deviation of each impedance point per component, Ω (measurement-noise.ts), same
   * length as freqHz. Absent: the relative residual (σZ = |Zmeas|).
   */
  sigmaZOhm?: Float64Array;
  /** Impedance at which each point's weight is evaluated, Ω (default the measured one; after a fit, the model's). */
  zForWeight?: { re: Float64Array; im: Float64Array };
}

/** Which parameters the fit may change. */
export interface FitBvdOptions {
  /** Indices of branches whose parameters are free; others fixed (default: all). */
  freeBranches?: number[];
  /** Fit C0 (default true). */
  fitC0?: boolean;
  /** Optional nuisance fixture parasitics to fit: series Rs, series Ls (default false: fixed at the model's values). */
  fitRs?: boolean;
  fitLs?: boolean;
  /** Only use points within this distance of the start fs of any free branch, Hz (default: all points). */
  windowHz?: number;
  /**
   * Stop when the remaining step is below this many standard errors (default the optimiser's
   * 1e-6). A fit whose weights are refined and which is run again may stop earlier.
   */
  offsetTolerance?: number;
  /** Maximum Levenberg–Marquardt iterations (default 200). */
  maxIterations?: number;
}

/**
 * Fit outcome: summary, model, standard uncertainties. On failure (converged = false) the model is
 * the initial one, `rmsResidual` is that of the initial model (0 when it cannot be evaluated),
 * uncertainties are 0 and `iterations` / `stop` describe the failed attempt.
 */
export interface FitBvdResult extends FitSummary {
  /** Best model (the initial model when the fit failed, with converged = false). */
  model: BvdModel;
  /** Standard uncertainties (covariance scaled by residual variance s² = SSR/(m−n)); 0 for fixed quantities and failed fits. */
  uncertainty: {
    c0F: number;
    rsOhm?: number;
    lsH?: number;
    /** One entry per model branch, same order. */
    branches: Array<{ fsHz: number; r1Ohm: number; c1F: number; l1H: number; q: number }>;
  };
  /** Covariance of the fitted parameters (names in `parameterNames`; see residuals.ts), when converged. */
  covariance?: number[][];
  parameterNames?: string[];
  /** Which stopping rule ended the iteration (levenberg-marquardt.ts StopRule). */
  stop?: string;
  /** Residuals of each input sweep (points inside the window, in order), when converged; computed on demand. */
  residualsBySweep?: () => SweepResiduals[];
  /**
   * Residual structure (converged fits): lag-1 autocorrelation of the weighted residuals along
   * frequency within each sweep, its significance limit 3/√N, and the factor the uncertainties
   * were widened by when it was exceeded (1 otherwise).
   */
  structure?: ResidualStructure;
  /**
   * On failure caused by one branch (fitted values not physical, fs outside the span, moved
   * too far, or not determined by the data): its index in the model. The caller may hold that
   * branch and fit the others again.
   */
  failedBranch?: number;
}

/** Lag-1 autocorrelation of a fit's weighted residuals and what it did to the uncertainties. */
export interface ResidualStructure {
  lag1: number;
  /** 3/√N: white residuals stay below it with probability 99.87 % (normal approximation). */
  limit: number;
  /** Factor applied to the standard uncertainties: √((1 + ρ)/(1 − ρ)) when ρ > limit, else 1. */
  inflation: number;
}

/** Significance of the lag-1 autocorrelation test, in standard errors (1/√N each). */
export const STRUCTURE_SIGMAS = 3;

/**
 * Lag-1 autocorrelation of residual pairs [re, im] along each sweep (the sequences of real
 * and of imaginary parts, pooled), not across sweep boundaries.
 * @param starts index of the first point of each sweep in the flattened points, plus the total
 */
export function residualStructure(r: Float64Array, starts: number[]): ResidualStructure {
  let num = 0;
  let den = 0;
  let pairs = 0;
  for (let s = 0; s + 1 < starts.length; s++) {
    for (let i = starts[s]; i < starts[s + 1]; i++) {
      den += r[2 * i] * r[2 * i] + r[2 * i + 1] * r[2 * i + 1];
      if (i + 1 < starts[s + 1]) {
        num += r[2 * i] * r[2 * i + 2] + r[2 * i + 1] * r[2 * i + 3];
        pairs += 2;
      }
    }
  }
  const lag1 = den > 0 ? num / den : 0;
  const limit = pairs > 0 ? STRUCTURE_SIGMAS / Math.sqrt(pairs) : Infinity;
  // A first-order autoregressive error with coefficient ρ has √((1 + ρ)/(1 − ρ)) times the
  // spread of a mean that white noise would give (effective sample size N·(1 − ρ)/(1 + ρ)).
  const rho = Math.min(lag1, 0.98);
  const inflation = lag1 > limit ? Math.sqrt((1 + rho) / (1 - rho)) : 1;
  return { lag1, limit, inflation };
}

/**
 * Zmeas − Zmod per point, Ω, and each point's leverage factor 2/(2 − h), h the point's share of
 * the hat matrix (its two rows). A point the fit bends to (high leverage) shows a small residual
 * whatever its noise; |Zmeas − Zmod|²·factor has expected value 2σZ² for every point, so noise
 * estimated from it is not fooled by such points.
 */
export interface SweepResiduals {
  re: Float64Array;
  im: Float64Array;
  leverageFactor: Float64Array;
}

/** Leverages are capped here so a point the fit passes through exactly keeps a finite correction. */
const MAX_POINT_LEVERAGE = 1.98;

/** Leverage factor 2/(2 − h) per point at x (see SweepResiduals). */
function leverageFactors(
  problem: ReturnType<typeof createBvdResiduals>,
  x: Float64Array,
  inverseNormal: Float64Array,
  np: number,
): Float64Array {
  const out = new Float64Array(np).fill(1);
  const m = problem.residualCount;
  const n = problem.parameterCount;
  const r = new Float64Array(m);
  const jac = new Float64Array(m * n);
  if (!problem.residualsAndJacobian(x, r, jac)) return out;
  const row = new Float64Array(n);
  for (let i = 0; i < np; i++) {
    let h = 0;
    for (const k of [2 * i, 2 * i + 1]) {
      for (let p = 0; p < n; p++) row[p] = jac[p * m + k];
      for (let p = 0; p < n; p++) {
        let t = 0;
        for (let q = 0; q < n; q++) t += inverseNormal[p * n + q] * row[q];
        h += row[p] * t;
      }
    }
    out[i] = 2 / (2 - Math.min(Math.max(h, 0), MAX_POINT_LEVERAGE));
  }
  return out;
}

/** A converged fit whose RMS relative residual exceeds this does not describe the data. */
export const MAX_RMS_RESIDUAL = 0.3;

/** A fitted R1, C1 or C0 with a relative standard uncertainty above this is not determined by the data. */
export const MAX_RELATIVE_UNCERTAINTY = 1;

/** A fitted R1, C1 or C0 that moved by more than this factor from its start value ran away. */
export const RESULT_FACTOR_LIMIT = 100;

/** Fitted Rs or Ls below −(this many) standard uncertainties is non-physical. */
const NEGATIVE_PARASITIC_SIGMAS = 3;

interface ResolvedOptions {
  freeBranches: number[];
  fitC0: boolean;
  fitRs: boolean;
  fitLs: boolean;
  windowHz: number;
  maxIterations: number;
}

function isPositive(v: number | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

function checkModel(model: BvdModel): string | null {
  if (!isPositive(model.c0F)) return `initial c0F ${model.c0F}: expected a positive number`;
  if (!Array.isArray(model.branches)) return 'initial model has no branches array';
  for (let k = 0; k < model.branches.length; k++) {
    const b = model.branches[k];
    if (!isPositive(b.fsHz) || !isPositive(b.r1Ohm) || !isPositive(b.c1F)) {
      return `initial branches[${k}] (fs ${b.fsHz} Hz, r1 ${b.r1Ohm} Ω, c1 ${b.c1F} F): expected positive numbers`;
    }
  }
  for (const key of ['rsOhm', 'lsH', 'cpF'] as const) {
    const v = model[key];
    if (v !== undefined && !Number.isFinite(v)) return `initial ${key} ${v}: expected a finite number`;
  }
  return null;
}

function resolveOptions(model: BvdModel, options: FitBvdOptions): ResolvedOptions | string {
  const all = model.branches.map((_, k) => k);
  const freeBranches = options.freeBranches ?? all;
  const seen = new Set<number>();
  for (const k of freeBranches) {
    if (!Number.isInteger(k) || k < 0 || k >= model.branches.length)
      return `free branch ${k}: expected an index 0…${model.branches.length - 1}`;
    if (seen.has(k)) return `free branch ${k} given twice`;
    seen.add(k);
  }
  const windowHz = options.windowHz ?? Infinity;
  if (!(windowHz > 0)) return `windowHz ${windowHz}: expected a positive number`;
  const maxIterations = options.maxIterations ?? 200;
  if (!Number.isInteger(maxIterations) || maxIterations < 1)
    return `maxIterations ${maxIterations}: expected a positive integer`;
  return {
    freeBranches: [...freeBranches].sort((a, b) => a - b),
    fitC0: options.fitC0 ?? true,
    fitRs: options.fitRs ?? false,
    fitLs: options.fitLs ?? false,
    windowHz,
    maxIterations,
  };
}

/** Flatten the sweeps into fit points (window applied), or return a reason. */
function collectPoints(
  sweeps: FitSweep[],
  model: BvdModel,
  o: ResolvedOptions,
): (BvdFitPoints & { starts: number[] }) | string {
  if (!Array.isArray(sweeps) || sweeps.length === 0) return 'no sweeps to fit';
  const centres = o.freeBranches.map((k) => model.branches[k].fsHz);
  const all = !Number.isFinite(o.windowHz);
  const inWindow = (f: number): boolean => {
    if (all) return true;
    for (const c of centres) if (Math.abs(f - c) <= o.windowHz) return true;
    return false;
  };
  let count = 0;
  for (const s of sweeps) {
    const n = s.freqHz?.length ?? 0;
    if (s.zRe?.length !== n || s.zIm?.length !== n)
      return `${s.source}: frequency and impedance arrays differ in length`;
    if (s.sigmaZOhm && s.sigmaZOhm.length !== n) return `${s.source}: frequency and noise arrays differ in length`;
    const weight = s.weight ?? 1;
    if (!isPositive(weight)) return `${s.source}: weight ${weight}: expected a positive number`;
    if (s.addedCapacitanceF !== undefined) {
      if (!isPositive(s.addedCapacitanceF))
        return `${s.source}: added capacitance ${s.addedCapacitanceF} F: expected a positive number`;
      if (s.addedConnection !== 'parallel' && s.addedConnection !== 'series') {
        return `${s.source}: added capacitor connection ${String(s.addedConnection)}: expected parallel or series`;
      }
    }
    for (let i = 0; i < n; i++) {
      const f = s.freqHz[i];
      if (!isPositive(f)) return `${s.source}: point ${i}: frequency ${f} Hz: expected a positive number`;
      if (!inWindow(f)) continue;
      const zr = s.zRe[i];
      const zi = s.zIm[i];
      if (!Number.isFinite(zr) || !Number.isFinite(zi))
        return `${s.source}: point ${i}: impedance ${zr} ${zi}: expected finite numbers`;
      if (zr === 0 && zi === 0) return `${s.source}: point ${i}: impedance is zero, so no relative residual`;
      if (s.sigmaZOhm && !isPositive(s.sigmaZOhm[i]))
        return `${s.source}: point ${i}: noise ${s.sigmaZOhm[i]} Ω: expected a positive number`;
      count++;
    }
  }
  const p: BvdFitPoints & { starts: number[] } = {
    freqHz: new Float64Array(count),
    zRe: new Float64Array(count),
    zIm: new Float64Array(count),
    weight: new Float64Array(count),
    parallelCapF: new Float64Array(count),
    seriesCapF: new Float64Array(count),
    sigmaZOhm: sweeps.some((s) => s.sigmaZOhm) ? new Float64Array(count) : undefined,
    zForWeight: sweeps.some((s) => s.zForWeight)
      ? { re: new Float64Array(count), im: new Float64Array(count) }
      : undefined,
    starts: [],
  };
  let j = 0;
  for (const s of sweeps) {
    const addedParallelF =
      s.addedCapacitanceF !== undefined && s.addedConnection === 'parallel' ? s.addedCapacitanceF : 0;
    const cSer = s.addedCapacitanceF !== undefined && s.addedConnection === 'series' ? s.addedCapacitanceF : 0;
    const weight = s.weight ?? 1;
    const { freqHz, zRe, zIm } = s;
    p.starts.push(j);
    for (let i = 0; i < freqHz.length; i++) {
      if (!inWindow(freqHz[i])) continue;
      p.freqHz[j] = freqHz[i];
      p.zRe[j] = zRe[i];
      p.zIm[j] = zIm[i];
      if (p.sigmaZOhm) p.sigmaZOhm[j] = s.sigmaZOhm ? s.sigmaZOhm[i] : Math.hypot(zRe[i], zIm[i]);
      if (p.zForWeight) {
        p.zForWeight.re[j] = s.zForWeight ? s.zForWeight.re[i] : zRe[i];
        p.zForWeight.im[j] = s.zForWeight ? s.zForWeight.im[i] : zIm[i];
      }
      p.weight[j] = weight;
      p.parallelCapF[j] = addedParallelF;
      p.seriesCapF[j] = cSer;
      j++;
    }
  }
  p.starts.push(j);
  return p;
}

function copyModel(model: BvdModel): BvdModel {
  return { ...model, branches: model.branches.map((b) => ({ ...b })) };
}

function zeroUncertainty(model: BvdModel, o?: ResolvedOptions): FitBvdResult['uncertainty'] {
  const u: FitBvdResult['uncertainty'] = {
    c0F: 0,
    branches: (model.branches ?? []).map(() => ({ fsHz: 0, r1Ohm: 0, c1F: 0, l1H: 0, q: 0 })),
  };
  if (o?.fitRs) u.rsOhm = 0;
  if (o?.fitLs) u.lsH = 0;
  return u;
}

/**
 * Fit the BVD model to the sweeps, starting from `initial`. Never throws for bad data or
 * numerical trouble; see {@link FitBvdResult} for what a failure returns.
 */
export function fitBvd(sweeps: FitSweep[], initial: BvdModel, options: FitBvdOptions = {}): FitBvdResult {
  const fail = (reason: string, extra: Partial<FitBvdResult> = {}, o?: ResolvedOptions): FitBvdResult => {
    let model: BvdModel;
    try {
      model = copyModel(initial);
    } catch {
      model = { c0F: 0, branches: [] };
    }
    return {
      converged: false,
      reason,
      iterations: 0,
      rmsResidual: 0,
      points: 0,
      ...extra,
      model,
      uncertainty: zeroUncertainty(model, o),
    };
  };

  const bad = initial ? checkModel(initial) : 'no initial model';
  if (bad) return fail(bad);
  const o = resolveOptions(initial, options);
  if (typeof o === 'string') return fail(o);
  const points = collectPoints(sweeps, initial, o);
  if (typeof points === 'string') return fail(points, {}, o);

  const problem = createBvdResiduals(points, initial, o);
  const n = problem.parameterCount;
  const m = problem.residualCount;
  const np = points.freqHz.length;
  if (n === 0) return fail('no free parameters', { points: np }, o);
  if (m <= n)
    return fail(
      `${np} points (${m} residuals) for ${n} parameters: need more residuals than parameters`,
      { points: np },
      o,
    );

  const lm = levenbergMarquardt(problem, problem.x0, {
    maxIterations: o.maxIterations,
    ...(options.offsetTolerance !== undefined ? { offsetTolerance: options.offsetTolerance } : {}),
  });
  const rmsFinal = problem.relativeRms(lm.x);
  const summary = {
    iterations: lm.iterations,
    rmsResidual: Number.isFinite(rmsFinal) ? rmsFinal : 0,
    points: np,
    stop: lm.stop,
  };
  // A failure returns the initial model, so its summary carries the initial model's RMS.
  const failed = (): typeof summary => {
    const rmsStart = problem.relativeRms(problem.x0);
    return { ...summary, rmsResidual: Number.isFinite(rmsStart) ? rmsStart : 0 };
  };
  if (!lm.converged || lm.inverseNormal === null) return fail(lm.reason, failed(), o);

  const model = problem.toModel(lm.x);
  const map = problem.map;
  if (!(rmsFinal <= MAX_RMS_RESIDUAL)) {
    return fail(
      `model does not describe the data: rms relative residual ${rmsFinal.toPrecision(3)} (limit ${MAX_RMS_RESIDUAL})`,
      failed(),
      o,
    );
  }

  // Covariance of the parameters, scaled by the reduced χ² and widened when the residuals are
  // structured, and propagation to reported quantities.
  const structure = residualStructure(lm.r, points.starts);
  const s2 = (lm.ssr / (m - n)) * structure.inflation * structure.inflation;
  const cov = (p: number, q: number): number => lm.inverseNormal![p * n + q] * s2;
  const u = zeroUncertainty(model, o);
  const fLo = problem.spanHz.min;
  const fHi = problem.spanHz.max;
  const x0 = problem.x0;
  for (const e of map.branches) {
    const br = model.branches[e.branch];
    const name = `branches[${e.branch}]`;
    const failedBranch = e.branch;
    if (![br.fsHz, br.r1Ohm, br.c1F].every(isPositive))
      return fail(`${name}: fitted values not finite and positive`, { ...failed(), failedBranch }, o);
    if (br.fsHz < fLo || br.fsHz > fHi)
      return fail(
        `${name}: fitted fs ${br.fsHz.toPrecision(10)} Hz outside the measured span ${fLo}…${fHi} Hz`,
        { ...failed(), failedBranch },
        o,
      );
    const factorR = Math.exp(Math.abs(lm.x[e.lnR1] - x0[e.lnR1]));
    const factorC = Math.exp(Math.abs(lm.x[e.lnC1] - x0[e.lnC1]));
    if (factorR > RESULT_FACTOR_LIMIT || factorC > RESULT_FACTOR_LIMIT) {
      return fail(
        `${name}: r1 or c1 moved by a factor ${Math.max(factorR, factorC).toPrecision(3)} from its start (limit ${RESULT_FACTOR_LIMIT}): the data do not determine it`,
        { ...failed(), failedBranch },
        o,
      );
    }
    const dFs = e.fs0Hz * 1e-6; // ∂fs/∂p
    const vP = cov(e.fsOffset, e.fsOffset);
    const vR = cov(e.lnR1, e.lnR1);
    const vC = cov(e.lnC1, e.lnC1);
    const cPR = cov(e.fsOffset, e.lnR1);
    const cPC = cov(e.fsOffset, e.lnC1);
    const cRC = cov(e.lnR1, e.lnC1);
    const a = dFs / br.fsHz; // ∂ln fs/∂p
    // ln L1 = −2 ln fs − ln C1 − ln 4π²;  ln Q = −ln fs − ln R1 − ln C1 − ln 2π
    const vLnL = 4 * a * a * vP + vC + 4 * a * cPC;
    const vLnQ = a * a * vP + vR + vC + 2 * a * cPR + 2 * a * cPC + 2 * cRC;
    const relR = Math.sqrt(Math.max(vR, 0));
    const relC = Math.sqrt(Math.max(vC, 0));
    if (!(relR <= MAX_RELATIVE_UNCERTAINTY) || !(relC <= MAX_RELATIVE_UNCERTAINTY)) {
      return fail(
        `${name}: not determined by the data (relative uncertainty r1 ${(100 * relR).toPrecision(3)} %, c1 ${(100 * relC).toPrecision(3)} %)`,
        { ...failed(), failedBranch },
        o,
      );
    }
    const l1H = 1 / ((2 * Math.PI * br.fsHz) ** 2 * br.c1F);
    const q = 1 / (2 * Math.PI * br.fsHz * br.r1Ohm * br.c1F);
    u.branches[e.branch] = {
      fsHz: dFs * Math.sqrt(Math.max(vP, 0)),
      r1Ohm: br.r1Ohm * relR,
      c1F: br.c1F * relC,
      l1H: l1H * Math.sqrt(Math.max(vLnL, 0)),
      q: q * Math.sqrt(Math.max(vLnQ, 0)),
    };
  }
  if (map.c0 >= 0) {
    if (!isPositive(model.c0F)) return fail('fitted c0 not finite and positive', failed(), o);
    const factor = Math.exp(Math.abs(lm.x[map.c0] - x0[map.c0]));
    if (factor > RESULT_FACTOR_LIMIT)
      return fail(
        `c0 moved by a factor ${factor.toPrecision(3)} from its start (limit ${RESULT_FACTOR_LIMIT})`,
        failed(),
        o,
      );
    const rel = Math.sqrt(Math.max(cov(map.c0, map.c0), 0));
    if (!(rel <= MAX_RELATIVE_UNCERTAINTY))
      return fail(`c0 not determined by the data (relative uncertainty ${(100 * rel).toPrecision(3)} %)`, failed(), o);
    u.c0F = model.c0F * rel;
  }
  if (map.rs >= 0) {
    const rs = model.rsOhm ?? 0;
    const ur = Math.sqrt(Math.max(cov(map.rs, map.rs), 0));
    if (!Number.isFinite(rs)) return fail('fitted rs not finite', failed(), o);
    if (rs < -NEGATIVE_PARASITIC_SIGMAS * ur)
      return fail(
        `fitted rs ${rs.toPrecision(3)} Ω is negative beyond ${NEGATIVE_PARASITIC_SIGMAS} standard uncertainties (${ur.toPrecision(2)} Ω)`,
        failed(),
        o,
      );
    u.rsOhm = ur;
  }
  if (map.ls >= 0) {
    const ls = model.lsH ?? 0;
    const ul = Math.sqrt(Math.max(cov(map.ls, map.ls), 0)) * 1e-9;
    if (!Number.isFinite(ls)) return fail('fitted ls not finite', failed(), o);
    if (ls < -NEGATIVE_PARASITIC_SIGMAS * ul)
      return fail(
        `fitted ls ${ls.toPrecision(3)} H is negative beyond ${NEGATIVE_PARASITIC_SIGMAS} standard uncertainties (${ul.toPrecision(2)} H)`,
        failed(),
        o,
      );
    u.lsH = ul;
  }

  const covariance: number[][] = [];
  for (let p = 0; p < n; p++) {
    const row: number[] = [];
    for (let q = 0; q < n; q++) row.push(cov(p, q));
    covariance.push(row);
  }
  const xFinal = lm.x;
  const inverseNormal = lm.inverseNormal;
  const residualsBySweep = (): SweepResiduals[] => {
    const dz = problem.impedanceResiduals(xFinal);
    const lev = leverageFactors(problem, xFinal, inverseNormal, np);
    return points.starts.slice(0, -1).map((start, s) => {
      const end = points.starts[s + 1];
      return { re: dz.re.slice(start, end), im: dz.im.slice(start, end), leverageFactor: lev.slice(start, end) };
    });
  };
  return {
    converged: true,
    reason: lm.reason,
    ...summary,
    model,
    uncertainty: u,
    covariance,
    parameterNames: [...map.names],
    residualsBySweep,
    structure,
  };
}
