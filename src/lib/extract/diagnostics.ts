/**
 * Measurement diagnostics: what in the data limits the result, and how to measure better.
 * Each function returns Diagnostic objects (types.ts); warnings become the sample's
 * human-readable `warnings`.
 *
 * Limits and their sources:
 * - ≥ 10 points per half-power bandwidth fs/Q (10–20 inside Δf: common practice, not from a
 *   standard);
 * - a sweep around fa as well as fs (common practice) for the fs–fa and load cross-checks;
 * - data above the sample's instrumentMaxFrequency are flagged, not trusted (README: The part
 *   record; README: Commands);
 * - M ≥ 4 (IEC 60444-11 limits its fL method to M > 4);
 * - AT-cut plausibility: r ≥ n²π²/(8k²) with k = 8.8 % (Vig; C1n = 8k²C0/(nπ)², Sensors 2021)
 *   and Q·f ≲ 1.6×10¹³ Hz (from memory).
 */
import type { Diagnostic } from './types.ts';
import { formatSi } from '../units/si.ts';
import { formatFrequency } from './format-frequency.ts';

/** Points per half-power bandwidth below which the resonance is too coarsely sampled. */
export const MIN_POINTS_PER_BANDWIDTH = 10;
/** Figure of merit M = Q/r below which the zero-phase and load methods degrade. */
export const MIN_FIGURE_OF_MERIT = 4;
/**
 * AT-cut piezoelectric coupling (J. R. Vig, Quartz Crystal Resonators and Oscillators for Frequency
 * Control and Timing Applications — A Tutorial).
 */
export const AT_COUPLING = 0.088;
/** Upper plausible Q·f for AT-cut quartz, Hz (from memory). */
export const AT_MAX_Q_TIMES_F = 1.6e13;
/** Fit residual (relative) above which the data are called noisy: −40 dB. */
export const NOISY_RESIDUAL = 0.01;

/** The smallest capacitance ratio r = C0/C1 an ideal AT plate allows at overtone n. */
export function minimumCapacitanceRatio(overtone: number, coupling = AT_COUPLING): number {
  return (overtone * overtone * Math.PI * Math.PI) / (8 * coupling * coupling);
}

/** A sweep reaching above the instrument's trusted range (wording fixed by `extract --json`, README: Commands). */
export function instrumentRangeDiagnostic(
  source: string,
  sweepMaxHz: number,
  instrumentMaxHz: number | undefined,
): Diagnostic | undefined {
  if (instrumentMaxHz === undefined || !(sweepMaxHz > instrumentMaxHz)) return undefined;
  return {
    code: 'above-instrument-range',
    severity: 'warning',
    sweep: source,
    message: `sweep ${source}: above instrumentMaxFrequency from ${formatSi(instrumentMaxHz, 'Hz')}; modes there are flagged`,
  };
}

/** Too few points across a resonance. */
export function resolutionDiagnostic(p: {
  source: string;
  fsHz: number;
  bandwidthHz: number;
  stepHz: number;
  pointsPerBandwidth: number;
}): Diagnostic | undefined {
  if (!(p.pointsPerBandwidth < MIN_POINTS_PER_BANDWIDTH)) return undefined;
  const want = p.bandwidthHz / MIN_POINTS_PER_BANDWIDTH;
  return {
    code: 'points-per-bandwidth',
    severity: 'warning',
    sweep: p.source,
    message: `mode near ${formatFrequency(p.fsHz, 8)}: only ${p.pointsPerBandwidth.toFixed(1)} points per resonance bandwidth (${formatSi(p.bandwidthHz, 'Hz', 3)}) in the best sweep ${p.source}; use a step of at most ${formatSi(want, 'Hz', 2)}`,
  };
}

/** No sweep covers the anti-resonance of a main mode. */
export function spanMissingFaDiagnostic(fsHz: number, fpHz: number): Diagnostic {
  return {
    code: 'span-missing-fa',
    severity: 'info',
    message: `mode near ${formatFrequency(fsHz, 8)}: no sweep covers its anti-resonance near ${formatFrequency(fpHz, 8)}; sweep there too for the fs–fa and C0 cross-checks`,
  };
}

/** Signal-to-noise from the relative RMS residual of a fit. */
export function noiseDiagnostic(what: string, rmsResidual: number): Diagnostic | undefined {
  if (!(rmsResidual > 0) || !Number.isFinite(rmsResidual)) return undefined;
  const snrDb = -20 * Math.log10(rmsResidual);
  const noisy = rmsResidual > NOISY_RESIDUAL;
  return {
    code: 'signal-to-noise',
    severity: noisy ? 'warning' : 'info',
    message: noisy
      ? `${what}: residual only ${snrDb.toFixed(1)} dB below the signal; average more, check the calibration or the fixture`
      : `${what}: signal-to-noise about ${snrDb.toFixed(1)} dB (from the fit residual)`,
  };
}

/** Low M and implausible AT-cut values. */
export function plausibilityDiagnostics(
  p: { fsHz: number; q: number; r: number; m: number; overtone: number; spurious: boolean },
  kind: string,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  const where = `mode near ${formatFrequency(p.fsHz, 8)}`;
  if (!p.spurious && p.m < MIN_FIGURE_OF_MERIT) {
    out.push({
      code: 'low-m',
      severity: 'warning',
      message: `${where}: figure of merit M = ${p.m.toPrecision(3)} is below ${MIN_FIGURE_OF_MERIT}; zero-phase and load-capacitance values are unreliable`,
    });
  }
  if (kind === 'quartz-at' && !p.spurious) {
    const rMin = minimumCapacitanceRatio(p.overtone);
    if (p.r < rMin)
      out.push({
        code: 'implausible',
        severity: 'warning',
        message: `${where}: capacitance ratio r = ${p.r.toPrecision(4)} is below ${rMin.toPrecision(4)}, the minimum for an AT plate at overtone ${p.overtone}; check C0 and the overtone order`,
      });
    if (p.q * p.fsHz > AT_MAX_Q_TIMES_F)
      out.push({
        code: 'implausible',
        severity: 'warning',
        message: `${where}: Q·f = ${(p.q * p.fsHz).toPrecision(3)} Hz exceeds the plausible ${AT_MAX_Q_TIMES_F.toPrecision(2)} Hz for AT quartz; check for fixture loss compensation errors`,
      });
  }
  return out;
}
