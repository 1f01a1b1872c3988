/**
 * The generated catalogue data the site renders: one PartData JSON per part, one IndexEntry per
 * part in the search index, and a small CompareData JSON per part for the compare page.
 * Everything is plain JSON (no typed arrays, no NaN); numbers in SI base units, names carry the
 * unit suffix. Made by src/lib/report, written by src/pipeline/emit.ts, read by src/site/catalogue.ts at build time and by
 * the client scripts through fetch.
 */
import type { SampleResult } from '../extract/types.ts';
import type { Datasheet, PartKind } from '../schema/part.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import type { PierceAdvice } from '../osc/pierce.ts';
import type { IndexFit } from './fits.ts';
import type { NegativeResistanceCurve } from '../osc/negative-resistance-curve.ts';

import type { ComplianceResult } from '../osc/compliance.ts';
import type { LotStatistics } from '../osc/lot-stats.ts';

export type { PierceAdvice } from '../osc/pierce.ts';
export type { ComplianceResult } from '../osc/compliance.ts';
export type { LotStatistics } from '../osc/lot-stats.ts';

/** Bump when the shape changes, so stale cached data is rebuilt. */
export const PART_DATA_VERSION = 5;

/** Compliance with the datasheet, summarised. */
export type ComplianceState = 'pass' | 'fail' | 'unknown' | 'warnings';

/** A curve as two equal-length arrays. */
export interface Curve {
  x: number[];
  y: number[];
}

/** |Z| and phase around one mode: measured, model and the relative complex residual. */
export interface ModePlot {
  /** Index of the mode in its sample's `modes`. */
  modeIndex: number;
  overtone: number;
  spurious: boolean;
  fsHz: number;
  fpHz: number;
  /** The sweep the measured points come from. */
  sweep: string;
  /** |Z| in Ω against Hz. */
  measuredMag: Curve;
  modelMag: Curve;
  /** Phase of Z in degrees against Hz. */
  measuredPhase: Curve;
  modelPhase: Curve;
  /** 100·|Zmeas − Zmodel|/|Zmodel|, % against Hz. */
  residualPct: Curve;
}

/** The widest sweep of a sample with every mode marked. */
export interface WidePlot {
  sweep: string;
  mag: Curve;
  phase: Curve;
  modes: Array<{ fsHz: number; label: string; spurious: boolean; overtone: number }>;
}

/** Frequency offset against load capacitance: x in F, y in ppm. */
export interface PullingPlot {
  curve: Curve;
  /** What 0 ppm means: the datasheet nominal frequency, or fs of the main mode. */
  reference: 'nominal' | 'fs';
  referenceHz: number;
  /** Datasheet load capacitance, F, when it is a capacitance. */
  datasheetClF?: number;
  /** Offset at the datasheet CL, ppm. */
  datasheetClPpm?: number;
}

/** Frequency against temperature: measured points and the fitted polynomial. */
export interface TemperaturePlot {
  points: Curve;
  fit: Curve;
  form: string;
  /** Reference of the offsets: frequency at t0C, Hz. */
  f0Hz: number;
  t0C: number;
}

export interface SweepProvenance {
  file: string;
  fixture: string;
  referenceImpedanceOhm?: number;
  addedCapacitanceF?: number;
  addedConnection?: 'parallel' | 'series';
  temperatureC?: number;
  driveW?: number;
  points?: number;
  startHz?: number;
  stopHz?: number;
  /** File size in bytes (0 when unknown). */
  bytes: number;
}

export interface SampleProvenance {
  lot?: string;
  by?: string;
  measured?: string;
  instrument?: string;
  instrumentMaxFrequencyHz?: number;
  temperatureC?: number;
  compensation?: { open?: string; short?: string; load?: string; loadResistanceOhm?: number; fixture?: string };
  sweeps: SweepProvenance[];
}

/** What every sample shows, with or without an extraction result. */
type SampleResultAlways = Pick<SampleResult, 'modes' | 'warnings' | 'diagnostics' | 'otherConditions'>;

/**
 * One sample's results as shown on the page: the extraction's SampleResult under its own names
 * (all but the model and the sample id; the rest absent when there is no result), plus the
 * record's provenance and the plots.
 */
export interface SampleData
  extends SampleResultAlways, Partial<Omit<SampleResult, 'sample' | 'model' | keyof SampleResultAlways>> {
  id: string;
  provenance: SampleProvenance;
  /** False when extraction produced nothing usable (no modes). */
  ok: boolean;
  plots: {
    modes: ModePlot[];
    wide?: WidePlot;
    pulling?: PullingPlot;
    temperature?: TemperaturePlot;
  };
}

/** Summary of the part: the first sample's main mode. */
export interface PartSummary {
  fsHz?: number;
  fpHz?: number;
  r1Ohm?: number;
  l1H?: number;
  c1F?: number;
  c0F?: number;
  q?: number;
  overtone?: number;
  /** Load capacitance at which the main mode runs at the datasheet frequency, F. */
  clForNominalF?: number;
  state: ComplianceState;
}

/**
 * Inputs of the client calculator: exactly what `advisePierce` takes, so the page computes the
 * same answer as the command line for the same circuit values.
 */
export interface CalculatorData {
  partId: string;
  datasheet?: Datasheet;
  /** The part alone (C0 and one branch per mode of the first sample). */
  model: BvdModel;
  mainBranch: number;
  /** The team's circuits; the first one fills the form. */
  circuits: OscillatorCircuit[];
}

export interface DownloadEntry {
  /** File name relative to downloads/<id>/ (raw sweeps under raw/). */
  name: string;
  label: string;
  bytes: number;
}

export interface PartData {
  version: number;
  id: string;
  title: string;
  kind: PartKind;
  package?: string;
  supplier?: string;
  supplierPart?: string;
  /** Raw Markdown as written; the page renders it through src/site/markdown.ts. */
  notes?: string;
  synthetic: boolean;
  datasheet?: Datasheet;
  summary: PartSummary;
  /** Datasheet compliance per sample (empty without a datasheet). */
  compliance: ComplianceResult[];
  /** Statistics over the samples (two or more samples with a main mode). */
  lotStats?: LotStatistics;
  /** Pierce advice per circuit (first sample, main mode). */
  pierce: PierceAdvice[];
  calculator?: CalculatorData;
  samples: SampleData[];
  downloads: DownloadEntry[];
  /** Record-level warnings from loading (issues of severity warning), already formatted. */
  recordWarnings: string[];
}

/** One row of the search index. */
export interface IndexEntry {
  id: string;
  title: string;
  supplier?: string;
  supplierPart?: string;
  package?: string;
  kind: PartKind;
  /** Plain-text excerpt of the notes. */
  notes?: string;
  fsHz?: number;
  r1Ohm?: number;
  c0F?: number;
  c1F?: number;
  q?: number;
  clForNominalF?: number;
  samples: number;
  overtone?: number;
  state: ComplianceState;
  synthetic?: boolean;
  /** Fit in each circuit whose frequency range holds the part (report/fits.ts). */
  fits?: IndexFit[];
}

/** What the compare page fetches per part. */
export interface CompareData {
  id: string;
  title: string;
  kind: PartKind;
  summary: PartSummary;
  datasheet?: Datasheet;
  mode?: ModePlot;
  pulling?: PullingPlot;
  /** Negative resistance against load capacitance per circuit meant for the part (report/design-curves.ts). */
  negativeResistance?: NegativeResistanceCurve[];
}
