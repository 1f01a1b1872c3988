/**
 * Extraction of one sample: find the resonances of every sweep, merge and classify the modes
 * at the reference conditions, run the quick methods (conductance peak, half-power, closed
 * form, load shift, capacitive-region C0), fit each mode on a window and all reference sweeps
 * jointly, and report every mode with its uncertainty and cross-check. Sweeps at other
 * temperatures and drive levels give the temperature fit and the drive-level analysis.
 *
 * Published numbers are always finite: a mode whose every estimate failed is dropped with an
 * error diagnostic and a warning that says why. Duplicates of a stronger mode and spurious
 * modes that are not reportable (screen-modes.ts: no converged fit, or more than 40 dB below
 * the main mode) are dropped with a note.
 */
import type { Part, Sample } from '../schema/part.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { CrossCheck, Diagnostic, FitSummary, MethodValue, ModeResult, SampleResult } from './types.ts';
import { findResonances, type Resonance } from './find-resonances.ts';
import { classifyModes, type ModeCandidate, type Observation } from './classify-modes.ts';
import { estimateC0 } from './c0-estimate.ts';
import { peakMethodsOf, referenceMethodsOf, otherBranchesCF, type PeakMethods, type ReferenceMethods } from './mode-methods.ts';
import { fitModes } from './fit-modes.ts';
import { spuriousRejection } from './screen-modes.ts';
import { reportMode, type ModeSource } from './mode-report.ts';
import { crossCheck } from './cross-check.ts';
import { prepareSweeps, referenceConditions, SAME_TEMPERATURE_C, type ExtractSweepInput } from './reference-conditions.ts';
import { instrumentRangeDiagnostic, noiseDiagnostic, plausibilityDiagnostics, resolutionDiagnostic, spanMissingFaDiagnostic } from './diagnostics.ts';
import { mainModeAtConditions, type ConditionPoint } from './other-conditions.ts';
import { fitTemperature } from './temperature.ts';
import { analyseDriveLevel, DRIVE_RATIO_WARNING } from './drive-level.ts';
import { mainMode } from './main-mode.ts';
import { formatFrequency } from './format-frequency.ts';
import { parallelResonanceOf } from './closed-form.ts';
import { timed, type TimingCollector } from './timing.ts';
import { antiResonanceEvidence, FA_VISIBLE_SNR, type NoisySweep } from './fa-visibility.ts';
import { impedanceSigmaOhm } from './measurement-noise.ts';

/** Options of the extraction. */
export interface ExtractOptions {
  /** Receives the time spent per step (find, classify, quick, c0, fit-mode, fit-joint, report, conditions). */
  timing?: TimingCollector;
}

const NO_FIT: FitSummary = { converged: false, reason: 'no fit attempted', iterations: 0, rmsResidual: 0, points: 0 };

function summary(f: FitSummary): FitSummary {
  return { converged: f.converged, reason: f.reason, iterations: f.iterations, rmsResidual: f.rmsResidual, points: f.points };
}

function warningsOf(diagnostics: Diagnostic[]): string[] {
  return [...new Set(diagnostics.filter((d) => d.severity !== 'info').map((d) => d.message))];
}

