/**
 * Crystal drive level in an oscillator (forms derived from the BVD model).
 *
 *   P = R1·Im,rms²,  Im = ω(C0 + CL)·Vx   ⇒   P = R1·(ω(C0 + CL)·Vpp/2)²/2      (motional current)
 *   P = RL·(ωCL·Vx,pk)²/2                                                     (terminal current)
 *   P = RL·(πf·Cpin·Vpin,pp)²/2, Cpin = total capacitance on that pin          (one pin to ground)
 * All three agree in the linear model (X1 at CL = 12 pF, 1 Vpp, ω = 1e8 rad/s: 5.625 µW).
 * They assume a sinusoidal voltage; the swing across the crystal is an assumption the caller states.
 */

/** Drive from the peak-to-peak voltage across the crystal (motional-current form), W. */
export function driveFromCrystalVoltageW(
  r1Ohm: number,
  c0F: number,
  clF: number,
  freqHz: number,
  vxPp: number,
): number {
  const im = 2 * Math.PI * freqHz * (c0F + clF) * (vxPp / 2);
  return (r1Ohm * im * im) / 2;
}

/** Drive from the peak-to-peak voltage across the crystal (terminal-current form, RL), W. */
export function driveFromTerminalCurrentW(rlOhm: number, clF: number, freqHz: number, vxPp: number): number {
  const i = 2 * Math.PI * freqHz * clF * (vxPp / 2);
  return (rlOhm * i * i) / 2;
}

/** Drive from the peak-to-peak voltage of one pin to ground, Cpin = all capacitance on that pin, W. */
export function driveFromPinVoltageW(rlOhm: number, cPinF: number, freqHz: number, vPinPp: number): number {
  const i = Math.PI * freqHz * cPinF * vPinPp;
  return (rlOhm * i * i) / 2;
}
