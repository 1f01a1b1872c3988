/**
 * Result types of the extraction engine. Everything in SI base units; keys of the `extract --json`
 * output (README: Commands): `part`, `samples[].sample`, `c0F`, `modes[]`, `warnings`, plus the
 * project's own extras.
 */
import type { BvdModel } from '../models/bvd.ts';

/** Independent estimation methods, each reported with its own value. */
export type MethodName =
  | 'complex-fit' // full complex least squares on one sweep (Levenberg–Marquardt)
  | 'joint-fit' // one least-squares fit over all sweeps of the sample
  | 'closed-form' // from fs, fp (or fa) and C0
  | 'half-power' // ±45° / G = Gmax/2 bandwidth
  | 'conductance-peak' // fs at max G, R1 = 1/Gmax
  | 'load-shift' // one known added capacitor, C0 known
  | 'two-load' // two or more loads: C1 and C0 without an independent C0
  | 'capacitive-region' // C0 from Im Y/ω away from resonance
  | 'zero-phase'; // fr / Rr at the lower zero-phase frequency

/** One method's estimate of one quantity. */
export interface MethodValue {
  method: MethodName;
  value: number;
  /** Standard uncertainty, same unit; absent when the method gives none. */
  uncertainty?: number;
  /** Which sweep(s) it came from, or why it is special. */
  note?: string;
  /** Why this method's assumptions fail for this mode (it is shown, but neither votes nor is published). */
  notCredible?: string;
}

export type Verdict = 'agree' | 'disagree' | 'single';

/** Methods compared for one quantity. */
export interface CrossCheck {
  quantity: 'fsHz' | 'r1Ohm' | 'c1F' | 'l1H' | 'c0F' | 'q';
  values: MethodValue[];
  verdict: Verdict;
  /** The rule used, e.g. "within 3 combined standard uncertainties or 2 %". */
  rule: string;
  /** For disagreements: which methods and the likely cause. */
  message?: string;
}

/** Standard uncertainties of a mode's reported quantities. */
export interface ModeUncertainty {
  fsHz: number;
  fpHz: number;
  r1Ohm: number;
  l1H: number;
  c1F: number;
  c0F: number;
  q: number;
}

/** One resonance (mode) of a sample, at the sample's reference conditions. */
export interface ModeResult {
  /** Physical overtone order (1, 3, 5, …); for spurious modes the nearest main mode's order. */
  overtone: number;
  spurious: boolean;
  fsHz: number;
  /** Lossless anti-resonance of the part alone (all branches, resistances zero). */
  fpHz: number;
  r1Ohm: number;
  l1H: number;
  c1F: number;
  q: number;
  uncertainty: ModeUncertainty;
  /** Lower / upper zero-phase frequencies of the part alone, when they exist (M ≥ 2). */
  frHz?: number;
  faHz?: number;
  /** Resistance at fr, Ω. */
  rrOhm?: number;
  /** Figure of merit M = Q/r. */
  m: number;
  /** Capacitance ratio r = C0/C1. */
  r: number;
  /** Spurious modes: R_spur/R_main and 20·log10 of it, dB. */
  resistanceRatio?: number;
  strengthDb?: number;
  /** True when the mode lies above the instrument's trusted frequency. */
  flagged?: boolean;
  crossCheck: CrossCheck[];
  /** Source files that contributed. */
  sweeps: string[];
}

/** A measurement diagnostic telling the user how to measure better. */
export interface Diagnostic {
  code:
    | 'points-per-bandwidth'
    | 'span-missing-fa'
    | 'above-instrument-range'
    | 'signal-to-noise'
    | 'no-resonance'
    | 'fit-failed'
    | 'methods-disagree'
    | 'low-m'
    | 'implausible'
    | 'resonance-at-edge'
    | 'modes-unresolved'
    | 'drive-dependence'
    | 'other';
  severity: 'info' | 'warning' | 'error';
  sweep?: string;
  message: string;
}

/** Outcome of a least-squares fit: a result, never an exception. */
export interface FitSummary {
  converged: boolean;
  reason: string;
  iterations: number;
  /** RMS of the relative complex residuals. */
  rmsResidual: number;
  points: number;
}

/** Frequency against temperature. */
export interface TemperatureFit {
  /** 'cubic' | 'parabola' | 'quadratic'. */
  form: 'cubic' | 'parabola' | 'quadratic';
  /** Reference temperature of the polynomial, °C. */
  t0C: number;
  /** Reference frequency at t0C, Hz. */
  f0Hz: number;
  /** Δf/f = Σ coeffs[i]·(T − t0)^(i+1); coefficients per °C^(i+1). */
  coeffs: number[];
  /** Turnover (turning-point) temperatures inside or near the data, °C. */
  turnoverC: number[];
  /** Peak-to-peak frequency span over the datasheet operating range (or the measured range), ppm. */
  spanPpm: number;
  spanRangeC: { min: number; max: number };
  points: Array<{ temperatureC: number; fsHz: number; offsetPpm: number }>;
  rmsResidualPpm: number;
}

/** R1 against drive level (drive-level dependence). */
export interface DriveLevelResult {
  points: Array<{ driveW: number; r1Ohm: number; fsHz: number; sweep: string }>;
  /** Max/min resistance ratio γ over the drive levels. */
  resistanceRatio: number;
  /** Frequency change from lowest to highest drive, ppm. */
  frequencyShiftPpm: number;
}

/** Everything extracted for one sample. */
export interface SampleResult {
  sample: string;
  c0F: number;
  modes: ModeResult[];
  warnings: string[];
  /** The fitted model at reference conditions (what netlists are written from). */
  model: BvdModel;
  /** Reference conditions of `modes`. */
  temperatureC?: number;
  driveW?: number;
  c0CrossCheck: CrossCheck;
  fit: FitSummary;
  diagnostics: Diagnostic[];
  temperature?: TemperatureFit;
  drive?: DriveLevelResult;
  /** Results of sweeps at other temperatures / drive levels. */
  otherConditions: Array<{ sweep: string; temperatureC?: number; driveW?: number; fsHz: number; r1Ohm: number }>;
  /** Frequency span covered by the sample's sweeps, Hz. */
  spanHz: { min: number; max: number };
  /**
   * The part's main (wanted) mode, picked once here (main-mode.ts): its index in `modes` (−1 when
   * there is none) and the rule that picked it. `modes[k]` is `model.branches[k]`.
   */
  mainMode: { index: number; rule: string };
  /** The sweeps (as written in the record) taken at the reference conditions of `modes`. */
  referenceSweeps: string[];
}

export interface PartResult {
  part: string;
  samples: SampleResult[];
}
