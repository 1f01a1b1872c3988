/**
 * Small-signal start-up numbers of a Pierce oscillator (derived from the BVD model, matching the
 * critical-gm analysis of E. A. Vittoz, M. G. R. Degrauwe, S. Bitz, "High-performance crystal
 * oscillator circuits: theory and application", IEEE J. Solid-State Circuits, 1988):
 *
 *   gm,crit = ω²R1·CaCb·(1 + C0/Cs)²,  Cs = CaCb/(Ca + Cb)
 *   (equal capacitors, CL = Cs: gm,crit = 4R1ω²(C0 + CL)²; unequal ones raise it by (Ca + Cb)²/(4CaCb))
 *   Rneg = −gm/(ω²CaCb)   the circuit alone, without C0 and without a pin-to-pin stray (the
 *                         advice uses the full network of pierce-network.ts: with a stray across
 *                         the pins this shortcut is several percent off what the pins see)
 * Ca and Cb are the total capacitances from each crystal pin to ground (external capacitor, pin
 * capacitance of the amplifier and board stray). A capacitance across the crystal (pin-to-pin
 * stray) is lumped into C0. In this linear model gm/gm,crit = |Rneg|/RL exactly, with
 * RL = R1(1 + C0/Cs)².
 */

/**
 * Gain margin asked for by common practice: gm/gm,crit ≥ 5. It is the engineering margin used in
 * semiconductor vendors' Pierce-oscillator application notes for process, temperature, supply and
 * aging spread — not an IEC/IEEE requirement.
 */
export const MIN_GAIN_MARGIN = 5;

/** Critical transconductance for oscillation, S. */
export function criticalGmS(r1Ohm: number, c0F: number, caF: number, cbF: number, freqHz: number): number {
  const w = 2 * Math.PI * freqHz;
  const cs = (caF * cbF) / (caF + cbF);
  const k = 1 + c0F / cs;
  return w * w * r1Ohm * caF * cbF * k * k;
}

/** Small-signal negative resistance of the circuit alone (no C0, no pin-to-pin stray), Ω (negative). */
export function negativeResistanceOhm(gmS: number, caF: number, cbF: number, freqHz: number): number {
  const w = 2 * Math.PI * freqHz;
  return -gmS / (w * w * caF * cbF);
}
