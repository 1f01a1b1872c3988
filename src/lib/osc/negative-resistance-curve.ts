/**
 * Negative resistance against load capacitance for one part in one circuit (pierce-network.ts,
 * the full small-signal network): equal external capacitors swept over a range, each giving the
 * load capacitance CL = CaCb/(Ca + Cb) + Cpp and, at the part's load resonance there, the
 * resistance seen by the crystal pins and the one seen by the motional branch. Its magnitude rises
 * to a peak (small capacitors: the gain is shunted by C0 and the pin-to-pin stray) and then falls
 * as the capacitors grow (≈ gm/(ω²CaCb)); the motional branch needs |Rm| > R1 to start.
 */
import type { BvdModel } from '../models/bvd.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { loadFrequencyHz } from './load.ts';
import { negativeResistance } from './pierce-network.ts';

export interface NegativeResistanceCurve {
  circuit: string;
  /** Load capacitance of each point, F. */
  clF: number[];
  /** −Re Z seen by the crystal pins, Ω (positive numbers: the magnitude of the negative resistance). */
  pinsOhm: number[];
  /** −Re Z seen by the motional branch, Ω. */
  motionalOhm: number[];
  r1Ohm: number;
  esrMaxOhm?: number;
  /** Load capacitance of the chosen capacitors, F. */
  chosenClF?: number;
}

/** Points on the curve (project choice: enough for a smooth line, small in the page data). */
export const CURVE_POINTS = 24;

/** The curve for external equal capacitors from 1 pF up to `maxExternalF` (default 40 pF). */
export function negativeResistanceCurve(args: {
  model: BvdModel;
  mainBranch: number;
  circuit: OscillatorCircuit;
  esrMaxOhm?: number;
  chosenClF?: number;
  maxExternalF?: number;
}): NegativeResistanceCurve | undefined {
  const { model, circuit } = args;
  const br = model.branches[args.mainBranch];
  if (!br) return undefined;
  const lo = 1e-12;
  const hi = Math.max(args.maxExternalF ?? 40e-12, 2 * lo);
  const clF: number[] = [];
  const pinsOhm: number[] = [];
  const motionalOhm: number[] = [];
  for (let k = 0; k < CURVE_POINTS; k++) {
    const x = lo * (hi / lo) ** (k / (CURVE_POINTS - 1));
    const ca = x + circuit.inputCapacitanceF + circuit.boardStrayF;
    const cb = x + circuit.outputCapacitanceF + circuit.boardStrayF;
    const cl = (ca * cb) / (ca + cb) + circuit.pinToPinStrayF;
    const f = loadFrequencyHz(br, model.c0F, cl);
    const nr = negativeResistance(
      { gmS: circuit.gmS, caF: ca, cbF: cb, pinToPinF: circuit.pinToPinStrayF },
      model.c0F,
      f,
    );
    clF.push(cl);
    pinsOhm.push(-nr.atPinsOhm);
    motionalOhm.push(-nr.motionalOhm);
  }
  return {
    circuit: circuit.name,
    clF,
    pinsOhm,
    motionalOhm,
    r1Ohm: br.r1Ohm,
    esrMaxOhm: args.esrMaxOhm,
    chosenClF: args.chosenClF,
  };
}
