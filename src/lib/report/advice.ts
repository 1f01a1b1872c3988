/**
 * The advice parts of a part page's data: datasheet compliance per sample, lot statistics,
 * Pierce advice per circuit and the calculator inputs. Pure; it calls the oscillator code of
 * src/lib/osc so the page and the command line give the same numbers for the same inputs.
 */
import type { PartResult, SampleResult } from '../extract/types.ts';
import type { Part } from '../schema/part.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { advisePierce, type PierceAdvice } from '../osc/pierce.ts';
import { sampleModel } from '../osc/sample-model.ts';
import { circuitCovers, offerFrequencyHz } from '../osc/circuit-offer.ts';
import { checkCompliance, type ComplianceResult } from '../osc/compliance.ts';
import { lotStatistics, type LotStatistics } from '../osc/lot-stats.ts';
import type { CalculatorData, ComplianceState } from './types.ts';

export { circuitCovers, offerFrequencyHz };

/** Compliance of every sample that has modes; empty when the record has no datasheet. */
export function buildCompliance(part: Part, result: PartResult): ComplianceResult[] {
  if (!part.datasheet) return [];
  return result.samples.filter((s) => s.modes.length > 0).map((s) => checkCompliance(s, part.datasheet));
}

/**
 * One word for the whole part: `fail` when any sample fails a datasheet promise; `warnings` when
 * extraction warned (warnings, non-info diagnostics, a sample without modes); `unknown` when
 * nothing could be checked; else `pass`.
 */
export function summariseState(
  compliance: ComplianceResult[],
  samples: Array<Pick<SampleResult, 'modes' | 'warnings' | 'diagnostics'> | undefined>,
): ComplianceState {
  const verdicts = compliance.flatMap((c) => c.items.map((i) => i.verdict));
  if (verdicts.includes('fail')) return 'fail';
  if (
    samples.some(
      (s) => !s || s.modes.length === 0 || s.warnings.length > 0 || s.diagnostics.some((d) => d.severity !== 'info'),
    )
  )
    return 'warnings';
  if (!verdicts.includes('pass')) return 'unknown';
  return 'pass';
}

/** Lot statistics when two or more samples have a main mode. */
export function buildLotStats(part: Part, result: PartResult): LotStatistics | undefined {
  const withModes = result.samples.filter((s) => s.modes.length > 0);
  return withModes.length >= 2 ? lotStatistics(withModes, part.datasheet ?? {}) : undefined;
}

/**
 * The circuits meant for a part: those whose frequency range holds its offer frequency
 * ({@link offerFrequencyHz}), as `advise` without `--circuit` picks them; all circuits when none is
 * meant for it.
 */
export function circuitsFor(circuits: OscillatorCircuit[], freqHz: number): OscillatorCircuit[] {
  const meant = circuits.filter((c) => circuitCovers(c, freqHz));
  return meant.length ? meant : circuits;
}

/** Pierce advice for each circuit meant for the part, for one sample's main mode (what `advise` computes). */
export function buildPierce(
  sample: SampleResult,
  main: { index: number },
  part: Part,
  circuits: OscillatorCircuit[],
): PierceAdvice[] {
  const model = sampleModel(sample);
  return circuitsFor(circuits, offerFrequencyHz(part.datasheet, model, main.index)).map((circuit) =>
    advisePierce({
      partId: part.id,
      datasheet: part.datasheet,
      model,
      mainBranch: main.index,
      circuit,
      temperatureFit: sample.temperature,
    }),
  );
}

/** Calculator inputs: the same arguments `advisePierce` gets, for the client to vary. */
export function buildCalculator(
  sample: SampleResult,
  main: { index: number },
  part: Part,
  circuits: OscillatorCircuit[],
): CalculatorData {
  const model = sampleModel(sample);
  return {
    partId: part.id,
    datasheet: part.datasheet,
    model,
    mainBranch: main.index,
    circuits: circuitsFor(circuits, offerFrequencyHz(part.datasheet, model, main.index)),
  };
}
