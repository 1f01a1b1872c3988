/**
 * Step 4 of a sample's extraction (extract-sample.ts): the least-squares fits of every mode and
 * the joint fit (fit-modes.ts). A duplicate that was a main mode hands its role to the mode kept
 * in its place.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { Diagnostic } from './types.ts';
import type { FitBvdResult } from './fit-bvd.ts';
import { fitModes, type ModeFits } from './fit-modes.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import type { SampleMode } from './sample-start.ts';
import type { TimingCollector } from './timing.ts';

/** The fits of a sample. */
export interface SampleFits extends ModeFits {
  /** The joint fit when it converged. */
  converged?: FitBvdResult;
}

/** Fit every mode and all of them jointly; the candidates' roles follow the screening. */
export function fitSample(
  modes: SampleMode[],
  initial: BvdModel,
  reference: PreparedSweep[],
  trustedMaxHz: number | undefined,
  diagnostics: Diagnostic[],
  timing?: TimingCollector,
): SampleFits {
  const candidates = modes.map((m) => m.candidate);
  const quickOk = modes.map((m) => m.peak.conductance?.uncertainty !== undefined);
  const fits = fitModes(
    candidates,
    initial,
    reference,
    quickOk,
    modes.map((m) => m.flagged),
    trustedMaxHz,
    timing,
  );
  const converged = fits.joint?.converged ? fits.joint : undefined;
  if (fits.joint && !converged) {
    diagnostics.push({
      code: 'fit-failed',
      severity: 'warning',
      message: `joint fit over all sweeps failed (${fits.joint.reason}); values from the per-mode fits`,
    });
  }
  handOverDuplicates(modes, fits.screen.duplicateOf);
  return { ...fits, converged };
}

/** A duplicate that was a main mode hands its role to the mode kept in its place. */
function handOverDuplicates(modes: SampleMode[], duplicateOf: number[]): void {
  duplicateOf.forEach((s, k) => {
    if (s < 0) return;
    const gone = modes[k].candidate;
    const kept = modes[s].candidate;
    if (!gone.spurious && kept.spurious) {
      kept.spurious = false;
      kept.overtone = gone.overtone;
      kept.mainIndex = undefined;
      kept.resistanceRatio = undefined;
      kept.strengthDb = undefined;
    }
    for (const m of modes) if (m.candidate.mainIndex === k) m.candidate.mainIndex = s;
  });
}
