/**
 * Extraction of one sample, step by step:
 * 1. prepare the sweeps and split them into the reference conditions and the others
 *    (reference-conditions.ts);
 * 2. find the resonances of every sweep, merge and classify the modes (sample-resonances.ts);
 * 3. quick methods, capacitive-region C0 and the fits' start (sample-start.ts);
 * 4. fit each mode on a window and all reference sweeps jointly (sample-fits.ts);
 * 5. choose each mode's values and report it with its uncertainty and cross-check
 *    (mode-values.ts, sample-c0.ts, report-modes.ts);
 * 6. cross-check C0 (sample-c0.ts);
 * 7. sweeps at other temperatures and drive levels (sample-conditions.ts).
 *
 * Published numbers are always finite: a mode whose every estimate failed is dropped with an
 * error diagnostic and a warning that says why. Duplicates of a stronger mode and spurious
 * modes that are not reportable (screen-modes.ts: no converged fit, or more than 40 dB below
 * the main mode) are dropped with a note.
 */
import type { Part, Sample } from '../schema/part.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { Diagnostic, FitSummary, SampleResult } from './types.ts';
import { referenceMethodsOf } from './mode-methods.ts';
import {
  prepareSweeps,
  referenceConditions,
  type ExtractSweepInput,
  type PreparedSweep,
} from './reference-conditions.ts';
import { instrumentRangeDiagnostic, noiseDiagnostic } from './diagnostics.ts';
import { mainMode } from './main-mode.ts';
import { timed, type TimingCollector } from './timing.ts';
import { classifyReferenceModes, findSweepResonances } from './sample-resonances.ts';
import { capacitiveRegionC0, quickMethods, startC0, type SampleMode } from './sample-start.ts';
import { fitSample, type SampleFits } from './sample-fits.ts';
import { chooseModeValues, reportedModes } from './mode-values.ts';
import { c0CrossCheckOf, c0OfPartAlone } from './sample-c0.ts';
import { reportModes, unloadedNoisySweeps } from './report-modes.ts';
import { addOtherConditions } from './sample-conditions.ts';

/** Options of the extraction. */
export interface ExtractOptions {
  /** Receives the time spent per step (prepare, find, classify, quick, c0, load-shift, fit-mode, fit-joint, report, conditions). */
  timing?: TimingCollector;
}

const NO_FIT: FitSummary = { converged: false, reason: 'no fit attempted', iterations: 0, rmsResidual: 0, points: 0 };

function summary(f: FitSummary): FitSummary {
  return {
    converged: f.converged,
    reason: f.reason,
    iterations: f.iterations,
    rmsResidual: f.rmsResidual,
    points: f.points,
  };
}

function warningsOf(diagnostics: Diagnostic[]): string[] {
  return [...new Set(diagnostics.filter((d) => d.severity !== 'info').map((d) => d.message))];
}

function spanOf(prepared: PreparedSweep[]): { min: number; max: number } {
  return prepared.length
    ? { min: Math.min(...prepared.map((s) => s.minHz)), max: Math.max(...prepared.map((s) => s.maxHz)) }
    : { min: 0, max: 0 };
}

/** A sample with no modes: C0 (when known) and the diagnostics that say why. */
function noModes(
  sampleId: string,
  prepared: PreparedSweep[],
  referenceSweeps: string[],
  diagnostics: Diagnostic[],
  c0F = 0,
): SampleResult {
  return {
    sample: sampleId,
    c0F,
    modes: [],
    warnings: warningsOf(diagnostics),
    model: { c0F, branches: [] },
    c0CrossCheck: { quantity: 'c0F', values: [], verdict: 'single', rule: 'no estimate' },
    fit: NO_FIT,
    diagnostics,
    otherConditions: [],
    spanHz: spanOf(prepared),
    mainMode: { index: -1, rule: 'no modes' },
    referenceSweeps,
  };
}

/** The fit that speaks for the sample: the joint fit, else the first converged window fit, else any attempted. */
function sampleFitSummary(fits: SampleFits): FitSummary | undefined {
  return (
    fits.converged ?? fits.joint ?? fits.perMode.find((f) => f?.converged) ?? fits.perMode.find((f) => f !== undefined)
  );
}

