/**
 * One mode's published result: values from the preferred method (joint fit, else the mode's
 * own window fit, else the conductance peak), standard uncertainties, the characteristic
 * frequencies of the fitted model, and the cross-check of every method that applies.
 *
 * Uncertainty of fs: the fit's, combined in quadrature with the frequency-resolution term
 * step/√12 when the best sweep has fewer than {@link FEW_POINTS_PER_BANDWIDTH} points per
 * bandwidth: with so few points inside the resonance its shape hardly constrains the fit, and
 * the sampling, not the noise, limits how well the peak is placed. (Between that and 10 points
 * the fit still places fs well; a warning asks for a finer step.)
 */
import type { BvdModel } from '../models/bvd.ts';
import type { CrossCheck, MethodName, MethodValue, ModeResult } from './types.ts';
import type { ModeCandidate } from './classify-modes.ts';
import type { PeakMethods, ReferenceMethods } from './mode-methods.ts';
import type { FitBvdResult } from './fit-bvd.ts';
import { parallelResonanceOf, zeroPhaseOf } from './closed-form.ts';
import { fpUncertaintyOf } from './fp-uncertainty.ts';
import { MIN_POINTS_PER_BANDWIDTH } from './diagnostics.ts';
import { settleQuantity, type Credibility, type SettledQuantity } from './settle-methods.ts';
import { FA_VISIBLE_SNR } from './fa-visibility.ts';

/** Points per bandwidth below which the fs uncertainty includes step/√12. */
export const FEW_POINTS_PER_BANDWIDTH = 3;

/** Standard uncertainties of a branch's quantities. */
export interface BranchUncertainty {
  fsHz: number;
  r1Ohm: number;
  c1F: number;
  l1H: number;
  q: number;
}

/** Where the published values of a mode come from. */
export interface ModeSource {
  method: Extract<MethodName, 'joint-fit' | 'complex-fit' | 'conductance-peak'>;
  /** The fit, for its covariance (absent for the conductance peak). */
  fit?: FitBvdResult;
  uncertainty: BranchUncertainty;
  /** Branch index in the fit's parameter names → index in the reported model (default same). */
  mapIndex?: (j: number) => number;
}

/** Everything known about one mode when it is reported. */
export interface ModeReportInput {
  k: number;
  mode: ModeCandidate;
  /** Final model of the sample (this mode is branch k). */
  model: BvdModel;
  source: ModeSource;
  c0: { value: number; uncertainty: number; heldInFit: boolean };
  peak: PeakMethods;
  reference: ReferenceMethods;
  perMode?: FitBvdResult;
  /** The joint fit when this mode was free in it. */
  joint?: FitBvdResult;
  flagged: boolean;
  /** R1 of this spurious mode's main mode, Ω. */
  mainR1Ohm?: number;
  /** Source names of the sweeps the mode was seen in. */
  sweeps: string[];
  /** Evidence for the anti-resonance above the noise (fa-visibility.ts); undefined when no sweep reaches it. */
  faEvidence?: number;
}

function branchValues(fit: FitBvdResult, k: number) {
  const br = fit.model.branches[k];
  const l1H = 1 / ((2 * Math.PI * br.fsHz) ** 2 * br.c1F);
  const q = 1 / (2 * Math.PI * br.fsHz * br.r1Ohm * br.c1F);
  return { ...br, l1H, q, u: fit.uncertainty.branches[k] };
}

function causeFor(quantity: CrossCheck['quantity'], ppbw: number, values: MethodValue[]): string {
  if (ppbw < MIN_POINTS_PER_BANDWIDTH)
    return `too few points across the resonance (${ppbw.toFixed(1)} per bandwidth; want ≥ ${MIN_POINTS_PER_BANDWIDTH})`;
  if (
    (quantity === 'c1F' || quantity === 'l1H') &&
    values.some((v) => v.method === 'load-shift' || v.method === 'two-load')
  ) {
    return "the added capacitor's value or its fixture stray capacitance, or drive level";
  }
  if (quantity === 'c0F') return 'fixture stray capacitance, or modes outside the swept span';
  return 'fixture series resistance or inductance, or drive level (re-measure at a lower drive)';
}

