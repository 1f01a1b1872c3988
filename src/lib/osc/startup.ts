/**
 * Start-up of a crystal oscillator from its small-signal network (derived from the BVD model;
 * the same envelope argument as E. A. Vittoz, "Low-Power Crystal and MEMS Oscillators",
 * Springer 2010, ch. 3):
 *
 * The motional branch R1, L1, C1 closes the loop through the impedance Zm it sees (pierce-network.ts).
 * With Rm = Re Zm < 0 the motional current grows as exp(t/τ),
 *
 *   τ = 2·L1/(|Rm| − R1)            (envelope time constant of the amplitude)
 *
 * valid when the growth is slow against one period (τ ≫ 1/f, i.e. (|Rm| − R1) ≪ ωL1).
 * Time to the steady amplitude from the noise level, assuming the small-signal growth holds all
 * the way (the growth slows near limiting, so a real circuit takes somewhat longer):
 *
 *   t = τ·ln(Im,steady/Im,noise),  Im,noise = √(kT/L1) (equipartition: ½L1·i² = ½kT, T = 300 K),
 *   Im,steady = ω(C0 + CL)·Vx,pk (the motional current at load resonance for a peak voltage Vx
 *   across the crystal, as in drive-level.ts).
 */

/** Boltzmann constant, J/K (SI 2019 exact value). */
const K_BOLTZMANN = 1.380649e-23;
/** Temperature assumed for the noise level, K. */
export const NOISE_TEMPERATURE_K = 300;
/**
 * |Rm|/R1 below which start-up is called marginal (project choice: below 2 the envelope grows
 * slowly, and R1 rising with temperature and drive or the process spread of gm can stop it).
 */
export const MIN_MOTIONAL_RATIO = 2;

/** Envelope time constant τ = 2L1/(|Rm| − R1), s; Infinity when |Rm| ≤ R1 (no start-up). */
export function startupTauS(l1H: number, motionalOhm: number, r1Ohm: number): number {
  const excess = -motionalOhm - r1Ohm;
  return excess > 0 ? (2 * l1H) / excess : Number.POSITIVE_INFINITY;
}

/** Thermal-noise motional current √(kT/L1), A rms. */
export function noiseCurrentA(l1H: number, temperatureK = NOISE_TEMPERATURE_K): number {
  return Math.sqrt((K_BOLTZMANN * temperatureK) / l1H);
}

/** Steady motional current for a peak-to-peak voltage across the crystal, A peak. */
export function steadyMotionalCurrentA(c0F: number, clF: number, freqHz: number, vxPp: number): number {
  return 2 * Math.PI * freqHz * (c0F + clF) * (vxPp / 2);
}

/** Start-up estimate for one pair of capacitors. */
export interface StartupEstimate {
  /** Envelope time constant, s (Infinity: does not start). */
  tauS: number;
  /** Time from the noise level to the steady amplitude, s (Infinity: does not start). */
  timeS: number;
  /** ln(steady/noise): how many time constants the start-up takes. */
  timeConstants: number;
  /** |Rm|/R1. */
  motionalRatio: number;
}

/** τ and the start-up time from the motional resistance, the steady swing and the branch. */
export function estimateStartup(args: {
  l1H: number;
  r1Ohm: number;
  motionalOhm: number;
  c0F: number;
  clF: number;
  freqHz: number;
  swingVpp: number;
}): StartupEstimate {
  const tauS = startupTauS(args.l1H, args.motionalOhm, args.r1Ohm);
  const ratio = steadyMotionalCurrentA(args.c0F, args.clF, args.freqHz, args.swingVpp) / noiseCurrentA(args.l1H);
  const timeConstants = Math.log(Math.max(ratio, 1));
  return { tauS, timeS: tauS * timeConstants, timeConstants, motionalRatio: -args.motionalOhm / args.r1Ohm };
}

/**
 * Steady peak-to-peak voltage across the crystal of an amplifier whose output current limits at
 * ±Imax (a describing-function estimate, derived: a hard-limited output carries a fundamental of
 * 4Imax/π; the loop settles where that equals gm,crit·v1, so v1 = 4Imax/(π·gm,crit)). The voltage
 * across the crystal is v1·(1 + Ca/Cb) (node 2 swings opposite to node 1 by Ca/Cb at resonance).
 * Capped by the supply.
 */
export function limitedSwingVpp(
  currentLimitA: number,
  gmCritS: number,
  caF: number,
  cbF: number,
  supplyV: number,
): number {
  const v1 = (4 * currentLimitA) / (Math.PI * gmCritS);
  return Math.min(2 * v1 * (1 + caF / cbF), supplyV);
}
