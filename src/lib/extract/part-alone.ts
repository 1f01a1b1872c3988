/**
 * The part alone: a measured impedance sweep with any known added capacitor removed, as both
 * impedance and admittance.
 *
 * - Capacitor in parallel with the part: it adds jωC to the admittance, so Y_part = Y − jωC.
 * - Capacitor in series with the part: it adds 1/(jωC) to the impedance, so
 *   Z_part = Z − 1/(jωC) = Z + j/(ωC).
 * (Derived from the circuit: capacitance across the part adds directly; series and parallel load.)
 * The fixture itself has already been converted by the fixture code; this module only undoes
 * the capacitor the record says was added on purpose.
 */
import type { ImpedanceSweep } from '../sweep/sweep.ts';

/** A sweep of the part alone: impedance (Ω) and admittance (S) at each frequency (Hz). */
export interface AdmittanceSweep {
  freqHz: Float64Array;
  zRe: Float64Array;
  zIm: Float64Array;
  /** Conductance Re Y, S. */
  gS: Float64Array;
  /** Susceptance Im Y, S. */
  bS: Float64Array;
  source: string;
}

/** How a known capacitor was added during a sweep (README: The part record, `addedConnection`). */
export type AddedConnection = 'parallel' | 'series';

/**
 * Impedance and admittance of the part alone.
 * @param addedCapacitanceF known added capacitor, F (absent or 0: nothing removed)
 * @param addedConnection how it was connected; default `parallel`
 */
export function partAlone(
  sweep: ImpedanceSweep,
  addedCapacitanceF?: number,
  addedConnection: AddedConnection = 'parallel',
): AdmittanceSweep {
  const n = sweep.freqHz.length;
  const zRe = new Float64Array(n);
  const zIm = new Float64Array(n);
  const gS = new Float64Array(n);
  const bS = new Float64Array(n);
  const cF = addedCapacitanceF ?? 0;
  for (let i = 0; i < n; i++) {
    const w = 2 * Math.PI * sweep.freqHz[i];
    let r = sweep.zRe[i];
    let x = sweep.zIm[i];
    if (cF > 0 && addedConnection === 'series') x += 1 / (w * cF);
    const den = r * r + x * x;
    let g = r / den;
    let b = -x / den;
    if (cF > 0 && addedConnection === 'parallel') {
      b -= w * cF;
      const d2 = g * g + b * b;
      r = g / d2;
      x = -b / d2;
    }
    zRe[i] = r;
    zIm[i] = x;
    gS[i] = g;
    bS[i] = b;
  }
  return { freqHz: sweep.freqHz, zRe, zIm, gS, bS, source: sweep.source };
}

/** Admittance of a sweep as measured (nothing removed). */
export function admittanceOf(sweep: ImpedanceSweep): AdmittanceSweep {
  return partAlone(sweep);
}
