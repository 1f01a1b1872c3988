/**
 * Builders of SampleResult objects for tests of the design modules: modes from known BVD branches
 * (synthetic reference resonators X1, TF1, OT100; invented), with the bookkeeping fields the extraction would fill left neutral.
 */
import { mainMode, type MainModeHints } from '../../../src/lib/extract/main-mode.ts';
import type { ModeResult, SampleResult } from '../../../src/lib/extract/types.ts';
import { inductanceOf, qualityOf, type BvdModel, type MotionalBranch } from '../../../src/lib/models/bvd.ts';

export function modeOf(
  b: MotionalBranch,
  c0F: number,
  overtone = 1,
  spurious = false,
  extra: Partial<ModeResult> = {},
): ModeResult {
  const q = qualityOf(b);
  const r = c0F / b.c1F;
  return {
    overtone,
    spurious,
    fsHz: b.fsHz,
    fpHz: b.fsHz * Math.sqrt(1 + b.c1F / c0F),
    r1Ohm: b.r1Ohm,
    l1H: inductanceOf(b),
    c1F: b.c1F,
    q,
    uncertainty: { fsHz: 0.01, fpHz: 0.02, r1Ohm: 0.01, l1H: 1e-7, c1F: 1e-19, c0F: 1e-15, q: 10 },
    m: q / r,
    r,
    crossCheck: [],
    sweeps: ['synthetic.s1p'],
    ...extra,
  };
}

export function sampleOf(
  id: string,
  model: BvdModel,
  modes?: ModeResult[],
  extra: Partial<SampleResult> = {},
  hints: MainModeHints = {},
): SampleResult {
  const all = modes ?? model.branches.map((b) => modeOf(b, model.c0F));
  return {
    sample: id,
    c0F: model.c0F,
    modes: all,
    mainMode: mainMode(all, hints),
    referenceSweeps: ['synthetic.s1p'],
    warnings: [],
    model,
    c0CrossCheck: { quantity: 'c0F', values: [], verdict: 'single', rule: 'none' },
    fit: { converged: true, reason: 'synthetic', iterations: 0, rmsResidual: 0, points: 0 },
    diagnostics: [],
    otherConditions: [],
    spanHz: { min: 15.9e6, max: 15.95e6 },
    ...extra,
  };
}
