/**
 * Extraction of a whole part: every sample from its own sweeps (the `extract --json` result, README: Commands). Sweeps are
 * matched to samples by `sampleId`; sweeps that could not be read (no `impedance`) are skipped.
 * An unexpected failure inside one sample becomes that sample's error, not an exception.
 */
import type { Part, Sample } from '../schema/part.ts';
import type { PartResult, SampleResult } from './types.ts';
import { extractSample, type ExtractOptions } from './extract-sample.ts';
import type { ExtractSweepInput } from './reference-conditions.ts';

export type { ExtractOptions } from './extract-sample.ts';
export type { ExtractSweepInput } from './reference-conditions.ts';

function failedSample(sample: Sample, error: unknown): SampleResult {
  const message = `sample ${sample.id}: extraction failed unexpectedly (${error instanceof Error ? error.message : String(error)}); please report this with the part record`;
  return {
    sample: sample.id,
    c0F: 0,
    modes: [],
    warnings: [message],
    model: { c0F: 0, branches: [] },
    c0CrossCheck: { quantity: 'c0F', values: [], verdict: 'single', rule: 'no estimate' },
    fit: { converged: false, reason: 'extraction failed', iterations: 0, rmsResidual: 0, points: 0 },
    diagnostics: [{ code: 'other', severity: 'error', message }],
    otherConditions: [],
    spanHz: { min: 0, max: 0 },
    mainMode: { index: -1, rule: 'no modes' },
    referenceSweeps: [],
  };
}

/** Extract every sample of `part`; never throws for bad data, never publishes a NaN. */
export function extractPart(part: Part, sweeps: ExtractSweepInput[], options: ExtractOptions = {}): PartResult {
  return {
    part: part.id,
    samples: part.samples.map((sample) => {
      try {
        return extractSample(
          part,
          sample,
          sweeps.filter((s) => s.sampleId === sample.id),
          options,
        );
      } catch (e) {
        return failedSample(sample, e);
      }
    }),
  };
}