/** Build the published result of mode k. */
export function reportMode(input: ModeReportInput): ModeResult {
  const { k, mode, model, source, c0, peak, reference } = input;
  const lists = methodLists(input);
  const ppbw = mode.best.resonance.pointsPerBandwidth;
  const credibility = credibilityOf(input);
  const settled = Object.fromEntries(
    (Object.keys(lists) as Array<keyof typeof lists>).map((key) => [
      key,
      settleQuantity(key, lists[key], credibility, causeFor(key, ppbw, lists[key])),
    ]),
  ) as Record<keyof typeof lists, SettledQuantity | undefined>;
  // The rule picks the value of the first credible method: fs, R1 and C1 of the branch follow it
  // (L1 and Q derive from them), so the model, its netlists and the page tell one story.
  const br = model.branches[k];
  if (settled.fsHz && settled.fsHz.method !== source.method) br.fsHz = settled.fsHz.value;
  if (settled.r1Ohm && settled.r1Ohm.method !== source.method) br.r1Ohm = settled.r1Ohm.value;
  if (settled.c1F && settled.c1F.method !== source.method) br.c1F = settled.c1F.value;
  const l1H = 1 / ((2 * Math.PI * br.fsHz) ** 2 * br.c1F);
  const q = 1 / (2 * Math.PI * br.fsHz * br.r1Ohm * br.c1F);
  const res = mode.best.resonance;
  const uRes = ppbw < FEW_POINTS_PER_BANDWIDTH ? res.stepHz / Math.sqrt(12) : 0;
  const u = source.uncertainty;
  const fpHz = parallelResonanceOf(model, k) ?? br.fsHz * Math.sqrt(1 + br.c1F / model.c0F);
  const uFp = Math.hypot(
    fpUncertaintyOf(
      model,
      k,
      source.fit?.parameterNames,
      source.fit?.covariance,
      c0.heldInFit ? c0.uncertainty : 0,
      source.fit ? undefined : { fsHz: u.fsHz, c1F: u.c1F },
      source.mapIndex,
    ),
    uRes,
  );
  const r = model.c0F / br.c1F;
  const result: ModeResult = {
    overtone: mode.overtone,
    spurious: mode.spurious,
    fsHz: br.fsHz,
    fpHz,
    r1Ohm: br.r1Ohm,
    l1H,
    c1F: br.c1F,
    q,
    uncertainty: {
      fsHz: settled.fsHz?.uncertainty ?? Math.hypot(u.fsHz, uRes),
      fpHz: uFp,
      r1Ohm: settled.r1Ohm?.uncertainty ?? u.r1Ohm,
      l1H: settled.l1H?.uncertainty ?? u.l1H,
      c1F: settled.c1F?.uncertainty ?? u.c1F,
      c0F: c0.uncertainty,
      q: settled.q?.uncertainty ?? u.q,
    },
    m: q / r,
    r,
    crossCheck: [],
    sweeps: input.sweeps,
  };
  const zp = zeroPhaseOf(model, k);
  if (zp) {
    result.frHz = zp.frHz;
    result.faHz = zp.faHz;
    result.rrOhm = zp.rrOhm;
  }
  if (mode.spurious && input.mainR1Ohm) {
    result.resistanceRatio = br.r1Ohm / input.mainR1Ohm;
    result.strengthDb = 20 * Math.log10(result.resistanceRatio);
  }
  if (input.flagged) result.flagged = true;

  result.crossCheck = (Object.keys(lists) as Array<keyof typeof lists>).flatMap((key) =>
    settled[key] ? [settled[key].check] : [],
  );
  return result;
}

