/**
 * Residual vector and analytic Jacobian of the BVD model for least-squares fitting (complex least
 * squares as in Tsuzuki & Toki, Proc. IEEE 64(8), 1976), as a {@link LeastSquaresProblem}, so the
 * optimiser can be swapped.
 *
 * Model of one measured point (IEEE Std 177 / IEC 60444-5 multi-resonance equivalent circuit):
 *   Y     = jω(C0 + Cp + Cadd) + Σk Yk,   Yk = 1/(Rk + jXk),   Xk = (f − fk)(f + fk)/(2π f fk² Ck)
 *   Zs    = Rs + jωLs − j/(ωCser)          (series elements; the capacitor term only when present)
 *   Zmod  = Zs + 1/Y
 * Cadd is a known capacitor across the part, Cser a known capacitor in series; Rs and Ls sit
 * between the instrument and the part-plus-capacitor network. Xk is the stable motional
 * reactance: (f − fk) is formed as (f − fk0) − Δfk from the exact offset to the start
 * frequency fk0, so no digits are lost near resonance.
 *
 * Residuals — in admittance form, weighted by the noise of each point. Per point
 *   r = w·(Ym − Y),   Ym = 1/(Zmeas − Zs),   w = √weight·|Zw − Zs0|²/σZ,
 * stacked [re, im], with Zs0 the series elements at the start values, Zw the impedance the
 * weight is evaluated at (Zmeas, or after a first fit the model's, so that no point's weight
 * depends on its own noise), and σZ the standard
 * deviation of the measured impedance per component (measurement-noise.ts: the noise of the
 * recorded S11, S21, Z or Y carried through the fixture conversion); w stays fixed during the
 * fit. Since Ym − Y = (Zmod − Zmeas)/((Zmeas − Zs)(Zmod − Zs)),
 *   |r| = √weight·|Zmeas − Zmod|/σZ · (1 + O(residual)),
 * so every residual has unit variance when σZ is right, and a point whose Z the fixture makes
 * noisy (a reflection record far above Z0) counts for as little as it holds. Where the noise of
 * Y = 1/Z stays linear in the recorded quantity (reflection and series-through near fa, where
 * Z is noisy beyond its own size), the admittance residual stays well behaved. Without σZ the
 * weight is |Zmeas|: the relative impedance residual. Working in admittance
 * keeps the model close to linear: C0 enters linearly and the anti-resonance is a smooth zero
 * crossing of Im Y rather than a narrow peak of |Z|, so a start whose fa is many bandwidths off
 * still converges quickly. The weights are fixed, so this is ordinary weighted least squares:
 * no weight-derivative term in J, and (JᵀJ)⁻¹·s² is the usual covariance.
 *
 * Parameters (not L1 and C1, which are almost perfectly anti-correlated; derived from the model):
 *   per free branch k: pk = (fk − fk0)/fk0·1e6 (ppm offset from the start), ln R1k, ln C1k;
 *   then ln C0 (if fitted), Rs in Ω (if fitted), Ls in nH (if fitted).
 * Jacobian (J = w·(∂Ym/∂p − ∂Y/∂p)):
 *   ∂Yk/∂ln Rk = −Rk·Yk²,  ∂Yk/∂ln Ck = jXk·Yk²,  ∂Yk/∂pk = −jYk²·∂Xk/∂fk·fk0·1e-6,
 *   ∂Xk/∂fk = −f/(π fk³ Ck),  ∂Y/∂ln C0 = jωC0,  ∂Ym/∂Rs = Ym²,  ∂Ym/∂Ls[nH] = jω·1e-9·Ym².
 */
import type { BvdModel } from '../models/bvd.ts';
import type { LeastSquaresProblem } from './levenberg-marquardt.ts';

/** Measured points of one or more sweeps, flattened for the fit. All arrays have one entry per point. */
export interface BvdFitPoints {
  freqHz: Float64Array;
  /** Measured impedance (part plus any added capacitor), Ω. */
  zRe: Float64Array;
  zIm: Float64Array;
  /** Relative weight of each point (multiplies its squared residual). */
  weight: Float64Array;
  /**
   * Standard deviation of each measured impedance point, per component, Ω (measurement-noise.ts).
   * Absent: |Zmeas|, i.e. the relative impedance residual.
   */
  sigmaZOhm?: Float64Array;
  /** Impedance at which each point's weight is evaluated, Ω (default the measured one). */
  zForWeight?: { re: Float64Array; im: Float64Array };
  /** Known capacitor across the part during the measurement, F (0 when none). */
  parallelCapF: Float64Array;
  /** Known capacitor in series with the part, F (0 when none). */
  seriesCapF: Float64Array;
}

