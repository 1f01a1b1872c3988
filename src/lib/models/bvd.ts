/**
 * Butterworth–Van Dyke model of a piezoelectric resonator with one motional branch per mode.
 *
 *   Y(f) = jωC0 + Σk 1/(Rk + jXk),   Xk = ωLk − 1/(ωCk),   Z = 1/Y
 *
 * (IEEE Std 177 / IEC 60444-5 multi-resonance equivalent circuit.)
 * Branches add in admittance. Near a mode the naive Xk loses about log10(Q) digits to
 * cancellation, so Xk is evaluated as Lk(ω − ωk)(ω + ωk)/ω with ω − ωk from the frequency offset.
 * Optional fixture parasitics: Rs and Ls in series with the whole, Cp across C0.
 */

/** One motional branch (a mode). */
export interface MotionalBranch {
  /** Series resonance 1/(2π√(L1C1)), Hz. */
  fsHz: number;
  /** Motional resistance, Ω. */
  r1Ohm: number;
  /** Motional capacitance, F. */
  c1F: number;
}

/** A whole model: shunt capacitance, branches, optional series parasitics. */
export interface BvdModel {
  /** Shunt (static) capacitance of the part, F. */
  c0F: number;
  branches: MotionalBranch[];
  /** Series resistance of leads/fixture, Ω (0 when absent). */
  rsOhm?: number;
  /** Series inductance of leads/fixture, H (0 when absent). */
  lsH?: number;
  /** Fixture stray capacitance in parallel with C0, F (0 when absent). */
  cpF?: number;
}

/** Motional inductance from fs and C1: L1 = 1/((2πfs)²C1), H. */
export function inductanceOf(branch: MotionalBranch): number {
  const w = 2 * Math.PI * branch.fsHz;
  return 1 / (w * w * branch.c1F);
}

/** Quality factor Q = 1/(2πfsR1C1). */
export function qualityOf(branch: MotionalBranch): number {
  return 1 / (2 * Math.PI * branch.fsHz * branch.r1Ohm * branch.c1F);
}

/** Motional reactance Xk at f, Ω, without the cancellation of ωL − 1/(ωC). */
export function motionalReactance(branch: MotionalBranch, freqHz: number): number {
  const l1H = inductanceOf(branch);
  const twoPi = 2 * Math.PI;
  // ω − ωk from the frequency offset keeps full precision near resonance.
  const dw = twoPi * (freqHz - branch.fsHz);
  const sum = twoPi * (freqHz + branch.fsHz);
  return (l1H * dw * sum) / (twoPi * freqHz);
}

/** Complex admittance of the part (no series parasitics) at one frequency: [G, B] in S. */
export function admittanceAt(model: BvdModel, freqHz: number): [number, number] {
  const w = 2 * Math.PI * freqHz;
  let g = 0;
  let b = w * (model.c0F + (model.cpF ?? 0));
  for (const br of model.branches) {
    const x = motionalReactance(br, freqHz);
    const den = br.r1Ohm * br.r1Ohm + x * x;
    g += br.r1Ohm / den;
    b -= x / den;
  }
  return [g, b];
}

/** Complex impedance of the model including series parasitics: [R, X] in Ω. */
export function impedanceAt(model: BvdModel, freqHz: number): [number, number] {
  const [g, b] = admittanceAt(model, freqHz);
  const den = g * g + b * b;
  const w = 2 * Math.PI * freqHz;
  return [g / den + (model.rsOhm ?? 0), -b / den + w * (model.lsH ?? 0)];
}

/** Impedance over a frequency grid. */
export function impedanceOver(model: BvdModel, freqHz: ArrayLike<number>): { zRe: Float64Array; zIm: Float64Array } {
  const n = freqHz.length;
  const zRe = new Float64Array(n);
  const zIm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [r, x] = impedanceAt(model, freqHz[i]);
    zRe[i] = r;
    zIm[i] = x;
  }
  return { zRe, zIm };
}
