/**
 * Types of the demo catalogue table (scripts/demo/parts.ts): every demo part's true model per
 * sample and how each of its sweep files is synthesised. All values SI (Hz, F, Ω, W, °C).
 */
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import type { Fixture, PartKind } from '../../src/lib/schema/part.ts';
import type { FreqGridSpec } from '../../src/lib/synth/freq-grid.ts';
import type { AddedCapacitor, FixtureParasitics } from '../../src/lib/synth/synth-sweep.ts';
import type { SynthFileFormat } from '../../src/lib/synth/synth-file.ts';

/** What a branch of the documented model is, in the terms of the `modes` list of `extract --json`. */
export interface DemoMode {
  /** Index into the sample's `model.branches`. */
  branch: number;
  /** Physical overtone order (for a spurious mode: the nearest main mode's order). */
  overtone: number;
  spurious: boolean;
  /** The mode lies above the sample's instrumentMaxFrequency: extraction flags it. */
  aboveInstrumentRange?: boolean;
}

/** One sweep file and how it is synthesised. */
export interface DemoSweep {
  file: string;
  fixture: Fixture;
  format: SynthFileFormat;
  /** Reflection records: 1 (default) or 2 ports; impedance Touchstone records: Z (default) or Y. */
  ports?: 1 | 2;
  parameter?: 'Z' | 'Y';
  grid: FreqGridSpec;
  /** Relative noise, dB. */
  noiseDb: number;
  /** The part's true model during this sweep when it differs from the sample's reference model. */
  model?: BvdModel;
  temperatureC?: number;
  driveW?: number;
  added?: AddedCapacitor;
  /** Write `referenceImpedance` into the record (the files always carry 50 Ω). */
  recordReferenceImpedance?: boolean;
}

/** One physical unit. */
export interface DemoSample {
  id: string;
  lot?: string;
  measured: string;
  by: string;
  instrument: string;
  instrumentMaxFrequencyHz?: number;
  temperatureC?: number;
  /**
   * The documented model values: the true part at the sample's reference conditions
   * (its temperature, else 25 °C; its lowest drive level). Extraction must recover these.
   */
  model: BvdModel;
  modes: DemoMode[];
  /** Fixture residuals present in every sweep of this sample (removed by the compensation sweeps). */
  parasitics?: FixtureParasitics;
  compensation?: {
    fixture: Fixture;
    format: SynthFileFormat;
    grid: FreqGridSpec;
    noiseDb: number;
    open: string;
    short: string;
  };
  sweeps: DemoSweep[];
}

/** Datasheet as written in the record (strings with units, README: The part record). */
export interface DemoDatasheet {
  frequency: string;
  tolerance?: string;
  stability?: string;
  loadCapacitance?: string;
  esrMax?: string;
  c0Max?: string;
  driveMax?: string;
  overtone?: number;
  operatingRange?: string;
}

/** What a part is in the demo for, and the deliberate departures from its datasheet. */
export interface DemoScenario {
  /** One line for the notes and the test names. */
  shows: string;
  /** The part deliberately fails these datasheet limits (the generator checks all others). */
  fails?: Array<'esrMax' | 'tolerance' | 'c0Max'>;
  /** AT-cut temperature coefficients used for temperature sweeps (Gerber & Ballato 1985, as quoted by Haney 2001), per °C^k. */
  temperatureCoefficients?: readonly [number, number, number];
  /** R1 and fs offset against drive level, for drive-level sweeps. */
  driveLevels?: ReadonlyArray<{ driveW: number; r1Ohm: number; offsetPpm: number }>;
}

export interface DemoPart {
  id: string;
  title: string;
  kind: PartKind;
  package?: string;
  supplier: string;
  supplierPart: string;
  /** Markdown notes; the generator prepends the synthetic-data statement. */
  notes: string;
  datasheet: DemoDatasheet;
  scenario: DemoScenario;
  samples: DemoSample[];
}