/** Which parameters move. */
export interface BvdFreeSet {
  /** Indices into `model.branches`, each at most once. */
  freeBranches: number[];
  fitC0: boolean;
  fitRs: boolean;
  fitLs: boolean;
}

/** Where each fitted quantity sits in the parameter vector (−1: fixed). */
export interface BvdParameterMap {
  /** Names of the parameters, e.g. `branches[0].fsOffsetPpm`, `lnC0F`, `rsOhm`, `lsNh`. */
  names: string[];
  branches: Array<{ branch: number; fsOffset: number; lnR1: number; lnC1: number; fs0Hz: number }>;
  c0: number;
  rs: number;
  ls: number;
}

/** The BVD least-squares problem plus what is needed to read its parameter vector. */
export interface BvdResiduals extends LeastSquaresProblem {
  readonly map: BvdParameterMap;
  /** Start vector from the initial model. */
  readonly x0: Float64Array;
  /** Lowest and highest frequency of the points, Hz. */
  readonly spanHz: { min: number; max: number };
  /** Model at parameter vector x (fixed parts copied from the initial model). */
  toModel(x: Float64Array): BvdModel;
  /**
   * RMS of the exact relative impedance residual |Zmeas − Zmod|/|Zmeas| at x, over the points
   * whose noise is at most NOISY_POINT_RELATIVE of |Zmeas| (all points when σZ is not given).
   */
  relativeRms(x: Float64Array): number;
  /** Zmeas − Zmod per point at x, Ω. */
  impedanceResiduals(x: Float64Array): { re: Float64Array; im: Float64Array };
}

/**
 * Trial steps that move R1, C1 or C0 by more than this factor from the start are refused: the
 * model must stay evaluable, and no sensible start value is that far off.
 */
export const TRIAL_FACTOR_LIMIT = 1e3;

/** Trial steps may move a branch's fs at most this fraction of the data span beyond its ends. */
export const TRIAL_SPAN_MARGIN = 0.1;

/** A point whose σZ exceeds this fraction of |Zmeas| is noise-dominated for the relative RMS. */
export const NOISY_POINT_RELATIVE = 0.1;

const PPM = 1e-6;
const NANO = 1e-9;

