/**
 * The model of the part alone, built from a sample's reported results: C0 (`c0F`, fixture and
 * added capacitors removed) and one motional branch per reported mode, in the order of
 * `modes`. Fixture parasitics (series R/L, parallel stray) of the fitted sweep model are not
 * part of the part and are left out.
 */
import type { BvdModel } from '../models/bvd.ts';

/** The sample fields the model needs (SampleResult satisfies it). */
export interface SampleLike {
  c0F: number;
  modes: Array<{ fsHz: number; r1Ohm: number; c1F: number }>;
}

/** BVD model of the part alone: C0 and every mode as a branch, same order as `modes`. */
export function sampleModel(sample: SampleLike): BvdModel {
  return {
    c0F: sample.c0F,
    branches: sample.modes.map((m) => ({ fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F })),
  };
}
