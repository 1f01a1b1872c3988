/**
 * Whether a mode's anti-resonance fa stands above the noise of the sweeps that cover it.
 *
 * Near fa the part's admittance is Y ≈ G_fa + jB with G_fa = Re Y(fa) = ω²C0²R1 (to first
 * order) and the susceptance crossing zero with a slope that moves B by about 2·G_fa over one
 * resonance bandwidth fs/Q either side (from B = −1/X of the motional branch, dX/df = 4πL1,
 * X(fa) ≈ 1/(ωC0)). A point tells where fa lies when that swing stands above its own noise
 * σY = σZ/|Z|²; over the N points within a bandwidth of fa the evidence adds as
 * SNR = √Σ (2·G_fa/σY,i)². Below {@link FA_VISIBLE_SNR} fa is in the noise floor: fp then
 * comes from C0 and C1 alone (the fit's covariance carries their uncertainty into it).
 */
import { admittanceAt, type BvdModel } from '../models/bvd.ts';

/** Anti-resonance evidence above which fa counts as seen (it then fixes fa to about a tenth of a bandwidth). */
export const FA_VISIBLE_SNR = 10;

/** One sweep as needed here: the part's impedance and the standard deviation of each point, Ω. */
export interface NoisySweep {
  source: string;
  freqHz: Float64Array;
  zRe: Float64Array;
  zIm: Float64Array;
  sigmaZOhm: Float64Array;
}

/** Evidence for fa in the sweep that shows it best; `undefined` when no sweep reaches fa. */
export function antiResonanceEvidence(
  model: BvdModel,
  k: number,
  fpHz: number,
  sweeps: NoisySweep[],
): { snr: number; source: string } | undefined {
  const br = model.branches[k];
  if (!br || !(fpHz > 0)) return undefined;
  const bandwidthHz = 2 * Math.PI * br.fsHz * br.fsHz * br.r1Ohm * br.c1F;
  const swing = 2 * admittanceAt(model, fpHz)[0];
  let best: { snr: number; source: string } | undefined;
  for (const s of sweeps) {
    const f = s.freqHz;
    const n = f.length;
    if (n === 0 || fpHz < Math.min(f[0], f[n - 1]) || fpHz > Math.max(f[0], f[n - 1])) continue;
    let sum = 0;
    let nearest = 0;
    for (let i = 0; i < n; i++) {
      if (Math.abs(f[i] - fpHz) < Math.abs(f[nearest] - fpHz)) nearest = i;
      if (Math.abs(f[i] - fpHz) > bandwidthHz) continue;
      sum += (swing / sigmaY(s, i)) ** 2;
    }
    if (sum === 0) sum = (swing / sigmaY(s, nearest)) ** 2;
    const snr = Math.sqrt(sum);
    if (!best || snr > best.snr) best = { snr, source: s.source };
  }
  return best;
}

function sigmaY(s: NoisySweep, i: number): number {
  const z2 = s.zRe[i] * s.zRe[i] + s.zIm[i] * s.zIm[i];
  return s.sigmaZOhm[i] / z2;
}
