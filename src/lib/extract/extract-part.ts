/**
 * Extraction of a whole part: every sample from its own sweeps (CONTRACT §3). Sweeps are
 * matched to samples by `sampleId`; sweeps that could not be read (no `impedance`) are skipped.
 */
import type { Part } from '../schema/part.ts';
import type { PartResult } from './types.ts';
import { extractSample, type ExtractOptions } from './extract-sample.ts';
import type { ExtractSweepInput } from './reference-conditions.ts';

export type { ExtractOptions } from './extract-sample.ts';
export type { ExtractSweepInput } from './reference-conditions.ts';

/** Extract every sample of `part`; never throws for bad data, never publishes a NaN. */
export function extractPart(part: Part, sweeps: ExtractSweepInput[], options: ExtractOptions = {}): PartResult {
  return {
    part: part.id,
    samples: part.samples.map((sample) => extractSample(part, sample, sweeps.filter((s) => s.sampleId === sample.id), options)),
  };
}