/** Why a method's assumptions fail for this mode (settle-methods.ts), or undefined. */
function credibilityOf(input: ModeReportInput): Credibility {
  const ppbw = input.mode.best.resonance.pointsPerBandwidth;
  const structured = (fit?: FitBvdResult) => (fit?.structure?.inflation ?? 1) > 1;
  return (method) => {
    switch (method) {
      case 'closed-form':
        return input.faEvidence === undefined || input.faEvidence < FA_VISIBLE_SNR
          ? 'the anti-resonance is not seen above the noise'
          : undefined;
      case 'conductance-peak':
      case 'half-power':
        return ppbw < MIN_POINTS_PER_BANDWIDTH
          ? `${ppbw.toFixed(1)} points per bandwidth (want ≥ ${MIN_POINTS_PER_BANDWIDTH})`
          : undefined;
      case 'joint-fit':
      case 'complex-fit': {
        const fit = method === input.source.method ? input.source.fit : input.perMode;
        return structured(fit) ? 'its residuals show structure the model does not explain' : undefined;
      }
      default:
        return undefined;
    }
  };
}

/** Every method's values of the branch quantities, the published source first. */
function methodLists(input: ModeReportInput): Record<'fsHz' | 'r1Ohm' | 'c1F' | 'l1H' | 'q', MethodValue[]> {
  const { k, mode, model, source, peak, reference } = input;
  const br = model.branches[k];
  const l1H = 1 / ((2 * Math.PI * br.fsHz) ** 2 * br.c1F);
  const q = 1 / (2 * Math.PI * br.fsHz * br.r1Ohm * br.c1F);
  const res = mode.best.resonance;
  const uRes = res.pointsPerBandwidth < FEW_POINTS_PER_BANDWIDTH ? res.stepHz / Math.sqrt(12) : 0;
  const u = source.uncertainty;
  // Method values, preferred first.
  const lists: Record<'fsHz' | 'r1Ohm' | 'c1F' | 'l1H' | 'q', MethodValue[]> = {
    fsHz: [],
    r1Ohm: [],
    c1F: [],
    l1H: [],
    q: [],
  };
  const add = (
    method: MethodName,
    v: { fsHz?: number; r1Ohm?: number; c1F?: number; l1H?: number; q?: number },
    unc?: Partial<BranchUncertainty>,
    note?: string,
  ) => {
    for (const key of Object.keys(lists) as Array<keyof typeof lists>) {
      const value = v[key];
      if (value === undefined || !Number.isFinite(value)) continue;
      const mv: MethodValue = { method, value };
      const uu = unc?.[key];
      if (uu !== undefined && Number.isFinite(uu) && uu > 0) mv.uncertainty = uu;
      if (note) mv.note = note;
      lists[key].push(mv);
    }
  };
  add(source.method, { fsHz: br.fsHz, r1Ohm: br.r1Ohm, c1F: br.c1F, l1H, q }, { ...u, fsHz: Math.hypot(u.fsHz, uRes) });
  if (source.method !== 'complex-fit' && input.perMode?.converged) {
    const v = branchValues(input.perMode, k);
    add('complex-fit', v, v.u, `window of ${mode.best.source}`);
  }
  if (source.method !== 'conductance-peak' && peak.conductance)
    add('conductance-peak', peak.conductance, peak.conductance.uncertainty, mode.best.source);
  if (peak.halfPower) add('half-power', peak.halfPower, undefined, mode.best.source);
  if (reference.closedForm)
    add('closed-form', reference.closedForm, undefined, `fa from ${reference.closedForm.source}`);
  for (const ls of reference.loadShift) add('load-shift', ls, undefined, ls.source);
  if (reference.twoLoad) {
    const t = reference.twoLoad;
    add(
      'two-load',
      { c1F: t.c1F, l1H: 1 / ((2 * Math.PI * br.fsHz) ** 2 * t.c1F) },
      t.uncertainty ? { c1F: t.uncertainty.c1F } : undefined,
      t.note,
    );
  }
  if (reference.threeLoad) {
    const t = reference.threeLoad;
    add('two-load', { fsHz: t.fsHz }, undefined, t.note);
  }
  return lists;
}
