/**
 * Closed forms and exact characteristic frequencies of the BVD model.
 *
 * - C1 = C0((fp/fs)² − 1), L1 = 1/((2πfs)²C1): exact for a lossless single branch
 *   (IEEE Std 177 fp; derived from the BVD model).
 * - fp of a multi-branch model: lossless anti-resonance just above branch k, i.e. the root of
 *   Ceff(f) = C0 + Σj Cj/(1 − (f/fj)²) (derived from the BVD model) between fk and the next
 *   branch above; Ceff rises monotonically from −∞ to +∞ (or to C0) there, so the root is unique.
 * - fr, fa: lower/upper zero-phase frequencies (Im Y = 0) of the lossy model, exact by root
 *   finding; Rr, Ra the impedance there (IEEE Std 177 symbols).
 * - From a measured upper zero-phase fa: for one branch, Im Y = 0 reads
 *   ωCt(R1² + X²) = X, a quadratic in X whose upper root is X = (1 + √(1 − 4ω²Ct²R1²))/(2ωCt);
 *   with X = L1(ω² − ωs²)/ω = u/(ωC1), u = (fa/fs)² − 1, this gives C1 = u/(ωX) exactly
 *   (derived from the BVD model); R1 → 0 gives back C0((fa/fs)² − 1).
 */
import { admittanceAt, type BvdModel } from '../models/bvd.ts';

/** C1 = C0((fp/fs)² − 1), F (exact for R1 = 0). */
export function c1FromFsFp(fsHz: number, fpHz: number, c0F: number): number {
  return (c0F * (fpHz - fsHz) * (fpHz + fsHz)) / (fsHz * fsHz);
}

/** L1 = 1/((2πfs)²C1), H. */
export function l1FromFsC1(fsHz: number, c1F: number): number {
  const w = 2 * Math.PI * fsHz;
  return 1 / (w * w * c1F);
}

/** Lossless Ceff(fk + d) of the part alone, F (branch poles handled in offset form). */
function ceffAt(model: BvdModel, k: number, d: number): number {
  const fk = model.branches[k].fsHz;
  let c = model.c0F;
  model.branches.forEach((br, j) => {
    const fj = br.fsHz;
    const den = j === k ? (-d * (2 * fk + d)) / (fk * fk) : ((fj - fk - d) * (fj + fk + d)) / (fj * fj);
    c += br.c1F / den;
  });
  return c;
}

/**
 * Lossless effective capacitance of the part alone, Ceff(f) = Im Y/ω = C0 + Σk Ck/(1 − (f/fk)²), F
 * (derived from the BVD model); near a mode it is biased, at low frequency it tends to C0 + ΣCk.
 */
export function effectiveCapacitanceOf(model: BvdModel, freqHz: number): number {
  let c = model.c0F;
  for (const br of model.branches) c += br.c1F / (((br.fsHz - freqHz) * (br.fsHz + freqHz)) / (br.fsHz * br.fsHz));
  return c;
}

