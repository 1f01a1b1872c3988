/**
 * Preparing a sample's sweeps and choosing its reference conditions (as the `extract --json`
 * interface fixes them, README: Commands): the sample's own `temperature`, else the sweep
 * temperature nearest 25 °C (when no sweep was taken at the sample's temperature, the nearest
 * one to it); at that temperature the lowest drive level. Sweeps without a stated temperature
 * or drive count as taken at the reference. Results at other conditions go to extra fields.
 */
import type { SweepRef } from '../schema/part.ts';
import { recordedOf, type ImpedanceSweep, type RecordedQuantity } from '../sweep/sweep.ts';
import { partAlone, type AddedConnection, type AdmittanceSweep } from './part-alone.ts';
import { impedanceSigmaOhm, noiseFromDifferences, type RecordedNoise } from './measurement-noise.ts';

/** One sweep as handed to the extraction (loaded and fixture-converted by the pipeline). */
export interface ExtractSweepInput {
  sampleId: string;
  ref: SweepRef;
  /** Path of the file (for messages the record's own name `ref.file` is used). */
  file: string;
  /** Impedance of the part, Ω; sweeps without it (unreadable) are skipped. */
  impedance?: ImpedanceSweep;
}

/** A sweep ready for extraction. */
export interface PreparedSweep {
  /** Position in the sample's usable sweeps. */
  index: number;
  /** Name for messages: the file as written in the record. */
  source: string;
  ref: SweepRef;
  /** As measured (part plus any added capacitor). */
  impedance: ImpedanceSweep;
  /** What the instrument recorded (S11, S21, Z or Y) and |dZ/dM| per point. */
  recorded: RecordedQuantity;
  /** Noise of the recorded quantity from the sweep's own second differences (before any fit). */
  noise: RecordedNoise;
  /** Standard deviation of each impedance point from that noise, Ω. */
  sigmaZOhm: Float64Array;
  /** The part alone (added capacitor removed). */
  part: AdmittanceSweep;
  temperatureC?: number;
  driveW?: number;
  addedCF?: number;
  connection: AddedConnection;
  loaded: boolean;
  minHz: number;
  maxHz: number;
}

/** Temperatures closer than this are the same condition, °C. */
export const SAME_TEMPERATURE_C = 0.5;
/** Drive levels within this relative difference are the same condition. */
export const SAME_DRIVE = 1e-6;

/** Prepare the usable sweeps (impedance with at least 3 points) of one sample. */
export function prepareSweeps(inputs: ExtractSweepInput[], sampleTemperatureC?: number): PreparedSweep[] {
  const out: PreparedSweep[] = [];
  for (const s of inputs) {
    const z = s.impedance;
    if (!z || z.freqHz.length < 3) continue;
    const addedCF = s.ref.addedCapacitanceF;
    const connection: AddedConnection = s.ref.addedConnection ?? 'parallel';
    const n = z.freqHz.length;
    const recorded = recordedOf(z);
    const noise = noiseFromDifferences(z);
    out.push({
      index: out.length,
      source: s.ref.file,
      ref: s.ref,
      impedance: z,
      recorded,
      noise,
      sigmaZOhm: impedanceSigmaOhm(recorded, noise),
      part: { ...partAlone(z, addedCF, connection), source: s.ref.file },
      temperatureC: s.ref.temperatureC ?? sampleTemperatureC,
      driveW: s.ref.driveW,
      addedCF,
      connection,
      loaded: addedCF !== undefined && addedCF > 0,
      minHz: Math.min(z.freqHz[0], z.freqHz[n - 1]),
      maxHz: Math.max(z.freqHz[0], z.freqHz[n - 1]),
    });
  }
  return out;
}

/** Reference conditions and the split of the sweeps. */
export interface ReferenceSplit {
  temperatureC?: number;
  driveW?: number;
  reference: PreparedSweep[];
  others: PreparedSweep[];
}

/** Choose the reference temperature and drive, and split the sweeps. */
export function referenceConditions(sweeps: PreparedSweep[], sampleTemperatureC?: number): ReferenceSplit {
  // The sweep temperature nearest the sample's own (else 25 °C); sweeps without an override
  // carry the sample's temperature, so it wins whenever such a sweep exists.
  const target = sampleTemperatureC ?? 25;
  const temps = sweeps.map((s) => s.temperatureC).filter((t): t is number => t !== undefined);
  const temperatureC = temps.length
    ? temps.reduce((a, b) => (Math.abs(b - target) < Math.abs(a - target) ? b : a))
    : sampleTemperatureC;
  const atTemp = (s: PreparedSweep) =>
    temperatureC === undefined ||
    s.temperatureC === undefined ||
    Math.abs(s.temperatureC - temperatureC) < SAME_TEMPERATURE_C;
  const drives = sweeps
    .filter(atTemp)
    .map((s) => s.driveW)
    .filter((d): d is number => d !== undefined);
  const driveW = drives.length ? Math.min(...drives) : undefined;
  const atDrive = (s: PreparedSweep) =>
    driveW === undefined || s.driveW === undefined || Math.abs(s.driveW / driveW - 1) < SAME_DRIVE;
  const reference: PreparedSweep[] = [];
  const others: PreparedSweep[] = [];
  for (const s of sweeps) (atTemp(s) && atDrive(s) ? reference : others).push(s);
  return { temperatureC, driveW, reference, others };
}
