/**
 * The independent quick methods for one mode, each with its own value: conductance peak,
 * half-power bandwidth, closed form from the measured anti-resonance and C0, and the
 * load-capacitance shift (one load with C0 known; two or more loads without; three with fs).
 * They also give the fitter its starting point.
 */
import type { BvdModel, MotionalBranch } from '../models/bvd.ts';
import type { ModeCandidate } from './classify-modes.ts';
import type { ConductancePeakResult } from './conductance-peak.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import { halfPower, type HalfPowerResult } from './half-power.ts';
import { motionalFromAntiresonance, l1FromFsC1 } from './closed-form.ts';
import { c1FromLoadShift, loadFrequency, solveThreeLoad, solveTwoLoad, type LoadPoint } from './load-shift.ts';
import { admittanceOf, type AddedConnection, type AdmittanceSweep } from './part-alone.ts';
import { crossingBetween } from './interpolate.ts';

/** Quick estimates that need nothing but the mode's own conductance peak. */
export interface PeakMethods {
  conductance?: ConductancePeakResult;
  halfPower?: HalfPowerResult;
  /** Start branch for the fits (conductance peak, else half-power, else the sampled peak). */
  branch: MotionalBranch;
}

/** Conductance-peak and half-power results of a mode from its best-resolved sweep. */
export function peakMethodsOf(mode: ModeCandidate, sweeps: PreparedSweep[]): PeakMethods {
  const res = mode.best.resonance;
  const sweep = sweeps.find((s) => s.index === mode.best.sweepIndex)!;
  const cond = res.conductance.ok ? res.conductance : undefined;
  const hp = halfPower(sweep.part.freqHz, sweep.part.gS, res.peakIndex, cond ? 1 / cond.r1Ohm : undefined);
  let branch: MotionalBranch;
  if (cond) branch = { fsHz: cond.fsHz, r1Ohm: cond.r1Ohm, c1F: cond.c1F };
  else if (hp.ok) branch = { fsHz: hp.fsHz, r1Ohm: hp.r1Ohm, c1F: hp.c1F };
  else {
    // Sampled peak: L1 from the half-power width estimate, R1 = 1/G.
    const l1 = res.r1Ohm / (2 * Math.PI * Math.max(res.bandwidthHz, 1e-12));
    branch = { fsHz: res.fsHz, r1Ohm: res.r1Ohm, c1F: 1 / ((2 * Math.PI * res.fsHz) ** 2 * l1) };
  }
  return { conductance: cond, halfPower: hp.ok ? hp : undefined, branch };
}

/** Lossless capacitance the other branches add across the part at f, F (lossless Ceff, derived from the BVD model). */
export function otherBranchesCF(model: BvdModel, k: number, freqHz: number): number {
  let c = 0;
  model.branches.forEach((br, j) => {
    if (j === k) return;
    c += br.c1F / (((br.fsHz - freqHz) * (br.fsHz + freqHz)) / (br.fsHz * br.fsHz));
  });
  return c;
}

/** Methods that need C0 and the other modes: closed form and load shift. */
export interface ReferenceMethods {
  closedForm?: { c1F: number; l1H: number; faHz: number; source: string };
  loadShift: Array<{ c1F: number; l1H: number; fLHz: number; source: string }>;
  twoLoad?: { c1F: number; c0F: number; uncertainty?: { c1F: number; c0F: number }; note: string };
  threeLoad?: { fsHz: number; c1F: number; c0F: number; note: string };
}

const rawCache = new WeakMap<PreparedSweep, AdmittanceSweep>();

/**
 * Zero-phase frequency of a loaded sweep nearest `expectedHz`, in the direction that belongs
 * to the connection (parallel: B rises through 0, the load anti-resonance; series: B falls
 * through 0, the load resonance), within `toleranceHz`.
 */
