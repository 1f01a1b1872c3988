/**
 * The small-signal Pierce network as the crystal sees it, without shortcuts (derived from nodal
 * analysis of the circuit; the C0-free case is the classic −gm/(ω²CaCb) of E. A. Vittoz et al.,
 * "High-performance crystal oscillator circuits: theory and application", IEEE JSSC 23(3), 1988).
 *
 * Network: an ideal transconductance gm from the input pin (node 1, voltage v1) into the output
 * pin (node 2): i = gm·v1 leaves node 2 to ground. Ca and Cb are the total capacitances of each
 * pin to ground (external capacitor, amplifier pin, board stray); Cpp sits across the pins.
 * A test current I into node 1 and out of node 2 gives, without Cpp,
 *
 *   Zc = 1/(jωCa) + 1/(jωCb) − gm/(ω²CaCb)
 *
 * Impedance seen by the crystal pins:        Zpins = Zc ∥ 1/(jωCpp)
 * Effective load capacitance at the pins:    CL,eff = −1/(ω·Im Zpins)
 * Impedance seen by the motional branch:     Zm = Zpins ∥ 1/(jωC0)   (circuit, Cpp and C0)
 * Rm = Re Zm is the resistance that sets the envelope growth: the motional branch (R1, L1, C1)
 * closes the loop through Zm, so the amplitude grows as exp(t/τ), τ = 2L1/(|Rm| − R1) (startup.ts).
 * Rpins = Re Zpins is what a network analyser across the crystal pins would read.
 */

/** The amplifier and the capacitances around the crystal, SI units. */
export interface PierceNetwork {
  /** Small-signal transconductance, S. */
  gmS: number;
  /** Total capacitance of the input pin to ground, F. */
  caF: number;
  /** Total capacitance of the output pin to ground, F. */
  cbF: number;
  /** Capacitance across the crystal pins, F. */
  pinToPinF: number;
}

/** A complex impedance, Ω. */
export interface Impedance {
  reOhm: number;
  imOhm: number;
}

function parallelCap(z: Impedance, cF: number, w: number): Impedance {
  // 1/(1/Z + jωC)
  const den = z.reOhm * z.reOhm + z.imOhm * z.imOhm;
  const g = z.reOhm / den;
  const b = -z.imOhm / den + w * cF;
  const d2 = g * g + b * b;
  return { reOhm: g / d2, imOhm: -b / d2 };
}

/** Impedance the circuit presents across the crystal pins (gm, Ca, Cb and Cpp), Ω. */
export function impedanceAtPins(net: PierceNetwork, freqHz: number): Impedance {
  const w = 2 * Math.PI * freqHz;
  const zc: Impedance = {
    reOhm: -net.gmS / (w * w * net.caF * net.cbF),
    imOhm: -(1 / (w * net.caF) + 1 / (w * net.cbF)),
  };
  return net.pinToPinF > 0 ? parallelCap(zc, net.pinToPinF, w) : zc;
}

/** Impedance the motional branch sees: the circuit, Cpp and the crystal's C0 in parallel, Ω. */
export function impedanceSeenByMotionalBranch(net: PierceNetwork, c0F: number, freqHz: number): Impedance {
  return parallelCap(impedanceAtPins(net, freqHz), c0F, 2 * Math.PI * freqHz);
}

/** Effective load capacitance the circuit presents at the crystal pins, −1/(ω·Im Zpins), F. */
export function effectiveLoadCapacitanceF(net: PierceNetwork, freqHz: number): number {
  return -1 / (2 * Math.PI * freqHz * impedanceAtPins(net, freqHz).imOhm);
}

/** The two resistances of the network at one frequency, Ω (negative when the circuit gives gain). */
export interface NegativeResistance {
  /** Re of the impedance seen by the crystal pins (circuit with the pin-to-pin stray). */
  atPinsOhm: number;
  /** Re of the impedance seen by the motional branch (circuit, pin-to-pin stray and C0). */
  motionalOhm: number;
  /** Effective load capacitance at the pins, F. */
  loadCapacitanceF: number;
}

/** Both resistances and the effective load capacitance. */
export function negativeResistance(net: PierceNetwork, c0F: number, freqHz: number): NegativeResistance {
  const pins = impedanceAtPins(net, freqHz);
  const w = 2 * Math.PI * freqHz;
  return {
    atPinsOhm: pins.reOhm,
    motionalOhm: parallelCap(pins, c0F, w).reOhm,
    loadCapacitanceF: -1 / (w * pins.imOhm),
  };
}

/** Bisection steps for the critical transconductance. */
const GM_BISECTIONS = 100;

/**
 * The transconductance at which the motional branch sees exactly −R1 (the start-up threshold of
 * the full network), S; undefined when no gm up to 10⁶× the given one reaches it (Rm saturates:
 * too much C0 and stray for any gain).
 */
export function criticalGmFullS(net: PierceNetwork, c0F: number, r1Ohm: number, freqHz: number): number | undefined {
  const rm = (gm: number) => impedanceSeenByMotionalBranch({ ...net, gmS: gm }, c0F, freqHz).reOhm;
  let lo = 0;
  let hi = net.gmS > 0 ? net.gmS : 1e-6;
  let grow = 0;
  while (-rm(hi) < r1Ohm) {
    lo = hi;
    hi *= 4;
    if (++grow > 10) return undefined;
  }
  for (let i = 0; i < GM_BISECTIONS && hi - lo > hi * 1e-12; i++) {
    const mid = 0.5 * (lo + hi);
    if (-rm(mid) < r1Ohm) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Frequency at which the loop's reactance vanishes: ωL1 − 1/(ωC1) + Im Zm(ω) = 0, between fs and
 * the branch's parallel resonance with C0 (bisection), Hz; the small-signal oscillation frequency.
 * Undefined when the network does not bring the reactance to zero there.
 */
export function loopFrequencyHz(
  net: PierceNetwork,
  c0F: number,
  branch: { fsHz: number; c1F: number },
): number | undefined {
  const l1H = 1 / ((2 * Math.PI * branch.fsHz) ** 2 * branch.c1F);
  const x = (f: number) => {
    const w = 2 * Math.PI * f;
    return w * l1H - 1 / (w * branch.c1F) + impedanceSeenByMotionalBranch(net, c0F, f).imOhm;
  };
  let lo = branch.fsHz;
  let hi = branch.fsHz * Math.sqrt(1 + branch.c1F / Math.max(c0F, 1e-18));
  if (!(x(lo) < 0 && x(hi) > 0)) return undefined;
  for (let i = 0; i < GM_BISECTIONS && hi - lo > lo * 1e-15; i++) {
    const mid = 0.5 * (lo + hi);
    if (x(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
