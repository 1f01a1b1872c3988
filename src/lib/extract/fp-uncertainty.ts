/**
 * Standard uncertainty of the lossless parallel resonance fp of a fitted model, by first-order
 * propagation of the fit covariance through parallelResonanceOf (numerical derivatives).
 * Parameter names follow residuals.ts: `branches[j].fsOffsetPpm` (fs = fs0(1 + p·1e-6)),
 * `branches[j].lnR1Ohm`, `branches[j].lnC1F`, `lnC0F`; R1 does not enter the lossless fp.
 */
import type { BvdModel } from '../models/bvd.ts';
import { parallelResonanceOf } from './closed-form.ts';

function withChange(model: BvdModel, change: (m: BvdModel) => void): BvdModel {
  const m = { ...model, branches: model.branches.map((b) => ({ ...b })) };
  change(m);
  return m;
}

/** ∂fp/∂(relative change) of one model quantity, by a central difference. */
function sensitivity(model: BvdModel, k: number, apply: (m: BvdModel, factor: number) => void, h: number): number {
  const up = parallelResonanceOf(
    withChange(model, (m) => apply(m, 1 + h)),
    k,
  );
  const dn = parallelResonanceOf(
    withChange(model, (m) => apply(m, 1 - h)),
    k,
  );
  if (up === undefined || dn === undefined) return 0;
  return (up - dn) / (2 * h);
}

/**
 * u(fp) for branch k.
 * @param names, covariance the fit's parameter names and covariance (absent: no fit covariance)
 * @param extraC0F a C0 uncertainty not in the covariance (C0 held in the fit), F
 * @param mapIndex branch index in the fit's names → branch index in `model`
 */
export function fpUncertaintyOf(
  model: BvdModel,
  k: number,
  names: string[] | undefined,
  covariance: number[][] | undefined,
  extraC0F = 0,
  fallback?: { fsHz: number; c1F: number },
  mapIndex: (j: number) => number = (j) => j,
): number {
  const sC0 = sensitivity(
    model,
    k,
    (m, f) => {
      m.c0F *= f;
    },
    1e-5,
  ); // ∂fp/∂ln C0
  let variance = 0;
  if (names && covariance) {
    const g = names.map((name) => {
      const m = /^branches\[(\d+)\]\.(fsOffsetPpm|lnC1F)$/.exec(name);
      if (m) {
        const j = mapIndex(Number(m[1]));
        if (!(j >= 0 && j < model.branches.length)) return 0;
        if (m[2] === 'fsOffsetPpm')
          return (
            sensitivity(
              model,
              k,
              (mm, f) => {
                mm.branches[j].fsHz *= f;
              },
              1e-8,
            ) * 1e-6
          );
        return sensitivity(
          model,
          k,
          (mm, f) => {
            mm.branches[j].c1F *= f;
          },
          1e-5,
        );
      }
      if (name === 'lnC0F') return sC0;
      return 0;
    });
    for (let i = 0; i < g.length; i++) for (let j = 0; j < g.length; j++) variance += g[i] * covariance[i][j] * g[j];
  } else if (fallback) {
    // No covariance: independent fs and C1 of this branch.
    const sFs = sensitivity(
      model,
      k,
      (mm, f) => {
        mm.branches[k].fsHz *= f;
      },
      1e-8,
    );
    const sC1 = sensitivity(
      model,
      k,
      (mm, f) => {
        mm.branches[k].c1F *= f;
      },
      1e-5,
    );
    const br = model.branches[k];
    variance += ((sFs * fallback.fsHz) / br.fsHz) ** 2 + ((sC1 * fallback.c1F) / br.c1F) ** 2;
  }
  variance += ((sC0 * extraC0F) / model.c0F) ** 2;
  return Math.sqrt(Math.max(0, variance));
}