/** Bisection for a sign change of `fn` on [lo, hi] (fn(lo) < 0 < fn(hi)), to ~1e-15 relative of `scale`. */
function bisect(fn: (d: number) => number, lo: number, hi: number, scale: number): number {
  for (let i = 0; i < 200 && hi - lo > 1e-15 * scale; i++) {
    const mid = 0.5 * (lo + hi);
    if (fn(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Lossless parallel resonance just above branch `k` (all branches, resistances zero, part
 * alone: fixture terms ignored), Hz; undefined when the model has no root there.
 * Single branch: fs·√(1 + C1/C0).
 */
export function parallelResonanceOf(model: BvdModel, k: number): number | undefined {
  const fk = model.branches[k]?.fsHz;
  if (!(fk > 0) || !(model.c0F > 0)) return undefined;
  let next = Infinity;
  for (const br of model.branches) if (br.fsHz > fk && br.fsHz < next) next = br.fsHz;
  const fn = (d: number) => ceffAt(model, k, d);
  let hi: number;
  if (Number.isFinite(next)) {
    hi = (next - fk) * (1 - 1e-12);
    if (!(fn(hi) > 0)) return undefined;
  } else {
    hi = fk * (Math.sqrt(1 + model.branches[k].c1F / model.c0F) - 1) * 2 + 1e-9 * fk;
    for (let i = 0; i < 200 && !(fn(hi) > 0); i++) hi *= 2;
    if (!(fn(hi) > 0)) return undefined;
  }
  const lo = Math.min(hi, fk * 1e-15);
  if (!(fn(lo) < 0)) return undefined;
  const d = bisect(fn, lo, hi, fk);
  const f = fk + d;
  return Number.isFinite(f) ? f : undefined;
}

/** Zero-phase frequencies and resistances of branch k's resonance/anti-resonance. */
export interface ZeroPhase {
  /** Lower zero-phase (resonance) frequency, Hz. */
  frHz: number;
  /** Upper zero-phase (anti-resonance) frequency, Hz. */
  faHz: number;
  /** Impedance (real) at fr, Ω. */
  rrOhm: number;
  /** Impedance (real) at fa, Ω. */
  raOhm: number;
}

/**
 * Exact zero-phase frequencies of branch `k` of the part alone (fixture terms ignored), or
 * undefined when the phase never reaches zero (M below 2, derived from the BVD model).
 */
export function zeroPhaseOf(model: BvdModel, k: number): ZeroPhase | undefined {
  const br = model.branches[k];
  if (!br) return undefined;
  const part: BvdModel = { c0F: model.c0F, branches: model.branches };
  const fk = br.fsHz;
  const bAt = (d: number) => admittanceAt(part, fk + d)[1];
  const fp = parallelResonanceOf(model, k);
  if (fp === undefined) return undefined;
  // |X| = R1 near d = Δf/2 = R1/(4πL1): where the branch susceptance is most negative.
  const l1 = 1 / ((2 * Math.PI * fk) ** 2 * br.c1F);
  const dMid = br.r1Ohm / (4 * Math.PI * l1);
  const dFp = fp - fk;
  if (!(dMid < dFp)) return undefined;
  if (!(bAt(dMid) < 0) || !(bAt(0) > 0) || !(bAt(dFp) > 0)) return undefined;
  const dr = bisect((d) => -bAt(d), 0, dMid, fk);
  const da = bisect(bAt, dMid, dFp, fk);
  const fr = fk + dr;
  const fa = fk + da;
  return { frHz: fr, faHz: fa, rrOhm: 1 / admittanceAt(part, fr)[0], raOhm: 1 / admittanceAt(part, fa)[0] };
}

/**
 * C1 and L1 from a measured upper zero-phase frequency, exact for one branch with the given
 * resistance and total shunt capacitance (C0 plus any capacitor across the part).
 * Undefined when the data admit no zero phase (4ω²Ct²R1² > 1) or fa ≤ fs.
 */
export function motionalFromAntiresonance(p: {
  fsHz: number;
  faHz: number;
  r1Ohm: number;
  shuntCF: number;
}): { c1F: number; l1H: number } | undefined {
  const { fsHz, faHz, r1Ohm, shuntCF } = p;
  if (!(faHz > fsHz) || !(shuntCF > 0) || !(r1Ohm >= 0)) return undefined;
  const w = 2 * Math.PI * faHz;
  const ct = w * shuntCF;
  const disc = 1 - 4 * ct * ct * r1Ohm * r1Ohm;
  if (!(disc >= 0)) return undefined;
  const x = (1 + Math.sqrt(disc)) / (2 * ct);
  const u = ((faHz - fsHz) * (faHz + fsHz)) / (fsHz * fsHz);
  const c1F = u / (w * x);
  return { c1F, l1H: l1FromFsC1(fsHz, c1F) };
}