export function measureLoadFrequency(
  sweep: PreparedSweep,
  connection: AddedConnection,
  expectedHz: number,
  toleranceHz: number,
): number | undefined {
  let raw = rawCache.get(sweep);
  if (!raw) {
    raw = admittanceOf(sweep.impedance);
    rawCache.set(sweep, raw);
  }
  const f = raw.freqHz;
  const b = raw.bS;
  let best: number | undefined;
  for (let i = 0; i + 1 < f.length; i++) {
    const up = b[i] < 0 && b[i + 1] >= 0;
    const down = b[i] > 0 && b[i + 1] <= 0;
    if (connection === 'parallel' ? !up : !down) continue;
    if (Math.abs(f[i] - expectedHz) > toleranceHz + (f[i + 1] - f[i])) continue;
    const x = crossingBetween(f, b, i, 0);
    if (best === undefined || Math.abs(x - expectedHz) < Math.abs(best - expectedHz)) best = x;
  }
  return best;
}

/**
 * Closed form (fs, measured fa, C0) and load-shift results for branch `k` of `model`
 * (C0 and every branch from the quick estimates).
 */
export function referenceMethodsOf(
  mode: ModeCandidate,
  k: number,
  model: BvdModel,
  sweeps: PreparedSweep[],
): ReferenceMethods {
  const br = model.branches[k];
  const out: ReferenceMethods = { loadShift: [] };
  // Closed form from the finest-stepped unloaded sighting of fa.
  const withFa = mode.observations.filter((o) => !o.loaded && o.resonance.faHz !== undefined);
  if (withFa.length) {
    const o = withFa.reduce((a, b) => (b.resonance.stepHz < a.resonance.stepHz ? b : a));
    const faHz = o.resonance.faHz!;
    const shunt = model.c0F + otherBranchesCF(model, k, faHz);
    const cf = motionalFromAntiresonance({ fsHz: br.fsHz, faHz, r1Ohm: br.r1Ohm, shuntCF: shunt });
    if (cf && Number.isFinite(cf.c1F) && cf.c1F > 0) out.closedForm = { ...cf, faHz, source: o.source };
  }
  // Load points: every loaded sweep whose zero phase is found near the predicted fL.
  const loads: LoadPoint[] = [];
  for (const s of sweeps) {
    if (!s.loaded || s.addedCF === undefined) continue;
    const c0Here = model.c0F + otherBranchesCF(model, k, br.fsHz);
    const expected = loadFrequency(br.fsHz, br.c1F, c0Here, s.addedCF);
    if (expected < s.minHz || expected > s.maxHz) continue;
    const fL = measureLoadFrequency(s, s.connection, expected, 0.3 * (expected - br.fsHz));
    if (fL === undefined) continue;
    const load: LoadPoint = { clF: s.addedCF, connection: s.connection, fLHz: fL, source: s.source };
    loads.push(load);
    const shunt = model.c0F + otherBranchesCF(model, k, fL);
    const c1 = c1FromLoadShift({ fsHz: br.fsHz, load, c0F: shunt, r1Ohm: br.r1Ohm });
    if (c1 !== undefined && c1 > 0)
      out.loadShift.push({ c1F: c1, l1H: l1FromFsC1(br.fsHz, c1), fLHz: fL, source: s.source });
  }
  // The part's own anti-resonance is a load of 0 F across it.
  if (out.closedForm)
    loads.push({ clF: 0, connection: 'parallel', fLHz: out.closedForm.faHz, source: out.closedForm.source });
  const distinct = new Set(loads.map((l) => l.clF)).size;
  if (distinct >= 2) {
    const two = solveTwoLoad(br.fsHz, loads, br.r1Ohm);
    const other = otherBranchesCF(model, k, br.fsHz);
    if (two)
      out.twoLoad = {
        c1F: two.c1F,
        c0F: two.c0F - other,
        uncertainty: two.uncertainty,
        note: `${loads.length} loads: ${loads.map((l) => l.source).join(', ')}`,
      };
  }
  if (distinct >= 3) {
    const three = solveThreeLoad(loads, br.r1Ohm);
    if (three)
      out.threeLoad = {
        ...three,
        c0F: three.c0F - otherBranchesCF(model, k, br.fsHz),
        note: `${loads.length} loads, fs not assumed`,
      };
  }
  return out;
}
