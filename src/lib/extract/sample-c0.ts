/**
 * C0 of the part alone and its cross-check (steps 5 and 6 of extract-sample.ts). C0 comes from
 * the joint fit, else the capacitive region, else a reported mode's window fit that held C0
 * free, else the susceptance at resonance (±10 %, with a warning). When that last one was not
 * positive (only a guess for the fits) no C0 is published at all.
 */
import type { CrossCheck, Diagnostic, MethodValue } from './types.ts';
import type { C0Estimate } from './c0-estimate.ts';
import type { C0Start } from './sample-start.ts';
import type { ChosenMode } from './mode-values.ts';
import type { SampleFits } from './sample-fits.ts';
import { crossCheck } from './cross-check.ts';
import { picofarads } from './format-capacitance.ts';

/** The published C0 and the method it came from. */
export interface PublishedC0 {
  /** F. */
  value: number;
  /** Standard uncertainty, F. */
  uncertainty: number;
  method: MethodValue['method'];
}

/**
 * C0 of the part alone.
 * @param kept the reported modes (mode-values.ts)
 * @returns undefined when no C0 can be published (an error is in `diagnostics`)
 */
export function c0OfPartAlone(
  sampleId: string,
  fits: SampleFits,
  c0Est: C0Estimate,
  start: C0Start,
  kept: ChosenMode[],
  diagnostics: Diagnostic[],
): PublishedC0 | undefined {
  const joint = fits.converged;
  if (joint) return { value: joint.model.c0F, uncertainty: joint.uncertainty.c0F, method: 'joint-fit' };
  if (c0Est.ok) return { value: c0Est.c0F, uncertainty: c0Est.uncertaintyF, method: 'capacitive-region' };
  const withC0 = kept.map((m) => m.perMode).find((f) => f?.converged && f.parameterNames?.includes('lnC0F'));
  if (!withC0 && start.notPositiveF !== undefined) {
    // The only C0 left would be the fits' start guess: publish no C0 and no modes.
    const c0 = start.notPositiveF;
    diagnostics.push({
      code: 'other',
      severity: 'error',
      message: `sample ${sampleId}: no C0: the susceptance at resonance gives ${Number.isFinite(c0) ? `${picofarads(c0)} pF` : 'no value'} and no fit converged; sweep a wider span for the capacitive region, and check the fixture correction`,
    });
    return undefined;
  }
  if (withC0) return { value: withC0.model.c0F, uncertainty: withC0.uncertainty.c0F, method: 'complex-fit' };
  diagnostics.push({
    code: 'other',
    severity: 'warning',
    message: `C0 only from the susceptance at resonance (${(start.c0F * 1e12).toPrecision(4)} pF, ±10 %); sweep a wider span for the capacitive region`,
  });
  return { value: start.c0F, uncertainty: 0.1 * start.c0F, method: 'conductance-peak' };
}

/**
 * C0 by every method that gave one: the published value, the capacitive region, the main
 * mode's window fit and its two-load shift.
 * @param main the main mode among the reported ones, when there is one
 */
export function c0CrossCheckOf(
  c0: PublishedC0,
  c0Est: C0Estimate,
  main: ChosenMode | undefined,
  diagnostics: Diagnostic[],
): CrossCheck {
  const values: MethodValue[] = [
    { method: c0.method, value: c0.value, uncertainty: c0.uncertainty > 0 ? c0.uncertainty : undefined },
  ];
  if (c0.method !== 'capacitive-region' && c0Est.ok)
    values.push({
      method: 'capacitive-region',
      value: c0Est.c0F,
      uncertainty: c0Est.uncertaintyF,
      note: c0Est.sweeps.join(', '),
    });
  if (main) {
    const pm = main.perMode;
    if (c0.method !== 'complex-fit' && pm?.converged && pm.parameterNames?.includes('lnC0F'))
      values.push({
        method: 'complex-fit',
        value: pm.model.c0F,
        uncertainty: pm.uncertainty.c0F,
        note: `window of ${main.candidate.best.source}`,
      });
    const two = main.reference.twoLoad;
    if (two) values.push({ method: 'two-load', value: two.c0F, uncertainty: two.uncertainty?.c0F, note: two.note });
  }
  const result = crossCheck('c0F', values, 'fixture stray capacitance, or modes outside the swept span');
  if (result.verdict === 'disagree')
    diagnostics.push({ code: 'methods-disagree', severity: 'warning', message: result.message! });
  return result;
}