/** Build the residual/Jacobian adapter. Inputs are assumed validated (positive finite values). */
export function createBvdResiduals(points: BvdFitPoints, initial: BvdModel, free: BvdFreeSet): BvdResiduals {
  const np = points.freqHz.length;
  const m = 2 * np;
  const names: string[] = [];
  const map: BvdParameterMap = { names, branches: [], c0: -1, rs: -1, ls: -1 };
  for (const k of free.freeBranches) {
    const fs0Hz = initial.branches[k].fsHz;
    map.branches.push({ branch: k, fsOffset: names.length, lnR1: names.length + 1, lnC1: names.length + 2, fs0Hz });
    names.push(`branches[${k}].fsOffsetPpm`, `branches[${k}].lnR1Ohm`, `branches[${k}].lnC1F`);
  }
  if (free.fitC0) {
    map.c0 = names.length;
    names.push('lnC0F');
  }
  if (free.fitRs) {
    map.rs = names.length;
    names.push('rsOhm');
  }
  if (free.fitLs) {
    map.ls = names.length;
    names.push('lsNh');
  }
  const n = names.length;
  const nb = map.branches.length;

  const x0 = new Float64Array(n);
  for (const b of map.branches) {
    const br = initial.branches[b.branch];
    x0[b.fsOffset] = 0;
    x0[b.lnR1] = Math.log(br.r1Ohm);
    x0[b.lnC1] = Math.log(br.c1F);
  }
  if (map.c0 >= 0) x0[map.c0] = Math.log(initial.c0F);
  if (map.rs >= 0) x0[map.rs] = initial.rsOhm ?? 0;
  if (map.ls >= 0) x0[map.ls] = (initial.lsH ?? 0) / NANO;

  // Per-point constants: ω, 1/f, weights, fixed admittance, fixed series impedance.
  const freq = points.freqHz;
  const zmRe = points.zRe;
  const zmIm = points.zIm;
  const omega = new Float64Array(np);
  const invF = new Float64Array(np);
  const w = new Float64Array(np);
  const fixYRe = new Float64Array(np);
  const fixYIm = new Float64Array(np);
  const fixZsIm = new Float64Array(np); // ωLs (fixed) − 1/(ωCser); fixed Rs is a scalar
  const ymRe = new Float64Array(np); // Ym when Rs and Ls are fixed
  const ymIm = new Float64Array(np);
  const offset = new Float64Array(nb * np); // f − fk0 per free branch, exact
  const isFree = initial.branches.map((_, k) => free.freeBranches.includes(k));
  const rsFixed = map.rs >= 0 ? 0 : (initial.rsOhm ?? 0);
  const lsFixed = map.ls >= 0 ? 0 : (initial.lsH ?? 0);
  const c0Fixed = map.c0 >= 0 ? 0 : initial.c0F;
  const rsStart = initial.rsOhm ?? 0;
  const lsStart = initial.lsH ?? 0;
  const cpF = initial.cpF ?? 0;
  const addedParallelF = points.parallelCapF;
  const cSer = points.seriesCapF;
  const weight = points.weight;
  const fixed = initial.branches.filter((_, k) => !isFree[k]);
  let fLo = Infinity;
  let fHi = -Infinity;
  for (let i = 0; i < np; i++) {
    const f = freq[i];
    if (f < fLo) fLo = f;
    if (f > fHi) fHi = f;
    const om = 2 * Math.PI * f;
    omega[i] = om;
    invF[i] = 1 / f;
    let gRe = 0;
    let bIm = om * (c0Fixed + cpF + addedParallelF[i]);
    for (const br of fixed) {
      const x = ((f - br.fsHz) * (f + br.fsHz)) / (2 * Math.PI * f * br.fsHz * br.fsHz * br.c1F);
      const den = br.r1Ohm * br.r1Ohm + x * x;
      gRe += br.r1Ohm / den;
      bIm -= x / den;
    }
    fixYRe[i] = gRe;
    fixYIm[i] = bIm;
    const cs = cSer[i];
    const capX = cs > 0 ? -1 / (om * cs) : 0;
    const zsIm = om * lsFixed + capX;
    fixZsIm[i] = zsIm;
    const zr = zmRe[i];
    const zi = zmIm[i];
    // Weight from the series elements at the start values.
    const zwr = points.zForWeight ? points.zForWeight.re[i] : zr;
    const zwi = points.zForWeight ? points.zForWeight.im[i] : zi;
    const uRe = zwr - rsStart;
    const uIm = zwi - om * lsStart - capX;
    const sigma = points.sigmaZOhm ? points.sigmaZOhm[i] : Math.sqrt(zr * zr + zi * zi);
    w[i] = (Math.sqrt(weight[i]) * (uRe * uRe + uIm * uIm)) / sigma;
    const vRe = zr - rsFixed;
    const vIm = zi - zsIm;
    const vd = 1 / (vRe * vRe + vIm * vIm);
    ymRe[i] = vRe * vd;
    ymIm[i] = -vIm * vd;
  }
  for (let b = 0; b < nb; b++) {
    const f0 = map.branches[b].fs0Hz;
    for (let i = 0; i < np; i++) offset[b * np + i] = freq[i] - f0;
  }
  const span = fHi - fLo;
  const fsMin = Math.max(fLo - TRIAL_SPAN_MARGIN * span, 0);
  const fsMax = fHi + TRIAL_SPAN_MARGIN * span;
  const seriesFree = map.rs >= 0 || map.ls >= 0;

  // Per-branch constants of the current parameter vector (allocated once).
  const iOff = Int32Array.from(map.branches, (e) => e.fsOffset);
  const iLnR = Int32Array.from(map.branches, (e) => e.lnR1);
  const iLnC = Int32Array.from(map.branches, (e) => e.lnC1);
  const fs0 = Float64Array.from(map.branches, (e) => e.fs0Hz);
  const bR = new Float64Array(nb);
  const bFs = new Float64Array(nb);
  const bDfs = new Float64Array(nb);
  const bK = new Float64Array(nb); // 1/(2π fk² Ck): Xk = (f − fk)(f + fk)·bK/f
  const bKd = new Float64Array(nb); // ∂Xk/∂pk = −f·bKd

  const loadBranches = (x: Float64Array): void => {
    for (let b = 0; b < nb; b++) {
      const c1 = Math.exp(x[iLnC[b]]);
      bR[b] = Math.exp(x[iLnR[b]]);
      bDfs[b] = fs0[b] * PPM * x[iOff[b]];
      const fs = fs0[b] + bDfs[b];
      bFs[b] = fs;
      bK[b] = 1 / (2 * Math.PI * fs * fs * c1);
      bKd[b] = (fs0[b] * PPM) / (Math.PI * fs * fs * fs * c1);
    }
  };

  const evaluate = (x: Float64Array, r: Float64Array, jac: Float64Array | null): boolean => {
    loadBranches(x);
    const c0 = map.c0 >= 0 ? Math.exp(x[map.c0]) : 0;
    const rs = rsFixed + (map.rs >= 0 ? x[map.rs] : 0);
    const lsH = map.ls >= 0 ? x[map.ls] * NANO : 0;
    const jC0 = map.c0 * m;
    const jRs = map.rs * m;
    const jLs = map.ls * m;
    let bad = 0;
    for (let i = 0; i < np; i++) {
      const f = freq[i];
      const om = omega[i];
      const inv = invF[i];
      const wi = w[i];
      const i0 = 2 * i;
      const i1 = i0 + 1;
      let yRe = fixYRe[i];
      let yIm = fixYIm[i] + om * c0;
      for (let b = 0; b < nb; b++) {
        const fs = bFs[b];
        const xb = (offset[b * np + i] - bDfs[b]) * (f + fs) * bK[b] * inv;
        const rb = bR[b];
        const den = 1 / (rb * rb + xb * xb);
        const a = rb * den;
        const c = -xb * den;
        yRe += a;
        yIm += c;
        if (jac === null) continue;
        // −w·∂Yk/∂p; Yk² = s
        const sRe = wi * (a * a - c * c);
        const sIm = wi * 2 * a * c;
        const dx = f * bKd[b]; // −∂X/∂p
        let p = iLnR[b] * m; // −w·(−R·Yk²)
        jac[p + i0] = rb * sRe;
        jac[p + i1] = rb * sIm;
        p = iLnC[b] * m; // −w·(jX·Yk²)
        jac[p + i0] = xb * sIm;
        jac[p + i1] = -xb * sRe;
        p = iOff[b] * m; // −w·(−j·Yk²·∂X/∂p)
        jac[p + i0] = sIm * dx;
        jac[p + i1] = -sRe * dx;
      }
      let gRe = ymRe[i];
      let gIm = ymIm[i];
      if (seriesFree) {
        const vRe = zmRe[i] - rs;
        const vIm = zmIm[i] - fixZsIm[i] - om * lsH;
        const vd = 1 / (vRe * vRe + vIm * vIm);
        gRe = vRe * vd;
        gIm = -vIm * vd;
      }
      const r0 = wi * (gRe - yRe);
      const r1 = wi * (gIm - yIm);
      r[i0] = r0;
      r[i1] = r1;
      bad += r0 - r0 + (r1 - r1); // NaN when either is not finite
      if (jac === null) continue;
      if (jC0 >= 0) {
        // −w·jωC0
        jac[jC0 + i0] = 0;
        jac[jC0 + i1] = -wi * om * c0;
      }
      if (seriesFree) {
        const qRe = wi * (gRe * gRe - gIm * gIm); // w·Ym²
        const qIm = wi * 2 * gRe * gIm;
        if (jRs >= 0) {
          jac[jRs + i0] = qRe;
          jac[jRs + i1] = qIm;
        }
        if (jLs >= 0) {
          const s = om * NANO; // w·Ym²·jω·1e-9
          jac[jLs + i0] = -qIm * s;
          jac[jLs + i1] = qRe * s;
        }
      }
    }
    // A non-finite Jacobian shows up in the normal equations, where the optimiser checks it.
    return bad === 0;
  };

  const lnLimit = Math.log(TRIAL_FACTOR_LIMIT);
  const infeasibility = (x: Float64Array): string | null => {
    for (let p = 0; p < n; p++) if (!Number.isFinite(x[p])) return 'non-finite parameter';
    for (const e of map.branches) {
      const fs = e.fs0Hz + e.fs0Hz * PPM * x[e.fsOffset];
      if (!(fs >= fsMin && fs <= fsMax)) return `branches[${e.branch}] fs ${fs} Hz left the measured span`;
      if (!(Math.abs(x[e.lnR1] - x0[e.lnR1]) <= lnLimit))
        return `branches[${e.branch}] r1 moved by more than a factor ${TRIAL_FACTOR_LIMIT}`;
      if (!(Math.abs(x[e.lnC1] - x0[e.lnC1]) <= lnLimit))
        return `branches[${e.branch}] c1 moved by more than a factor ${TRIAL_FACTOR_LIMIT}`;
    }
    if (map.c0 >= 0 && !(Math.abs(x[map.c0] - x0[map.c0]) <= lnLimit))
      return `c0 moved by more than a factor ${TRIAL_FACTOR_LIMIT}`;
    return null;
  };

  // parameter-step scales: log parameters relative, fs offset in ppm, Rs against R1, Ls in nH.
  const typicalX = new Float64Array(n).fill(1);
  if (map.rs >= 0) {
    let rMin = Infinity;
    for (const br of initial.branches) rMin = Math.min(rMin, br.r1Ohm);
    typicalX[map.rs] = Number.isFinite(rMin) ? rMin : 1;
  }

  const toModel = (x: Float64Array): BvdModel => {
    const model: BvdModel = { ...initial, branches: initial.branches.map((br) => ({ ...br })) };
    for (const e of map.branches) {
      model.branches[e.branch] = {
        fsHz: e.fs0Hz + e.fs0Hz * PPM * x[e.fsOffset],
        r1Ohm: Math.exp(x[e.lnR1]),
        c1F: Math.exp(x[e.lnC1]),
      };
    }
    if (map.c0 >= 0) model.c0F = Math.exp(x[map.c0]);
    if (map.rs >= 0) model.rsOhm = x[map.rs];
    if (map.ls >= 0) model.lsH = x[map.ls] * NANO;
    return model;
  };

  const impedanceResiduals = (x: Float64Array): { re: Float64Array; im: Float64Array } => {
    loadBranches(x);
    const c0 = map.c0 >= 0 ? Math.exp(x[map.c0]) : 0;
    const rs = rsFixed + (map.rs >= 0 ? x[map.rs] : 0);
    const lsH = map.ls >= 0 ? x[map.ls] * NANO : 0;
    const outRe = new Float64Array(np);
    const outIm = new Float64Array(np);
    for (let i = 0; i < np; i++) {
      const f = freq[i];
      let yRe = fixYRe[i];
      let yIm = fixYIm[i] + omega[i] * c0;
      for (let b = 0; b < nb; b++) {
        const xb = (offset[b * np + i] - bDfs[b]) * (f + bFs[b]) * bK[b] * invF[i];
        const den = bR[b] * bR[b] + xb * xb;
        yRe += bR[b] / den;
        yIm -= xb / den;
      }
      const yd = yRe * yRe + yIm * yIm;
      const dRe = zmRe[i] - (rs + yRe / yd);
      const dIm = zmIm[i] - (fixZsIm[i] + omega[i] * lsH - yIm / yd);
      outRe[i] = dRe;
      outIm[i] = dIm;
    }
    return { re: outRe, im: outIm };
  };

  // Points whose own noise is a large part of |Z| say nothing about whether the model's shape
  // fits (a reflection record far above Z0, a through record whose signal sits in the floor):
  // the relative RMS leaves them out, unless too few others remain.
  const shapePoint = new Uint8Array(np).fill(1);
  if (points.sigmaZOhm) {
    let kept = 0;
    for (let i = 0; i < np; i++) {
      const mag = Math.hypot(zmRe[i], zmIm[i]);
      shapePoint[i] = points.sigmaZOhm[i] <= NOISY_POINT_RELATIVE * mag ? 1 : 0;
      kept += shapePoint[i];
    }
    if (kept <= n) shapePoint.fill(1);
  }
  const relativeRms = (x: Float64Array): number => {
    const d = impedanceResiduals(x);
    let s = 0;
    let count = 0;
    for (let i = 0; i < np; i++) {
      if (!shapePoint[i]) continue;
      s += (d.re[i] * d.re[i] + d.im[i] * d.im[i]) / (zmRe[i] * zmRe[i] + zmIm[i] * zmIm[i]);
      count++;
    }
    return Math.sqrt(s / count);
  };

  return {
    residualCount: m,
    parameterCount: n,
    residuals: (x, r) => evaluate(x, r, null),
    residualsAndJacobian: (x, r, jac) => evaluate(x, r, jac),
    infeasibility,
    typicalX,
    map,
    x0,
    spanHz: { min: fLo, max: fHi },
    toModel,
    relativeRms,
    impedanceResiduals,
  };
}
