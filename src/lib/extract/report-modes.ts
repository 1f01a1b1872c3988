/**
 * Step 5 of a sample's extraction, the last part (extract-sample.ts): the published result of
 * every reported mode (mode-report.ts) and what the measurement says about it — resolution,
 * whether the anti-resonance is seen above the noise (fa-visibility.ts), plausibility for the
 * part's kind, and methods that disagree.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { PartKind } from '../schema/part.ts';
import type { Diagnostic, ModeResult } from './types.ts';
import type { ChosenMode } from './mode-values.ts';
import type { PublishedC0 } from './sample-c0.ts';
import type { PreparedSweep } from './reference-conditions.ts';
import type { RecordedNoise } from './measurement-noise.ts';
import { impedanceSigmaOhm } from './measurement-noise.ts';
import { reportMode } from './mode-report.ts';
import { parallelResonanceOf } from './closed-form.ts';
import { antiResonanceEvidence, FA_VISIBLE_SNR, type NoisySweep } from './fa-visibility.ts';
import { plausibilityDiagnostics, resolutionDiagnostic, spanMissingFaDiagnostic } from './diagnostics.ts';
import { formatFrequency } from './format-frequency.ts';

/** Each unloaded reference sweep with the noise its final weights used (the joint fit's, else its own). */
export function unloadedNoisySweeps(
  reference: PreparedSweep[],
  jointNoise: Array<{ source: string; noise: RecordedNoise }>,
): NoisySweep[] {
  const finalNoise = new Map(jointNoise.map((j) => [j.source, j.noise]));
  return reference
    .filter((s) => !s.loaded)
    .map((s) => {
      const noise = finalNoise.get(s.source) ?? s.noise;
      return {
        source: s.source,
        freqHz: s.impedance.freqHz,
        zRe: s.impedance.zRe,
        zIm: s.impedance.zIm,
        sigmaZOhm: impedanceSigmaOhm(s.recorded, noise),
      };
    });
}

/**
 * The published result of every reported mode, in order (branch kk of `model` is kept[kk]).
 * @param noisy the unloaded reference sweeps with their final noise ({@link unloadedNoisySweeps})
 */
export function reportModes(
  kept: ChosenMode[],
  model: BvdModel,
  c0: PublishedC0,
  noisy: NoisySweep[],
  kind: PartKind,
  diagnostics: Diagnostic[],
): ModeResult[] {
  return kept.map((chosen, kk) => {
    const m = chosen.candidate;
    const source = chosen.source!;
    const mainK = m.mainIndex !== undefined ? kept.findIndex((x) => x.index === m.mainIndex) : -1;
    const evidence = m.spurious
      ? undefined
      : antiResonanceEvidence(model, kk, parallelResonanceOf(model, kk) ?? 0, noisy);
    const mode = reportMode({
      k: kk,
      mode: m,
      model,
      source,
      c0: { value: c0.value, uncertainty: c0.uncertainty, heldInFit: !source.fit?.parameterNames?.includes('lnC0F') },
      peak: chosen.peak,
      reference: chosen.reference,
      perMode: chosen.perMode,
      flagged: chosen.flagged,
      mainR1Ohm: mainK >= 0 ? model.branches[mainK].r1Ohm : undefined,
      sweeps: [...new Set(m.observations.map((o) => o.source))],
      faEvidence: evidence?.snr,
    });
    const res = m.best.resonance;
    const d1 = resolutionDiagnostic({
      source: m.best.source,
      fsHz: mode.fsHz,
      bandwidthHz: mode.fsHz / mode.q,
      stepHz: res.stepHz,
      pointsPerBandwidth: res.pointsPerBandwidth,
    });
    if (d1) diagnostics.push(d1);
    if (!m.spurious) {
      if (!evidence) diagnostics.push(spanMissingFaDiagnostic(mode.fsHz, mode.fpHz));
      else if (evidence.snr < FA_VISIBLE_SNR) {
        diagnostics.push({
          code: 'signal-to-noise',
          severity: 'warning',
          sweep: evidence.source,
          message: `mode near ${formatFrequency(mode.fsHz, 8)}: its anti-resonance near ${formatFrequency(mode.fpHz, 8)} is not seen above the noise floor (evidence ${evidence.snr.toPrecision(2)}, want ≥ ${FA_VISIBLE_SNR} in ${evidence.source}); fp comes from C0 and C1 alone`,
        });
      }
    }
    diagnostics.push(...plausibilityDiagnostics(mode, kind));
    for (const cc of mode.crossCheck) {
      if (cc.verdict === 'disagree')
        diagnostics.push({
          code: 'methods-disagree',
          severity: 'warning',
          message: `mode near ${formatFrequency(mode.fsHz, 8)}: ${cc.message}`,
        });
    }
    return mode;
  });
}