/** Extract one sample of a part from its sweeps (those with `sampleId` = sample.id). */
export function extractSample(part: Part, sample: Sample, inputs: ExtractSweepInput[], options: ExtractOptions = {}): SampleResult {
  const timing = options.timing;
  const diagnostics: Diagnostic[] = [];
  const prepared = timed(timing, 'prepare', () => prepareSweeps(inputs, sample.temperature));
  const empty = (c0F = 0): SampleResult => ({
    sample: sample.id, c0F, modes: [], warnings: warningsOf(diagnostics), model: { c0F, branches: [] },
    c0CrossCheck: { quantity: 'c0F', values: [], verdict: 'single', rule: 'no estimate' }, fit: NO_FIT, diagnostics,
    otherConditions: [], spanHz: spanOf(), mainMode: { index: -1, rule: 'no modes' }, referenceSweeps: referenceSweeps(),
  });
  const spanOf = () => prepared.length
    ? { min: Math.min(...prepared.map((s) => s.minHz)), max: Math.max(...prepared.map((s) => s.maxHz)) }
    : { min: 0, max: 0 };
  if (prepared.length === 0) {
    diagnostics.push({ code: 'other', severity: 'error', message: `sample ${sample.id}: no readable sweep with at least 3 points` });
    return empty();
  }
  const split = referenceConditions(prepared, sample.temperature);
  function referenceSweeps(): string[] {
    return split.reference.map((s) => s.source);
  }
  const trustedMax = sample.instrumentMaxFrequency;
  for (const s of prepared) {
    const d = instrumentRangeDiagnostic(s.source, s.maxHz, trustedMax);
    if (d) diagnostics.push(d);
  }

  // Resonances of every sweep.
  const found = new Map<number, Resonance[]>();
  timed(timing, 'find', () => {
    for (const s of prepared) {
      // A loaded sweep is centred on the load frequency: the part's own peak may sit at its
      // edge by design, and a series capacitor taken out of Z leaves noise not proportional to |Y|.
      const r = findResonances(s.part, { shapeCheck: !(s.loaded && s.connection === 'series') });
      found.set(s.index, r.resonances);
      diagnostics.push(...r.diagnostics.filter((d) => !(s.loaded && (d.code === 'resonance-at-edge' || d.code === 'no-resonance'))));
    }
  });
  const observations: Observation[] = split.reference.flatMap((s) => (found.get(s.index) ?? []).map((resonance) => ({ sweepIndex: s.index, source: s.source, resonance, loaded: s.loaded })));
  const classified = timed(timing, 'classify', () => classifyModes(observations, { kind: part.kind, datasheetFrequencyHz: part.datasheet?.frequency, datasheetOvertone: part.datasheet?.overtone }));
  diagnostics.push(...classified.diagnostics);
  const candidates = classified.modes;

  // Quick methods and C0.
  const peaks: PeakMethods[] = timed(timing, 'quick', () => candidates.map((m) => peakMethodsOf(m, split.reference)));
  const c0Est = timed(timing, 'c0', () => estimateC0(
    split.reference.map((s) => ({ ...s.part, maxTrustedHz: trustedMax })),
    peaks.map((p) => ({ fsHz: p.branch.fsHz, q: 1 / (2 * Math.PI * p.branch.fsHz * p.branch.r1Ohm * p.branch.c1F), c1F: p.branch.c1F, r1Ohm: p.branch.r1Ohm })),
  ));
  if (!c0Est.ok) diagnostics.push({ code: 'other', severity: 'info', message: `capacitive-region C0: ${c0Est.reason}` });
  if (candidates.length === 0) {
    diagnostics.push({ code: 'no-resonance', severity: 'error', message: `sample ${sample.id}: no resonance found in the sweeps at the reference conditions` });
    return empty(c0Est.ok ? c0Est.c0F : 0);
  }
  let c0Start = c0Est.ok ? c0Est.c0F : 0;
  /** C0 the susceptance at resonance gave when it was not positive, F; c0Start is then only a guess for the fits. */
  let c0NotPositive: number | undefined;
  if (!(c0Start > 0)) {
    // Circle centre: at fs the branch adds no susceptance, so B(fs) = ωC0 + other branches.
    const m = candidates[0];
    const s = split.reference.find((x) => x.index === m.best.sweepIndex)!;
    const i = m.best.resonance.peakIndex;
    const probe: BvdModel = { c0F: 0, branches: peaks.map((p) => p.branch) };
    c0Start = s.part.bS[i] / (2 * Math.PI * s.part.freqHz[i]) - otherBranchesCF(probe, 0, s.part.freqHz[i]);
    // The capacitor the record says was added is larger than all the shunt capacitance seen
    // (the capacitive region, else the susceptance at resonance, gives C0 < 0 for the part alone):
    // the record is wrong, and no C0 of the part alone can be given.
    const negativeC0F = c0Est.nonPhysicalC0F ?? (Number.isFinite(c0Start) ? c0Start : undefined);
    const loaded = c0Est.nonPhysicalC0F !== undefined ? split.reference.find((x) => x.loaded) : s.loaded ? s : undefined;
    if (loaded && negativeC0F !== undefined && negativeC0F < 0) {
      diagnostics.push({
        code: 'other', severity: 'error', sweep: loaded.source,
        message: `C0 of the part alone would be ${picofarads(negativeC0F)} pF after removing addedCapacitance ${picofarads(loaded.addedCF!)} pF of sweep ${loaded.source}; check addedCapacitance and addedConnection`,
      });
      return empty();
    }
    if (!(c0Start > 0)) {
      // Only a start for the fits; never published (see "C0 of the part alone" below).
      c0NotPositive = c0Start;
      c0Start = 1e-12;
    }
  }
  const initial: BvdModel = { c0F: c0Start, branches: peaks.map((p) => ({ ...p.branch })) };
  const refMethods: ReferenceMethods[] = timed(timing, 'load-shift', () => candidates.map((m, k) => referenceMethodsOf(m, k, initial, split.reference)));
  const flagged = candidates.map((m) => trustedMax !== undefined && m.fsHz > trustedMax);

  // Fits.
  const quickOk = peaks.map((p) => p.conductance?.uncertainty !== undefined);
  const fits = fitModes(candidates, initial, split.reference, quickOk, flagged, trustedMax, timing);
  const joint = fits.joint?.converged ? fits.joint : undefined;
  if (fits.joint && !joint) {
    diagnostics.push({ code: 'fit-failed', severity: 'warning', message: `joint fit over all sweeps failed (${fits.joint.reason}); values from the per-mode fits` });
  }

  // A duplicate that was a main mode hands its role to the mode kept in its place.
  fits.screen.duplicateOf.forEach((s, k) => {
    if (s < 0) return;
    const gone = candidates[k];
    const kept = candidates[s];
    if (!gone.spurious && kept.spurious) {
      kept.spurious = false;
      kept.overtone = gone.overtone;
      kept.mainIndex = undefined;
      kept.resistanceRatio = undefined;
      kept.strengthDb = undefined;
    }
    for (const m of candidates) if (m.mainIndex === k) m.mainIndex = s;
  });

  return timed(timing, 'report', () => {
    // Where each mode's values come from; modes with no usable estimate are dropped.
    const branches: BvdModel['branches'] = [];
    const sources: Array<ModeSource | undefined> = [];
    candidates.forEach((m, k) => {
      const where = `mode near ${formatFrequency(m.fsHz, 8)}`;
      const pm = fits.perMode[k];
      const screened = fits.screen.dropped[k];
      if (screened !== undefined) {
        branches.push(initial.branches[k]);
        sources.push(undefined);
        const failed = m.spurious && fits.screen.duplicateOf[k] < 0 && !pm?.converged;
        diagnostics.push({
          code: 'other', severity: failed ? 'warning' : 'info',
          message: `${m.spurious ? 'spurious ' : ''}${where}: not reported, ${screened}${failed ? ` (${pm?.reason ?? 'not attempted'})` : ''}`,
        });
        return;
      }
      if (joint && fits.jointFree.includes(k)) {
        const j = fits.jointIndex[k];
        branches.push({ ...joint.model.branches[j] });
        sources.push({ method: 'joint-fit', fit: joint, uncertainty: joint.uncertainty.branches[j] });
      } else if (pm?.converged) {
        branches.push({ ...pm.model.branches[k] });
        sources.push({ method: 'complex-fit', fit: pm, uncertainty: pm.uncertainty.branches[k], mapIndex: (j) => (j === k ? k : -1) });
      } else if (peaks[k].conductance?.uncertainty) {
        const c = peaks[k].conductance!;
        branches.push({ fsHz: c.fsHz, r1Ohm: c.r1Ohm, c1F: c.c1F });
        sources.push({ method: 'conductance-peak', uncertainty: c.uncertainty! });
        diagnostics.push({ code: 'fit-failed', severity: 'warning', message: `${where}: least-squares fit failed (${pm?.reason ?? 'not attempted'}); values from the conductance peak` });
      } else {
        branches.push(initial.branches[k]);
        sources.push(undefined);
        const why = [pm ? `fit: ${pm.reason}` : 'fit not attempted', `conductance peak: ${m.best.resonance.conductance.reason}`].join('; ');
        diagnostics.push({ code: 'fit-failed', severity: 'error', message: `${where}: dropped, no usable estimate (${why})` });
      }
    });
    // Spurious modes must stay reportable with their final values (screen-modes.ts).
    candidates.forEach((m, k) => {
      const src = sources[k];
      if (!m.spurious || !src || m.mainIndex === undefined) return;
      const main = sources[m.mainIndex] ? branches[m.mainIndex] : undefined;
      const why = spuriousRejection(branches[k].r1Ohm, main?.r1Ohm, src.method !== 'conductance-peak');
      if (why === undefined) return;
      sources[k] = undefined;
      diagnostics.push({ code: 'other', severity: src.method === 'conductance-peak' ? 'warning' : 'info', message: `spurious mode near ${formatFrequency(m.fsHz, 8)}: not reported, ${why}` });
    });
    const kept = candidates.map((_, k) => k).filter((k) => sources[k] !== undefined);
    kept.forEach((k, kk) => {
      const src = sources[k]!;
      if (src.method === 'complex-fit') src.mapIndex = (j) => (j === k ? kk : -1);
    });

    // C0 of the part alone.
    let c0: { value: number; uncertainty: number; method: MethodValue['method'] };
    if (joint) c0 = { value: joint.model.c0F, uncertainty: joint.uncertainty.c0F, method: 'joint-fit' };
    else if (c0Est.ok) c0 = { value: c0Est.c0F, uncertainty: c0Est.uncertaintyF, method: 'capacitive-region' };
    else {
      const withC0 = kept.map((k) => fits.perMode[k]).find((f) => f?.converged && f.parameterNames?.includes('lnC0F'));
      if (!withC0 && c0NotPositive !== undefined) {
        // The only C0 left would be the fits' start guess: publish no C0 and no modes.
        diagnostics.push({
          code: 'other', severity: 'error',
          message: `sample ${sample.id}: no C0: the susceptance at resonance gives ${Number.isFinite(c0NotPositive) ? `${picofarads(c0NotPositive)} pF` : 'no value'} and no fit converged; sweep a wider span for the capacitive region, and check the fixture correction`,
        });
        return empty();
      }
      c0 = withC0 ? { value: withC0.model.c0F, uncertainty: withC0.uncertainty.c0F, method: 'complex-fit' } : { value: c0Start, uncertainty: 0.1 * c0Start, method: 'conductance-peak' };
      if (!withC0) diagnostics.push({ code: 'other', severity: 'warning', message: `C0 only from the susceptance at resonance (${(c0Start * 1e12).toPrecision(4)} pF, ±10 %); sweep a wider span for the capacitive region` });
    }
    const model: BvdModel = { c0F: c0.value, branches: kept.map((k) => branches[k]) };

    // Each unloaded reference sweep with the noise its final weights used (fa-visibility.ts).
    const finalNoise = new Map(fits.jointNoise.map((j) => [j.source, j.noise]));
    const unloadedNoisy: NoisySweep[] = split.reference.filter((s) => !s.loaded).map((s) => {
      const noise = finalNoise.get(s.source) ?? s.noise;
      return { source: s.source, freqHz: s.impedance.freqHz, zRe: s.impedance.zRe, zIm: s.impedance.zIm, sigmaZOhm: impedanceSigmaOhm(s.recorded, noise) };
    });

    const modes: ModeResult[] = [];
    kept.forEach((k, kk) => {
      const m = candidates[k];
      const source = sources[k]!;
      const mainK = m.mainIndex !== undefined ? kept.indexOf(m.mainIndex) : -1;
      const evidence = m.spurious ? undefined : antiResonanceEvidence(model, kk, parallelResonanceOf(model, kk) ?? 0, unloadedNoisy);
      const mode = reportMode({
        k: kk, mode: m, model, source,
        c0: { value: c0.value, uncertainty: c0.uncertainty, heldInFit: !source.fit?.parameterNames?.includes('lnC0F') },
        peak: peaks[k], reference: refMethods[k], perMode: fits.perMode[k],
        flagged: flagged[k], mainR1Ohm: mainK >= 0 ? model.branches[mainK].r1Ohm : undefined,
        sweeps: [...new Set(m.observations.map((o) => o.source))],
        faEvidence: evidence?.snr,
      });
      modes.push(mode);
      const res = m.best.resonance;
      const d1 = resolutionDiagnostic({ source: m.best.source, fsHz: mode.fsHz, bandwidthHz: mode.fsHz / mode.q, stepHz: res.stepHz, pointsPerBandwidth: res.pointsPerBandwidth });
      if (d1) diagnostics.push(d1);
      if (!m.spurious) {
        if (!evidence) diagnostics.push(spanMissingFaDiagnostic(mode.fsHz, mode.fpHz));
        else if (evidence.snr < FA_VISIBLE_SNR) {
          diagnostics.push({
            code: 'signal-to-noise', severity: 'warning', sweep: evidence.source,
            message: `mode near ${formatFrequency(mode.fsHz, 8)}: its anti-resonance near ${formatFrequency(mode.fpHz, 8)} is not seen above the noise floor (evidence ${evidence.snr.toPrecision(2)}, want ≥ ${FA_VISIBLE_SNR} in ${evidence.source}); fp comes from C0 and C1 alone`,
          });
        }
      }
      diagnostics.push(...plausibilityDiagnostics(mode, part.kind));
      for (const cc of mode.crossCheck) {
        if (cc.verdict === 'disagree') diagnostics.push({ code: 'methods-disagree', severity: 'warning', message: `mode near ${formatFrequency(mode.fsHz, 8)}: ${cc.message}` });
      }
    });

    // C0 cross-check.
    const c0Values: MethodValue[] = [{ method: c0.method, value: c0.value, uncertainty: c0.uncertainty > 0 ? c0.uncertainty : undefined }];
    if (c0.method !== 'capacitive-region' && c0Est.ok) c0Values.push({ method: 'capacitive-region', value: c0Est.c0F, uncertainty: c0Est.uncertaintyF, note: c0Est.sweeps.join(', ') });
    const mainPick = mainMode(modes, { frequency: part.datasheet?.frequency, overtone: part.datasheet?.overtone });
    const mainK = mainPick.index;
    if (mainK >= 0) {
      const k = kept[mainK];
      const pm = fits.perMode[k];
      if (c0.method !== 'complex-fit' && pm?.converged && pm.parameterNames?.includes('lnC0F')) c0Values.push({ method: 'complex-fit', value: pm.model.c0F, uncertainty: pm.uncertainty.c0F, note: `window of ${candidates[k].best.source}` });
      const two = refMethods[k].twoLoad;
      if (two) c0Values.push({ method: 'two-load', value: two.c0F, uncertainty: two.uncertainty?.c0F, note: two.note });
    }
    const c0CrossCheck: CrossCheck = crossCheck('c0F', c0Values, 'fixture stray capacitance, or modes outside the swept span');
    if (c0CrossCheck.verdict === 'disagree') diagnostics.push({ code: 'methods-disagree', severity: 'warning', message: c0CrossCheck.message! });

    const fitSummary = joint ?? fits.joint ?? fits.perMode.find((f) => f?.converged) ?? fits.perMode.find((f) => f !== undefined);
    if (fitSummary?.converged) {
      const nd = noiseDiagnostic(joint ? 'joint fit' : 'mode fit', fitSummary.rmsResidual);
      if (nd) diagnostics.push(nd);
    }

    const result: SampleResult = {
      sample: sample.id,
      c0F: c0.value,
      modes,
      warnings: [],
      model,
      temperatureC: split.temperatureC,
      driveW: split.driveW,
      c0CrossCheck,
      fit: fitSummary ? summary(fitSummary) : NO_FIT,
      diagnostics,
      otherConditions: [],
      spanHz: spanOf(),
      mainMode: mainPick,
      referenceSweeps: referenceSweeps(),
    };

    // Other conditions: temperature and drive.
    if (mainK >= 0) timed(timing, 'conditions', () => conditions(result, split, found, model, mainK, part, candidates[kept[mainK]]));
    result.warnings = warningsOf(diagnostics);
    return result;
  });
}

