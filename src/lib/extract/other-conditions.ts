/**
 * The sample's main mode at conditions other than the reference: each sweep at another
 * temperature or drive level gets its own window fit (that branch and, when the window allows,
 * C0 free; the reference model as the start), falling back to its conductance peak. Those
 * values feed the temperature fit and the drive-level analysis.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { Resonance } from './find-resonances.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import type { ModeCandidate } from './classify-modes.ts';
import { fitModeWindow } from './fit-modes.ts';

/** A main-mode sighting at some condition. */
export interface ConditionPoint {
  sweep: string;
  temperatureC?: number;
  driveW?: number;
  fsHz: number;
  r1Ohm: number;
  pointsPerBandwidth: number;
}

/** Largest relative distance from the reference fs at which a resonance is the same mode. */
export const SAME_MODE_RELATIVE = 2e-3;

/**
 * Main-mode values in each of the given (unloaded) sweeps.
 * @param found resonances per sweep index
 * @param k index of the main mode in `model`
 */
export function mainModeAtConditions(
  sweeps: PreparedSweep[],
  found: Map<number, Resonance[]>,
  model: BvdModel,
  k: number,
): ConditionPoint[] {
  const out: ConditionPoint[] = [];
  const ref = model.branches[k];
  for (const s of sweeps) {
    if (s.loaded) continue;
    const list = found.get(s.index) ?? [];
    const near = list.filter((r) => !r.atBoundary && Math.abs(r.fsHz / ref.fsHz - 1) < SAME_MODE_RELATIVE);
    if (near.length === 0) continue;
    const res = near.reduce((a, b) => (Math.abs(b.fsHz - ref.fsHz) < Math.abs(a.fsHz - ref.fsHz) ? b : a));
    const start: BvdModel = { ...model, branches: model.branches.map((b) => ({ ...b })) };
    start.branches[k] = { fsHz: res.fsHz, r1Ohm: res.r1Ohm, c1F: ref.c1F };
    const obs = { sweepIndex: s.index, source: s.source, resonance: res, loaded: false };
    const cand: ModeCandidate = {
      fsHz: res.fsHz,
      r1Ohm: res.r1Ohm,
      bandwidthHz: res.bandwidthHz,
      observations: [obs],
      best: obs,
      overtone: 1,
      spurious: false,
    };
    const fit = fitModeWindow(cand, k, start, [s]);
    const point: ConditionPoint = {
      sweep: s.source,
      temperatureC: s.temperatureC,
      driveW: s.driveW,
      fsHz: res.fsHz,
      r1Ohm: res.r1Ohm,
      pointsPerBandwidth: res.pointsPerBandwidth,
    };
    if (fit?.converged) {
      point.fsHz = fit.model.branches[k].fsHz;
      point.r1Ohm = fit.model.branches[k].r1Ohm;
    } else if (!res.conductance.ok) continue;
    out.push(point);
  }
  return out;
}
