/**
 * Sweep data types shared by readers, fixture conversion and extraction.
 * Frequencies in Hz, impedances in ohm, admittances in siemens; complex values as
 * parallel real/imaginary Float64Arrays.
 */

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
   * The quantity the instrument recorded, from which Z was computed, and how strongly its
   * noise shows in Z. Absent: the record held Z itself (an impedance CSV or a Z file).
   */
  recorded?: RecordedQuantity;
}

/**
 * What an instrument recorded at each point (S11, S21, Z or Y) and dZ/dM, the factor by
 * which a small error of the recorded value M reaches the device impedance Z through the
 * fixture conversion and any compensation. The receiver's noise lives in M: a floor
 * independent of the signal plus a part proportional to |M|; through this factor it becomes
 * the noise of each impedance point (reflection far from Z0, for example, multiplies it).
 */
export interface RecordedQuantity {
  name: 'S11' | 'S21' | 'Z' | 'Y';
  /** Recorded value per point (unitless for S, Ω for Z, S for Y). */
  re: Float64Array;
  im: Float64Array;
  /** dZ/dM per point, complex: ohm per unit of the recorded quantity. */
  dZdMRe: Float64Array;
  dZdMIm: Float64Array;
}

/** The recorded quantity of a sweep; a sweep without one recorded Z itself (dZ/dZ = 1). */
export function recordedOf(sweep: ImpedanceSweep): RecordedQuantity {
  if (sweep.recorded) return sweep.recorded;
  const n = sweep.freqHz.length;
  return { name: 'Z', re: sweep.zRe, im: sweep.zIm, dZdMRe: new Float64Array(n).fill(1), dZdMIm: new Float64Array(n) };
}

/** First index whose frequency is not strictly above its predecessor, or -1. */
export function firstNonRisingIndex(freqHz: ArrayLike<number>): number {
  for (let i = 1; i < freqHz.length; i++) if (!(freqHz[i] > freqHz[i - 1])) return i;
  return -1;
}
