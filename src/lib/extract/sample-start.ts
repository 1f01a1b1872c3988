/**
 * Step 3 of a sample's extraction (extract-sample.ts): the quick methods of each mode
 * (conductance peak, half-power; mode-methods.ts), the capacitive-region C0 (c0-estimate.ts),
 * and the model the fits start from. When the capacitive region gives no C0, the susceptance at
 * the main resonance does (circle centre); a C0 below zero there means the record's added
 * capacitor is wrong, and the sample stops.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { Diagnostic } from './types.ts';
import type { ModeCandidate } from './classify-modes.ts';
import { estimateC0, type C0Estimate } from './c0-estimate.ts';
import { otherBranchesCF, peakMethodsOf, type PeakMethods, type ReferenceMethods } from './mode-methods.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import { picofarads } from './format-capacitance.ts';

/** What the fits need to know of one mode before they run, and what they give. */
export interface SampleMode {
  /** Position in the classified mode list (mainIndex and the fits' indices refer to it). */
  index: number;
  candidate: ModeCandidate;
  peak: PeakMethods;
  /** Closed form and load shift (need C0 and the other modes). */
  reference: ReferenceMethods;
  /** Above the instrument's trusted range. */
  flagged: boolean;
}

/** The quick methods of every mode. */
export function quickMethods(candidates: ModeCandidate[], reference: PreparedSweep[]): PeakMethods[] {
  return candidates.map((m) => peakMethodsOf(m, reference));
}

/** C0 from the capacitive region of the reference sweeps, with the modes as hints. */
export function capacitiveRegionC0(
  reference: PreparedSweep[],
  peaks: PeakMethods[],
  trustedMaxHz: number | undefined,
  diagnostics: Diagnostic[],
): C0Estimate {
  const c0Est = estimateC0(
    reference.map((s) => ({ ...s.part, maxTrustedHz: trustedMaxHz })),
    peaks.map((p) => ({
      fsHz: p.branch.fsHz,
      q: 1 / (2 * Math.PI * p.branch.fsHz * p.branch.r1Ohm * p.branch.c1F),
      c1F: p.branch.c1F,
      r1Ohm: p.branch.r1Ohm,
    })),
  );
  if (!c0Est.ok)
    diagnostics.push({ code: 'other', severity: 'info', message: `capacitive-region C0: ${c0Est.reason}` });
  return c0Est;
}

/** C0 the fits start from. */
export interface C0Start {
  /** Positive, F. */
  c0F: number;
  /** C0 the susceptance at resonance gave when it was not positive, F; c0F is then only a guess for the fits. */
  notPositiveF?: number;
}

/**
 * C0 the fits start from: the capacitive region's, else the susceptance at the first mode's
 * resonance less the other branches.
 * @returns undefined when the record's added capacitor is larger than all the shunt capacitance seen (an error is in `diagnostics`)
 */
export function startC0(
  candidates: ModeCandidate[],
  peaks: PeakMethods[],
  c0Est: C0Estimate,
  reference: PreparedSweep[],
  diagnostics: Diagnostic[],
): C0Start | undefined {
  let c0F = c0Est.ok ? c0Est.c0F : 0;
  if (c0F > 0) return { c0F };
  // Circle centre: at fs the branch adds no susceptance, so B(fs) = ωC0 + other branches.
  const m = candidates[0];
  const s = reference.find((x) => x.index === m.best.sweepIndex)!;
  const i = m.best.resonance.peakIndex;
  const probe: BvdModel = { c0F: 0, branches: peaks.map((p) => p.branch) };
  c0F = s.part.bS[i] / (2 * Math.PI * s.part.freqHz[i]) - otherBranchesCF(probe, 0, s.part.freqHz[i]);
  // The capacitor the record says was added is larger than all the shunt capacitance seen
  // (the capacitive region, else the susceptance at resonance, gives C0 < 0 for the part alone):
  // the record is wrong, and no C0 of the part alone can be given.
  const negativeC0F = c0Est.nonPhysicalC0F ?? (Number.isFinite(c0F) ? c0F : undefined);
  const loaded = c0Est.nonPhysicalC0F !== undefined ? reference.find((x) => x.loaded) : s.loaded ? s : undefined;
  if (loaded && negativeC0F !== undefined && negativeC0F < 0) {
    diagnostics.push({
      code: 'other',
      severity: 'error',
      sweep: loaded.source,
      message: `C0 of the part alone would be ${picofarads(negativeC0F)} pF after removing addedCapacitance ${picofarads(loaded.addedCF!)} pF of sweep ${loaded.source}; check addedCapacitance and addedConnection`,
    });
    return undefined;
  }
  // Only a start for the fits; never published (sample-c0.ts).
  if (!(c0F > 0)) return { c0F: 1e-12, notPositiveF: c0F };
  return { c0F };
}
