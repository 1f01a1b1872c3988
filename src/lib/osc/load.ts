/**
 * Load behaviour of a crystal: load-resonance frequency, pulling, trim sensitivity, the load
 * capacitance that hits a target frequency, and the load-resonance resistance.
 * (IEC 60444-11 terms fL, CL; forms derived from the BVD model.)
 *
 * Exact lossless forms (R1 = 0), main branch only:
 *   fL = fs·√(1 + C1/(C0 + CL))                      DL = fL/fs − 1
 *   pulling CL1→CL2 = DL(CL1) − DL(CL2)              (ppm of fs, positive for CL1 < CL2)
 *   S = −dDL/dCL = C1/(2(C0 + CL)²) / √(1 + C1/(C0 + CL))
 *   CL for a target f:  CL = C1/((f/fs)² − 1) − C0
 * Small-pulling approximations (for explanation only): DL ≈ C1/(2(C0 + CL)),
 *   pulling ≈ C1(CL2 − CL1)/(2(C0 + CL1)(C0 + CL2)), S ≈ C1/(2(C0 + CL)²); they over-state DL by
 *   ≈ DL²/2 (0.1 ppm at 450 ppm of pulling).
 * With R1: fL is the lower zero-phase frequency of crystal + series CL, solved numerically on the
 *   full model (every branch, so other modes' susceptance is included); RL = Re Z there, and
 *   RL ≈ R1(1 + C0/CL)². R1 raises fL by about δ·fs, δ = 1/(2QM) (0.08 ppm for a 16 MHz AT part).
 * Multi-branch models: the closed forms use the main branch with the part's C0 and neglect the
 * other branches (their susceptance at fL adds C1k/(1 − (fL/fk)²) to C0: well under 1 % of C0
 * for modes more than a few percent away).
 */
import { admittanceAt, type BvdModel, type MotionalBranch } from '../models/bvd.ts';

/** A numerical answer or the reason there is none. */
export type Solved<T> = ({ ok: true } & T) | { ok: false; reason: string };

/** Exact and small-pulling forms of one quantity. */
export interface ExactApprox {
  exact: number;
  approx: number;
}

const PPM = 1e6;
const PER_PF = 1e-12;

/** Lossless load-resonance frequency fL = fs·√(1 + C1/(C0 + CL)), Hz. */
export function loadFrequencyHz(branch: MotionalBranch, c0F: number, clF: number): number {
  return branch.fsHz * Math.sqrt(1 + branch.c1F / (c0F + clF));
}

/** Fractional load-resonance offset DL = fL/fs − 1 in ppm: exact (lossless) and approximate. */
export function loadOffsetPpm(branch: MotionalBranch, c0F: number, clF: number): ExactApprox {
  const u = branch.c1F / (c0F + clF);
  // √(1+u) − 1 written as u/(√(1+u) + 1) to keep the digits of a ppm-sized difference.
  return { exact: (u / (Math.sqrt(1 + u) + 1)) * PPM, approx: (u / 2) * PPM };
}

/** Pulling between two loads, DL(CL1) − DL(CL2), ppm of fs (positive when CL1 < CL2). */
export function pullingPpm(branch: MotionalBranch, c0F: number, cl1F: number, cl2F: number): ExactApprox {
  const a = loadOffsetPpm(branch, c0F, cl1F);
  const b = loadOffsetPpm(branch, c0F, cl2F);
  const approx = ((branch.c1F * (cl2F - cl1F)) / (2 * (c0F + cl1F) * (c0F + cl2F))) * PPM;
  return { exact: a.exact - b.exact, approx };
}

/** Trim sensitivity S = −dDL/dCL at CL, ppm per pF (positive: more CL, lower f). */
export function trimSensitivityPpmPerPf(branch: MotionalBranch, c0F: number, clF: number): ExactApprox {
  const total = c0F + clF;
  const approx = branch.c1F / (2 * total * total);
  const exact = approx / Math.sqrt(1 + branch.c1F / total);
  return { exact: exact * PPM * PER_PF, approx: approx * PPM * PER_PF };
}

/** Load-resonance resistance RL = R1(1 + C0/CL)², Ω (derived from the BVD model). */
export function loadResistanceOhm(r1Ohm: number, c0F: number, clF: number): number {
  const k = 1 + c0F / clF;
  return r1Ohm * k * k;
}

/**
 * The load capacitance that puts the lossless load resonance on `targetHz`:
 * CL = C1/((f/fs)² − 1) − C0, F. No answer when the target is at or below fs or needs CL ≤ 0.
 */
