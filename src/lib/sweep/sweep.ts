/**
 * Sweep data types shared by readers, fixture conversion and extraction.
 * Frequencies in Hz, impedances in ohm, admittances in siemens; complex values as
 * parallel real/imaginary Float64Arrays.
 */
import { impedanceRecord, type RecordedQuantity } from './recorded.ts';

export type { RecordedQuantity } from './recorded.ts';

/** Raw network data as read from a file (Touchstone), denormalised: Z in ohm, Y in S, S unitless. */
export interface NetworkData {
  parameter: 'S' | 'Z' | 'Y';
  ports: 1 | 2;
  /** Reference impedance per port, ohm. */
  z0Ohm: number[];
  freqHz: Float64Array;
  /**
   * Matrix entries, row-major: index i*ports + j holds N(i+1)(j+1).
   * For 2 ports: [N11, N12, N21, N22] whatever the file's column order was.
   */
  re: Float64Array[];
  im: Float64Array[];
  /** Source file name for messages. */
  source: string;
  /** Extra facts for display: 'touchstone-1', 'touchstone-2', 'csv'. */
  format: string;
  /** `!` comment lines found in the file, without the `!`. */
  comments: string[];
}

/** Impedance of the device under test against frequency. */
export interface ImpedanceSweep {
  freqHz: Float64Array;
  zRe: Float64Array;
  zIm: Float64Array;
  /** Source file name for messages. */
  source: string;
  /**
   * The quantity the instrument recorded, from which Z was computed, and the map between them
   * (recorded.ts). Absent: the record held Z itself (an impedance CSV).
   */
  recorded?: RecordedQuantity;
}

/** The recorded quantity of a sweep; a sweep without one recorded Z itself (identity map). */
export function recordedOf(sweep: ImpedanceSweep): RecordedQuantity {
  return sweep.recorded ?? impedanceRecord(sweep.zRe, sweep.zIm);
}

/** First index whose frequency is not strictly above its predecessor, or -1. */
export function firstNonRisingIndex(freqHz: ArrayLike<number>): number {
  for (let i = 1; i < freqHz.length; i++) if (!(freqHz[i] > freqHz[i - 1])) return i;
  return -1;
}