function conditions(result: SampleResult, split: ReturnType<typeof referenceConditions>, found: Map<number, Resonance[]>, model: BvdModel, k: number, part: Part, cand: ModeCandidate): void {
  const main = result.modes[k];
  const others = mainModeAtConditions(split.others, found, model, k);
  result.otherConditions = others.map((p) => ({ sweep: p.sweep, temperatureC: p.temperatureC, driveW: p.driveW, fsHz: p.fsHz, r1Ohm: p.r1Ohm }));
  const refPoint: ConditionPoint = { sweep: cand.best.source, temperatureC: split.temperatureC, driveW: split.driveW, fsHz: main.fsHz, r1Ohm: main.r1Ohm, pointsPerBandwidth: Infinity };
  const all = [refPoint, ...others];

  // Temperature: one point per temperature, at its lowest drive, best resolved.
  const byTemp: ConditionPoint[] = [];
  for (const p of all) {
    if (p.temperatureC === undefined) continue;
    const i = byTemp.findIndex((q) => Math.abs(q.temperatureC! - p.temperatureC!) < SAME_TEMPERATURE_C);
    if (i < 0) { byTemp.push(p); continue; }
    const q = byTemp[i];
    const lower = (p.driveW ?? 0) < (q.driveW ?? 0);
    const same = (p.driveW ?? 0) === (q.driveW ?? 0);
    if (lower || (same && p.pointsPerBandwidth > q.pointsPerBandwidth)) byTemp[i] = p;
  }
  if (byTemp.length >= 3) {
    const t = fitTemperature(byTemp.map((p) => ({ temperatureC: p.temperatureC!, fsHz: p.fsHz })), part.kind, part.datasheet?.operatingRange);
    if (t.ok) {
      result.temperature = t.fit;
      if (t.note) result.diagnostics.push({ code: 'other', severity: 'info', message: `temperature fit: ${t.note}` });
    } else result.diagnostics.push({ code: 'other', severity: 'warning', message: `temperature fit: ${t.reason}` });
  } else if (byTemp.length === 2) {
    result.diagnostics.push({ code: 'other', severity: 'info', message: 'fs known at 2 temperatures; a temperature fit needs at least 3' });
  }

  // Drive level at the reference temperature.
  const atRefTemp = all.filter((p) => p.driveW !== undefined && (split.temperatureC === undefined || p.temperatureC === undefined || Math.abs(p.temperatureC - split.temperatureC) < SAME_TEMPERATURE_C));
  const drive = analyseDriveLevel(atRefTemp.map((p) => ({ driveW: p.driveW!, r1Ohm: p.r1Ohm, fsHz: p.fsHz, sweep: p.sweep })));
  if (drive) {
    result.drive = drive;
    if (drive.resistanceRatio > DRIVE_RATIO_WARNING) {
      result.diagnostics.push({ code: 'drive-dependence', severity: 'warning', message: `R1 changes by a factor ${drive.resistanceRatio.toFixed(2)} over the drive levels measured (limit used ${DRIVE_RATIO_WARNING}); frequency moves ${drive.frequencyShiftPpm.toFixed(2)} ppm` });
    }
  }
}

/** A capacitance for messages, pF with a true minus sign: "−7.00". */
function picofarads(f: number): string {
  const v = f * 1e12;
  return `${v < 0 ? '−' : ''}${Math.abs(v).toPrecision(3)}`;
}