export function loadCapacitanceForHz(branch: MotionalBranch, c0F: number, targetHz: number): Solved<{ clF: number }> {
  const ratio = targetHz / branch.fsHz;
  const u = (ratio - 1) * (ratio + 1);
  if (!(u > 0))
    return {
      ok: false,
      reason: `target ${targetHz} Hz is not above fs ${branch.fsHz} Hz: no load capacitance reaches it`,
    };
  const clF = branch.c1F / u - c0F;
  if (!(clF > 0))
    return { ok: false, reason: `target ${targetHz} Hz is above the pulling range (needs CL ${clF} F, not positive)` };
  return { ok: true, clF };
}

/** The model without fixture parasitics: the part alone. */
function partOnly(model: BvdModel): BvdModel {
  return { c0F: model.c0F, branches: model.branches };
}

/** Reactance of crystal + series CL at f, Ω. */
function loopReactance(model: BvdModel, clF: number, freqHz: number): { x: number; r: number } {
  const [g, b] = admittanceAt(model, freqHz);
  const den = g * g + b * b;
  return { r: g / den, x: -b / den - 1 / (2 * Math.PI * freqHz * clF) };
}

/** Bisection steps: enough to shrink any bracket to the last bit of a double. */
const MAX_BISECTIONS = 200;

/**
 * Load resonance with R1: the lower zero-phase frequency of crystal + series CL on the full
 * model, and the resistance there (RL, exact). Fails with a reason when no zero-phase point
 * exists near the branch (very low M).
 */
export function loadResonanceWithLoss(
  model: BvdModel,
  branchIndex: number,
  clF: number,
): Solved<{ freqHz: number; rlOhm: number }> {
  const part = partOnly(model);
  const br = part.branches[branchIndex];
  if (!br) return { ok: false, reason: `no branch ${branchIndex}` };
  if (!(clF > 0)) return { ok: false, reason: `expected a positive load capacitance, got ${clF} F` };
  const fL0 = loadFrequencyHz(br, part.c0F, clF);
  const fp = br.fsHz * Math.sqrt(1 + br.c1F / part.c0F);
  const width = br.fsHz * br.r1Ohm * br.c1F * 2 * Math.PI * br.fsHz; // fs/Q, Hz
  let lo = br.fsHz;
  if (loopReactance(part, clF, lo).x >= 0) return { ok: false, reason: 'crystal + CL is not capacitive at fs' };
  let hi = Number.NaN;
  for (let step = width / 64; fL0 + step < fp; step *= 2) {
    if (loopReactance(part, clF, fL0 + step).x > 0) {
      hi = fL0 + step;
      break;
    }
    lo = Math.max(lo, fL0 + step);
  }
  if (Number.isNaN(hi))
    return {
      ok: false,
      reason: `no zero-phase load resonance below fp (M = ${(1 / (2 * Math.PI * br.fsHz * part.c0F * br.r1Ohm)).toPrecision(3)} too low)`,
    };
  for (let i = 0; i < MAX_BISECTIONS; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (loopReactance(part, clF, mid).x > 0) hi = mid;
    else lo = mid;
  }
  const { x: xl, r: rl } = loopReactance(part, clF, lo);
  const { x: xh, r: rh } = loopReactance(part, clF, hi);
  const t = xh === xl ? 0.5 : -xl / (xh - xl);
  return { ok: true, freqHz: lo + t * (hi - lo), rlOhm: rl + t * (rh - rl) };
}

/** Most correction passes in {@link loadCapacitanceForWithLoss}. */
const MAX_CL_PASSES = 30;

/**
 * The load capacitance that puts the load resonance *with R1* (full model) on `targetHz`, F.
 * Starts from the lossless answer and corrects it by the lossless inverse of the residual.
 */
export function loadCapacitanceForWithLoss(
  model: BvdModel,
  branchIndex: number,
  targetHz: number,
): Solved<{ clF: number }> {
  const br = model.branches[branchIndex];
  if (!br) return { ok: false, reason: `no branch ${branchIndex}` };
  const first = loadCapacitanceForHz(br, model.c0F, targetHz);
  if (!first.ok) return first;
  let clF = first.clF;
  for (let i = 0; i < MAX_CL_PASSES; i++) {
    const f = loadResonanceWithLoss(model, branchIndex, clF);
    if (!f.ok) return f;
    if (Math.abs(f.freqHz / targetHz - 1) < 1e-14) return { ok: true, clF };
    const atF = loadCapacitanceForHz(br, model.c0F, f.freqHz);
    if (!atF.ok) return atF;
    clF += first.clF - atF.clF;
    if (!(clF > 0)) return { ok: false, reason: 'target needs a non-positive load capacitance once R1 is included' };
  }
  return { ok: true, clF };
}