/** Extract one sample of a part from its sweeps (those with `sampleId` = sample.id). */
export function extractSample(
  part: Part,
  sample: Sample,
  inputs: ExtractSweepInput[],
  options: ExtractOptions = {},
): SampleResult {
  const timing = options.timing;
  const diagnostics: Diagnostic[] = [];

  // 1. Prepare and split.
  const prepared = timed(timing, 'prepare', () => prepareSweeps(inputs, sample.temperatureC));
  if (prepared.length === 0) {
    diagnostics.push({
      code: 'other',
      severity: 'error',
      message: `sample ${sample.id}: no readable sweep with at least 3 points`,
    });
    return noModes(sample.id, prepared, [], diagnostics);
  }
  const split = referenceConditions(prepared, sample.temperatureC);
  const referenceSweeps = split.reference.map((s) => s.source);
  const empty = (c0F = 0) => noModes(sample.id, prepared, referenceSweeps, diagnostics, c0F);
  const trustedMax = sample.instrumentMaxFrequencyHz;
  for (const s of prepared) {
    const d = instrumentRangeDiagnostic(s.source, s.maxHz, trustedMax);
    if (d) diagnostics.push(d);
  }

  // 2. Resonances and modes.
  const found = timed(timing, 'find', () => findSweepResonances(prepared, diagnostics));
  const candidates = timed(timing, 'classify', () => classifyReferenceModes(part, split, found, diagnostics));

  // 3. Quick methods, C0 and the fits' start.
  const peaks = timed(timing, 'quick', () => quickMethods(candidates, split.reference));
  const c0Est = timed(timing, 'c0', () => capacitiveRegionC0(split.reference, peaks, trustedMax, diagnostics));
  if (candidates.length === 0) {
    diagnostics.push({
      code: 'no-resonance',
      severity: 'error',
      message: `sample ${sample.id}: no resonance found in the sweeps at the reference conditions`,
    });
    return empty(c0Est.ok ? c0Est.c0F : 0);
  }
  const start = startC0(candidates, peaks, c0Est, split.reference, diagnostics);
  if (!start) return empty();
  const initial: BvdModel = { c0F: start.c0F, branches: peaks.map((p) => ({ ...p.branch })) };
  const modes: SampleMode[] = timed(timing, 'load-shift', () =>
    candidates.map((candidate, k) => ({
      index: k,
      candidate,
      peak: peaks[k],
      reference: referenceMethodsOf(candidate, k, initial, split.reference),
      flagged: trustedMax !== undefined && candidate.fsHz > trustedMax,
    })),
  );

  // 4. Fits.
  const fits = fitSample(modes, initial, split.reference, trustedMax, diagnostics, timing);

  return timed(timing, 'report', () => {
    // 5. Values of each mode, C0 of the part alone, the reported modes.
    const kept = reportedModes(chooseModeValues(modes, fits, initial, diagnostics), diagnostics);
    const c0 = c0OfPartAlone(sample.id, fits, c0Est, start, kept, diagnostics);
    if (!c0) return empty();
    const model: BvdModel = { c0F: c0.value, branches: kept.map((m) => m.branch) };
    const results = reportModes(
      kept,
      model,
      c0,
      unloadedNoisySweeps(split.reference, fits.jointNoise),
      part.kind,
      diagnostics,
    );

    // 6. C0 cross-check, with the main mode's own estimates.
    const mainPick = mainMode(results, {
      frequencyHz: part.datasheet?.frequencyHz,
      overtone: part.datasheet?.overtone,
    });
    const main = mainPick.index >= 0 ? kept[mainPick.index] : undefined;
    const c0CrossCheck = c0CrossCheckOf(c0, c0Est, main, diagnostics);

    const fitSummary = sampleFitSummary(fits);
    if (fitSummary?.converged) {
      const nd = noiseDiagnostic(fits.converged ? 'joint fit' : 'mode fit', fitSummary.rmsResidual);
      if (nd) diagnostics.push(nd);
    }

    const result: SampleResult = {
      sample: sample.id,
      c0F: c0.value,
      modes: results,
      warnings: [],
      model,
      temperatureC: split.temperatureC,
      driveW: split.driveW,
      c0CrossCheck,
      fit: fitSummary ? summary(fitSummary) : NO_FIT,
      diagnostics,
      otherConditions: [],
      spanHz: spanOf(prepared),
      mainMode: mainPick,
      referenceSweeps,
    };

    // 7. Other conditions: temperature and drive.
    if (main)
      timed(timing, 'conditions', () =>
        addOtherConditions(result, split, found, model, mainPick.index, part, main.candidate),
      );
    result.warnings = warningsOf(diagnostics);
    return result;
  });
}
