/**
 * Forward fixture formulas: the network parameters an instrument records for a device of
 * impedance Z in a given fixture (Z0 real, calibrated to the device plane). Derived from the circuit:
 *
 *   reflection     S11 = (Z − Z0)/(Z + Z0)
 *   series-thru    S11 = S22 = Z/(Z + 2Z0),      S21 = S12 = 2Z0/(Z + 2Z0)
 *   shunt-thru     S11 = S22 = −Z0/(Z0 + 2Z),    S21 = S12 = 2Z/(2Z + Z0)
 *   impedance      Z itself (a 1-port Z parameter)
 *
 * An infinite Z (an empty fixture with no stray capacitance) takes the limits of these forms.
 * The inverse forms are here too so the generator can report the impedance its noisy data imply.
 */
import { cAdd, cDiv, cScale, cSub, type Complex } from '../sweep/complex.ts';
import type { Fixture } from '../schema/part.ts';

/** Port-to-port leakage written in 2-port reflection records: |S21| = 1e-6 (−120 dB). */
export const ISOLATION_FLOOR = 1e-6;

/** S-parameters of one frequency point, row-major [S11, S12, S21, S22] (or [S11] for 1 port). */
export type SMatrix = Complex[];

/**
 * S-parameters of a device of impedance `z` in an S-parameter fixture.
 * @param z device impedance, ohm; `null` means an open circuit (infinite impedance)
 * @param fixture reflection, series-thru or shunt-thru
 * @param z0Ohm reference impedance, ohm
 * @param ports 1 or 2; a 2-port reflection record has port 2 left open (S22 = 1) and a
 *   transmission floor of {@link ISOLATION_FLOOR} in S21 = S12 (an exact zero has no dB form)
 */
export function sParametersOf(
  z: Complex | null,
  fixture: Exclude<Fixture, 'impedance'>,
  z0Ohm: number,
  ports: 1 | 2,
): SMatrix {
  const zero: Complex = { re: 0, im: 0 };
  if (fixture === 'reflection') {
    const s11 = z === null ? { re: 1, im: 0 } : cDiv(cSub(z, { re: z0Ohm, im: 0 }), cAdd(z, { re: z0Ohm, im: 0 }));
    const leak: Complex = { re: ISOLATION_FLOOR, im: 0 };
    return ports === 1 ? [s11] : [s11, leak, leak, { re: 1, im: 0 }];
  }
  if (ports !== 2) throw new Error(`a ${fixture} fixture records 2 ports, got ${ports}`);
  let s11: Complex;
  let s21: Complex;
  if (fixture === 'series-thru') {
    if (z === null) {
      s11 = { re: 1, im: 0 };
      s21 = zero;
    } else {
      const den = cAdd(z, { re: 2 * z0Ohm, im: 0 });
      s11 = cDiv(z, den);
      s21 = cDiv({ re: 2 * z0Ohm, im: 0 }, den);
    }
  } else {
    if (z === null) {
      s11 = zero;
      s21 = { re: 1, im: 0 };
    } else {
      const den = cAdd(cScale(z, 2), { re: z0Ohm, im: 0 });
      s11 = cDiv({ re: -z0Ohm, im: 0 }, den);
      s21 = cDiv(cScale(z, 2), den);
    }
  }
  return [s11, s21, s21, s11];
}

/**
 * Device impedance implied by recorded S-parameters (inverse of {@link sParametersOf}), ohm:
 * reflection Z = Z0(1 + S11)/(1 − S11); series-thru Z = 2Z0(1 − S21)/S21;
 * shunt-thru Z = Z0·S21/(2(1 − S21)) (derived from the circuit).
 * @param s row-major S matrix of one point (only S11 or S21 is used)
 */
export function impedanceFromS(s: SMatrix, fixture: Exclude<Fixture, 'impedance'>, z0Ohm: number): Complex {
  const one: Complex = { re: 1, im: 0 };
  if (fixture === 'reflection') return cScale(cDiv(cAdd(one, s[0]), cSub(one, s[0])), z0Ohm);
  const s21 = s[2];
  if (fixture === 'series-thru') return cScale(cDiv(cSub(one, s21), s21), 2 * z0Ohm);
  return cScale(cDiv(s21, cSub(one, s21)), z0Ohm / 2);
}
