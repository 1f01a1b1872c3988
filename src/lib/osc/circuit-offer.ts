/**
 * Which circuits a part is offered to: by its nominal frequency (README: Oscillator circuits).
 */
import type { BvdModel } from '../models/bvd.ts';
import type { Datasheet } from '../schema/part.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { loadFrequencyHz } from './load.ts';

/**
 * The frequency a part is offered to circuits by: the datasheet nominal when given, else the
 * sample's load resonance at the datasheet load capacitance, else its series resonance fs. Not the
 * measured fs alone: a 16 MHz part whose fs is 15.996 MHz belongs to a 16–52 MHz circuit.
 */
export function offerFrequencyHz(datasheet: Datasheet | undefined, model: BvdModel, mainBranch: number): number {
  const br = model.branches[mainBranch];
  if (datasheet?.frequencyHz !== undefined) return datasheet.frequencyHz;
  if (typeof datasheet?.loadCapacitanceF === 'number')
    return loadFrequencyHz(br, model.c0F, datasheet.loadCapacitanceF);
  return br.fsHz;
}

/** Whether a circuit is meant for parts of this frequency (no range: for every part). */
export function circuitCovers(circuit: OscillatorCircuit, freqHz: number): boolean {
  const r = circuit.frequencyRangeHz;
  return !r || (freqHz >= r.min && freqHz <= r.max);
}
