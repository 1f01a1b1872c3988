/**
 * Outside check of fitBvd against scipy.optimize.least_squares (method 'lm', MINPACK, Debian
 * python3-scipy) running the same model, parameterisation and residual definition, written
 * independently in numpy with scipy's own finite-difference Jacobian
 * (test/fixtures/scipy-fit/fit_bvd.py). The data are noisy, so the optimum is not the truth and
 * both fitters must find the same minimum of the same function. The weighted cases give both
 * fitters a per-point σZ (the residual w = |Zmeas − Zs0|²/σZ of residuals.ts) from the noise an
 * instrument adds to the recorded S11 or S21 (floor plus trace noise), carried through the
 * fixture conversion.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { fitBvd } from '../../../src/lib/extract/fit-bvd.ts';
import { createBvdResiduals, type BvdFitPoints } from '../../../src/lib/extract/residuals.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import {
  CERAMIC_TRUE,
  generatorNoise,
  makeScipyInput,
  makeScipyNoiseInput,
  runScipyFit,
  SCIPY_FIT_DIR,
  X1_TRUE,
  type ScipyFitInput,
  type ScipyNoiseSpec,
} from '../../fixtures/scipy-fit/make-input.ts';
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
    sigmaZOhm: p.sigmaZOhm ? Float64Array.from(p.sigmaZOhm) : undefined,
  };
}

/** Sum of squared residuals of a model, with our residual code. */
function ssrOf(points: BvdFitPoints, model: BvdModel): number {
  const problem = createBvdResiduals(points, model, {
    freeBranches: model.branches.map((_, k) => k),
    fitC0: true,
    fitRs: false,
    fitLs: false,
  });
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
  const fit = fitBvd(
    [
      {
        freqHz: points.freqHz,
        zRe: points.zRe,
        zIm: points.zIm,
        sigmaZOhm: points.sigmaZOhm,
        source: 'scipy-input.json',
      },
    ],
    input.initial,
  );
  expect(fit.converged, fit.reason).toBe(true);
  expect(scipy.status).toBeGreaterThan(0); // MINPACK converged (1–4)
  if (points.sigmaZOhm) expect(scipy.weighted).toBe(true);
  const ours = fit.model.branches[0];
  const theirs = scipy.branches[0];
  // The optimum is not the truth (noise), so agreement below is not agreement with the generator:
  // some parameter sits more than ten times the agreement tolerance away from it.
  const tb = truth.branches[0];
  expect(
    Math.max(
      Math.abs(ours.c1F / tb.c1F - 1),
      Math.abs(ours.r1Ohm / tb.r1Ohm - 1),
      Math.abs(fit.model.c0F / truth.c0F - 1),
    ),
  ).toBeGreaterThan(1e-5);
  // Same minimum: fs per the rule above, R1, C1, C0 to 1e-6 relative (scipy least_squares).
  if (fsRule === 'ppt') expect(Math.abs(ours.fsHz - theirs.fsHz) / theirs.fsHz).toBeLessThan(1e-12);
  else expect(Math.abs(ours.fsHz - theirs.fsHz)).toBeLessThan(1e-3 * fit.uncertainty.branches[0].fsHz);
  expect(Math.abs(ours.r1Ohm / theirs.r1Ohm - 1)).toBeLessThan(1e-6);
  expect(Math.abs(ours.c1F / theirs.c1F - 1)).toBeLessThan(1e-6);
  expect(Math.abs(fit.model.c0F / scipy.c0F - 1)).toBeLessThan(1e-6);
  // Same objective: our residual code evaluated at scipy's solution gives scipy's own SSR …
  const ssrTheirs = ssrOf(points, { c0F: scipy.c0F, branches: scipy.branches });
  expect(Math.abs(ssrTheirs / scipy.ssr - 1)).toBeLessThan(1e-9);
  // … our minimum is not worse than theirs, and both minima have the same SSR to 1e-6.
  const ssrOurs = ssrOf(points, fit.model);
  expect(ssrOurs).toBeLessThanOrEqual(ssrTheirs * (1 + 1e-12));
  expect(Math.abs(ssrOurs / scipy.ssr - 1)).toBeLessThan(1e-6);
}

