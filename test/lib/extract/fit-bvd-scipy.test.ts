/**
 * Outside check of fitBvd against scipy.optimize.least_squares (method 'lm', MINPACK, Debian
 * python3-scipy) running the same model, parameterisation and residual definition, written
 * independently in numpy with scipy's own finite-difference Jacobian
 * (test/fixtures/scipy-fit/fit_bvd.py). The data are noisy, so the optimum is not the truth and
 * both fitters must find the same minimum of the same function.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { fitBvd } from '../../../src/lib/extract/fit-bvd.ts';
import { createBvdResiduals, type BvdFitPoints } from '../../../src/lib/extract/residuals.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { CERAMIC_TRUE, makeScipyInput, runScipyFit, SCIPY_FIT_DIR, X1_TRUE, type ScipyFitInput } from '../../fixtures/scipy-fit/make-input.ts';
import { requireTool } from '../../support/tools.ts';

type ScipyOutput = ReturnType<typeof runScipyFit>;

function toPoints(input: ScipyFitInput): BvdFitPoints {
  const p = input.points;
  return {
    freqHz: Float64Array.from(p.freqHz),
    zRe: Float64Array.from(p.zRe),
    zIm: Float64Array.from(p.zIm),
    weight: Float64Array.from(p.weight),
    parallelCapF: Float64Array.from(p.parallelCapF),
    seriesCapF: Float64Array.from(p.seriesCapF),
  };
}

/** Sum of squared residuals of a model, with our residual code. */
function ssrOf(points: BvdFitPoints, model: BvdModel): number {
  const problem = createBvdResiduals(points, model, { freeBranches: model.branches.map((_, k) => k), fitC0: true, fitRs: false, fitLs: false });
  const r = new Float64Array(problem.residualCount);
  problem.residuals(problem.x0, r);
  return r.reduce((s, v) => s + v * v, 0);
}

/** Fit the input with fitBvd and compare with scipy's solution. */
/**
 * fs agreement rule. 'ppt': |Δfs|/fs < 1e-12 — for the quartz part, whose fs standard uncertainty
 * is ~2e-8 relative. 'uncertainty': |Δfs| < 1e-3 u(fs) — for the ceramic (Q ≈ 1211, bandwidth
 * 825 ppm), where MINPACK's xtol stop with forward-difference Jacobians leaves scipy ~1e-4 u(fs)
 * (~1e-10 relative) from the minimum; the SSR comparison below shows which side is closer.
 */
type FsRule = 'ppt' | 'uncertainty';

function compare(input: ScipyFitInput, scipy: ScipyOutput, truth: BvdModel, fsRule: FsRule): void {
  const points = toPoints(input);
  const fit = fitBvd([{ freqHz: points.freqHz, zRe: points.zRe, zIm: points.zIm, source: 'scipy-input.json' }], input.initial);
  expect(fit.converged, fit.reason).toBe(true);
  expect(scipy.status).toBeGreaterThan(0); // MINPACK converged (1–4)
  const ours = fit.model.branches[0];
  const theirs = scipy.branches[0];
  // The optimum is not the truth (noise), so agreement below is not agreement with the generator.
  expect(Math.abs(ours.c1F / truth.branches[0].c1F - 1)).toBeGreaterThan(1e-5);
  // Same minimum: fs per the rule above, R1, C1, C0 to 1e-6 relative (scipy least_squares).
  if (fsRule === 'ppt') expect(Math.abs(ours.fsHz - theirs.fsHz) / theirs.fsHz).toBeLessThan(1e-12);
  else expect(Math.abs(ours.fsHz - theirs.fsHz)).toBeLessThan(1e-3 * fit.uncertainty.branches[0].fsHz);
  expect(Math.abs(ours.r1Ohm / theirs.r1Ohm - 1)).toBeLessThan(1e-6);
  expect(Math.abs(ours.c1F / theirs.c1F - 1)).toBeLessThan(1e-6);
  expect(Math.abs(fit.model.c0F / scipy.c0F - 1)).toBeLessThan(1e-6);
  // Same objective: our residual code evaluated at scipy's solution gives scipy's own SSR …
  const ssrTheirs = ssrOf(points, { c0F: scipy.c0F, branches: scipy.branches });
  expect(Math.abs(ssrTheirs / scipy.ssr - 1)).toBeLessThan(1e-9);
  // … and our minimum is not worse than theirs.
  expect(ssrOf(points, fit.model)).toBeLessThanOrEqual(ssrTheirs * (1 + 1e-12));
}

describe('fitBvd against scipy least_squares', () => {
  it('matches the committed scipy solution for the committed input (x1-noise40)', () => {
    const input = JSON.parse(readFileSync(join(SCIPY_FIT_DIR, 'x1-noise40.input.json'), 'utf8')) as ScipyFitInput;
    const output = JSON.parse(readFileSync(join(SCIPY_FIT_DIR, 'x1-noise40.output.json'), 'utf8')) as ScipyOutput;
    // The committed input is what make-input.ts generates today.
    expect(input).toEqual(JSON.parse(JSON.stringify(makeScipyInput())));
    compare(input, output, X1_TRUE, 'ppt');
  });

  const haveScipy = requireTool('scipy');
  const dir = mkdtempSync(join(tmpdir(), 'motional-scipy-fit-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  for (const [name, truth, seed, noiseDb, fsRule] of [
    ['X1', X1_TRUE, 4242, -40, 'ppt'],
    ['X1', X1_TRUE, 777, -50, 'ppt'],
    ['ceramic', CERAMIC_TRUE, 99, -40, 'uncertainty'],
  ] as const) {
    it.skipIf(!haveScipy)(`finds the same minimum as scipy on a freshly generated noisy ${name} sweep (seed ${seed}, ${noiseDb} dB)`, () => {
      const input = makeScipyInput(seed, noiseDb, 1601, truth);
      const path = join(dir, `input-${name}-${seed}.json`);
      writeFileSync(path, JSON.stringify(input));
      compare(input, runScipyFit(path), truth, fsRule);
    });
  }
});
