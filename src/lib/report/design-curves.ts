/**
 * Negative-resistance curves of a part for the compare page: one per circuit meant for the part
 * (osc/negative-resistance-curve.ts), with the chosen capacitors' load, rounded for size.
 */
import { circuitCovers } from '../osc/circuit-offer.ts';
import { negativeResistanceCurve, type NegativeResistanceCurve } from '../osc/negative-resistance-curve.ts';
import type { PartData } from './types.ts';

const sig = (x: number) => Number(x.toPrecision(4));

/** Curves of every circuit whose range holds the part (empty without a model or circuits). */
export function negativeResistanceCurves(data: PartData): NegativeResistanceCurve[] {
  const calc = data.calculator;
  if (!calc) return [];
  const out: NegativeResistanceCurve[] = [];
  for (const a of data.pierce) {
    const circuit = calc.circuits.find((c) => c.name === a.circuit);
    const hz = a.target?.targetHz ?? data.summary.fsHz;
    if (!circuit || hz === undefined || !circuitCovers(circuit, hz)) continue;
    const chosenClF = a.ok ? a.best.clF : undefined;
    const c = negativeResistanceCurve({
      model: calc.model,
      mainBranch: calc.mainBranch,
      circuit,
      esrMaxOhm: calc.datasheet?.esrMaxOhm,
      chosenClF,
      maxExternalF: Math.max(40e-12, 4 * (chosenClF ?? 0)),
    });
    if (c) out.push({ ...c, clF: c.clF.map(sig), pinsOhm: c.pinsOhm.map(sig), motionalOhm: c.motionalOhm.map(sig) });
  }
  return out;
}
