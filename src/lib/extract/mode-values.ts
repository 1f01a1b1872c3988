/**
 * Step 5 of a sample's extraction (extract-sample.ts): where each mode's published values come
 * from — the joint fit when the mode was free in it, else its own window fit, else the
 * conductance peak — and which modes are reported. Modes the screening dropped (screen-modes.ts)
 * and modes with no usable estimate are not; a spurious mode must stay reportable with its
 * final values.
 */
import type { BvdModel, MotionalBranch } from '../models/bvd.ts';
import type { Diagnostic } from './types.ts';
import type { FitBvdResult } from './fit-bvd.ts';
import type { ModeSource } from './mode-report.ts';
import type { SampleFits } from './sample-fits.ts';
import type { SampleMode } from './sample-start.ts';
import { spuriousRejection } from './screen-modes.ts';
import { formatFrequency } from './format-frequency.ts';

/** A mode with its window fit and the values chosen for it. */
export interface ChosenMode extends SampleMode {
  /** Its own window fit, when attempted. */
  perMode?: FitBvdResult;
  branch: MotionalBranch;
  /** Where the values come from; undefined: not reported. */
  source?: ModeSource;
}

/** Choose every mode's values (in mode order); why a mode is not reported goes to `diagnostics`. */
export function chooseModeValues(
  modes: SampleMode[],
  fits: SampleFits,
  initial: BvdModel,
  diagnostics: Diagnostic[],
): ChosenMode[] {
  const joint = fits.converged;
  return modes.map((mode) => {
    const k = mode.index;
    const m = mode.candidate;
    const where = `mode near ${formatFrequency(m.fsHz, 8)}`;
    const pm = fits.perMode[k];
    const screened = fits.screen.dropped[k];
    if (screened !== undefined) {
      const failed = m.spurious && fits.screen.duplicateOf[k] < 0 && !pm?.converged;
      diagnostics.push({
        code: 'other',
        severity: failed ? 'warning' : 'info',
        message: `${m.spurious ? 'spurious ' : ''}${where}: not reported, ${screened}${failed ? ` (${pm?.reason ?? 'not attempted'})` : ''}`,
      });
      return { ...mode, perMode: pm, branch: initial.branches[k] };
    }
    if (joint && fits.jointFree.includes(k)) {
      const j = fits.jointIndex[k];
      return {
        ...mode,
        perMode: pm,
        branch: { ...joint.model.branches[j] },
        source: { method: 'joint-fit', fit: joint, uncertainty: joint.uncertainty.branches[j] },
      };
    }
    if (pm?.converged) {
      return {
        ...mode,
        perMode: pm,
        branch: { ...pm.model.branches[k] },
        source: { method: 'complex-fit', fit: pm, uncertainty: pm.uncertainty.branches[k] },
      };
    }
    const c = mode.peak.conductance;
    if (c?.uncertainty) {
      diagnostics.push({
        code: 'fit-failed',
        severity: 'warning',
        message: `${where}: least-squares fit failed (${pm?.reason ?? 'not attempted'}); values from the conductance peak`,
      });
      return {
        ...mode,
        perMode: pm,
        branch: { fsHz: c.fsHz, r1Ohm: c.r1Ohm, c1F: c.c1F },
        source: { method: 'conductance-peak', uncertainty: c.uncertainty },
      };
    }
    const why = [
      pm ? `fit: ${pm.reason}` : 'fit not attempted',
      `conductance peak: ${m.best.resonance.conductance.reason}`,
    ].join('; ');
    diagnostics.push({
      code: 'fit-failed',
      severity: 'error',
      message: `${where}: dropped, no usable estimate (${why})`,
    });
    return { ...mode, perMode: pm, branch: initial.branches[k] };
  });
}

/**
 * The modes to report, in mode order: spurious modes too weak against their main mode's final
 * R1 are dropped here (with a note). A window fit's branch index maps to the mode's place
 * among the reported modes.
 */
export function reportedModes(chosen: ChosenMode[], diagnostics: Diagnostic[]): ChosenMode[] {
  for (const mode of chosen) {
    const m = mode.candidate;
    const src = mode.source;
    if (!m.spurious || !src || m.mainIndex === undefined) continue;
    const mainMode = chosen[m.mainIndex];
    const main = mainMode.source ? mainMode.branch : undefined;
    const why = spuriousRejection(mode.branch.r1Ohm, main?.r1Ohm, src.method !== 'conductance-peak');
    if (why === undefined) continue;
    mode.source = undefined;
    diagnostics.push({
      code: 'other',
      severity: src.method === 'conductance-peak' ? 'warning' : 'info',
      message: `spurious mode near ${formatFrequency(m.fsHz, 8)}: not reported, ${why}`,
    });
  }
  const kept = chosen.filter((m) => m.source !== undefined);
  kept.forEach((mode, kk) => {
    const src = mode.source!;
    if (src.method === 'complex-fit') src.mapIndex = (j) => (j === mode.index ? kk : -1);
  });
  return kept;
}