/**
 * σZ of each point written here from the fixture formulas (for two equal 50 Ω ports): reflection
 * Γ = (Z − Z0)/(Z + Z0), |dZ/dΓ| = |Z + Z0|²/(2·Z0); series-through S21 = 2Z0/(Z + 2Z0),
 * |dZ/dS21| = |Z + 2Z0|²/(2·Z0); σZ = |dZ/dM|·√(floor² + (trace·|M|)²). Checks the σZ that
 * make-input.ts takes from impedanceSigmaOhm and the recorded quantity of networkToImpedance.
 */
function sigmaByHand(input: ScipyFitInput, spec: ScipyNoiseSpec): number[] {
  const z0 = spec.z0Ohm ?? 50;
  const { floor, trace } = generatorNoise(spec);
  const zs = spec.fixture === 'reflection' ? z0 : 2 * z0; // the other end of the divider
  return input.points.freqHz.map((_, i) => {
    const zr = input.points.zRe[i];
    const zi = input.points.zIm[i];
    const den2 = (zr + zs) ** 2 + zi * zi; // |Z + zs|²
    const m = spec.fixture === 'reflection' ? Math.hypot(zr - z0, zi) / Math.sqrt(den2) : (2 * z0) / Math.sqrt(den2);
    return (den2 / (2 * z0)) * Math.sqrt(floor * floor + (trace * m) ** 2);
  });
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
    it.skipIf(!haveScipy)(
      `finds the same minimum as scipy on a freshly generated noisy ${name} sweep (seed ${seed}, ${noiseDb} dB)`,
      () => {
        const input = makeScipyInput(seed, noiseDb, 1601, truth);
        const path = join(dir, `input-${name}-${seed}.json`);
        writeFileSync(path, JSON.stringify(input));
        compare(input, runScipyFit(path), truth, fsRule);
      },
    );
  }

  // Weighted by σZ from an instrument's noise: floor −65 / −70 dB below the source plus 1e-4
  // trace noise on S11 (reflection, Z0 50 Ω) or S21 (series-through), converted by the
  // project's fixture code (networkToImpedance).
  const WEIGHTED: Array<[string, ScipyNoiseSpec, FsRule]> = [
    ['X1 reflection', { seed: 6501, fixture: 'reflection', floorDb: -65, traceNoise: 1e-4, truth: X1_TRUE }, 'ppt'],
    ['X1 reflection', { seed: 6502, fixture: 'reflection', floorDb: -70, traceNoise: 1e-4, truth: X1_TRUE }, 'ppt'],
    [
      'X1 series-through',
      { seed: 6503, fixture: 'series-thru', floorDb: -65, traceNoise: 1e-4, truth: X1_TRUE },
      'ppt',
    ],
    [
      'ceramic reflection',
      { seed: 6504, fixture: 'reflection', floorDb: -65, traceNoise: 1e-4, truth: CERAMIC_TRUE },
      'uncertainty',
    ],
  ];
  for (const [name, spec, fsRule] of WEIGHTED) {
    it.skipIf(!haveScipy)(
      `finds the same weighted minimum as scipy on a ${name} record (seed ${spec.seed}, floor ${spec.floorDb} dB, trace ${spec.traceNoise})`,
      () => {
        const input = makeScipyNoiseInput(spec);
        const sigma = input.points.sigmaZOhm!;
        // σZ as the fixture formulas give it, to 1e-9 (rounding of the S → Z → S round trip).
        sigmaByHand(input, spec).forEach((v, i) => expect(Math.abs(sigma[i] / v - 1)).toBeLessThan(1e-9));
        // The weights matter: σZ/|Z| varies by orders of magnitude over the sweep.
        const rel = sigma.map((v, i) => v / Math.hypot(input.points.zRe[i], input.points.zIm[i]));
        expect(Math.max(...rel) / Math.min(...rel)).toBeGreaterThan(100);
        const path = join(dir, `input-weighted-${spec.seed}.json`);
        writeFileSync(path, JSON.stringify(input));
        const scipy = runScipyFit(path);
        compare(input, scipy, spec.truth!, fsRule);
        // With σZ the noise the generator really added, each residual has unit variance: the
        // reduced χ² SSR/(m − n) is 1 within ±0.1 (4 standard deviations of χ² with m − n ≈ 3200
        // degrees of freedom, √(2/3200) = 0.025).
        const dof = 2 * input.points.freqHz.length - 4;
        expect(Math.abs(scipy.ssr / dof - 1)).toBeLessThan(0.1);
      },
    );
  }
});
