/**
 * Datasheet compliance of one measured sample: frequency at the datasheet load (or series),
 * ESR, C0 and overtone order, each with value, limit, margin and a pass / fail / unknown verdict.
 *
 * - Frequency: the main mode's load resonance *with R1* (lower zero-phase frequency of the part
 *   + series CL, the quantity a load-resonance measurement gives, IEC 60444-11) at the datasheet
 *   CL; for `series`, the zero-phase resonance fr (IEC 60444-1), else fs. Offset from the nominal
 *   frequency in ppm against ± tolerance; margin = tolerance − |offset|, ppm. The tolerance holds
 *   at 25 °C: a sample measured elsewhere is compared all the same, with a note.
 * - ESR: the resistance at fr (Rr) when the extraction reports it — what a datasheet ESR usually
 *   means (from memory) — else R1 (for M > 50 the two agree within 0.04 %, IEEE Std 177 figure of
 *   merit M; derived from the BVD model). Margin in % of the limit.
 * - C0: the part's shunt capacitance against c0Max; margin in % of the limit.
 * - Overtone: the physical order of the mode nearest the datasheet frequency against the
 *   datasheet overtone.
 */
import type { Datasheet } from '../schema/part.ts';
import type { SampleResult } from '../extract/types.ts';
import { loadFrequencyHz, loadResonanceWithLoss } from './load.ts';
import { NEAREST_NOMINAL_RULE } from '../extract/main-mode.ts';
import { sampleModel } from './sample-model.ts';

export type ComplianceVerdict = 'pass' | 'fail' | 'unknown';

export interface ComplianceItem {
  check: 'frequency' | 'esr' | 'c0' | 'overtone';
  /** Measured value in `unit` (frequency: offset from nominal in ppm). */
  value?: number;
  /** Limit in `unit` (frequency: ± tolerance in ppm). */
  limit?: number;
  unit: 'ppm' | 'ohm' | 'F' | '';
  /** Distance to the limit: ppm for frequency, % of the limit for ESR and C0; negative when failing. */
  margin?: number;
  marginUnit?: 'ppm' | '%';
  verdict: ComplianceVerdict;
  reason: string;
}

export interface ComplianceResult {
  sample: string;
  /** Index of the main mode in `modes`, −1 when none. */
  mainMode: number;
  mainModeRule: string;
  /** Frequency compared with the nominal, Hz, and what it is. */
  frequencyHz?: number;
  frequencyBasis?: string;
  items: ComplianceItem[];
}

/** Sample fields compliance needs (SampleResult satisfies it). */
export type ComplianceSample = Pick<SampleResult, 'sample' | 'c0F' | 'modes' | 'temperatureC' | 'mainMode'>;

function fmt(x: number, digits = 4): string {
  return Number(x.toPrecision(digits)).toString();
}

/**
 * The main mode's frequency at the datasheet load: load resonance with R1 at a numeric CL, fr
 * (else fs) for `series`. Undefined (with the reason) when the datasheet gives no load.
 */
export function frequencyAtDatasheetLoad(
  sample: Pick<SampleResult, 'c0F' | 'modes'>,
  main: number,
  load: Datasheet['loadCapacitanceF'],
): { freqHz: number; basis: string } | { reason: string } {
  const mode = sample.modes[main];
  if (!mode) return { reason: 'no main mode' };
  if (load === undefined) return { reason: 'no datasheet load capacitance' };
  if (load === 'series') {
    return mode.frHz !== undefined
      ? { freqHz: mode.frHz, basis: 'zero-phase resonance fr (series)' }
      : { freqHz: mode.fsHz, basis: 'motional resonance fs (series; fr not available)' };
  }
  const model = sampleModel(sample);
  const solved = loadResonanceWithLoss(model, main, load);
  if (solved.ok) return { freqHz: solved.freqHz, basis: `load resonance with R1 at CL ${fmt(load * 1e12)} pF` };
  return {
    freqHz: loadFrequencyHz(model.branches[main], model.c0F, load),
    basis: `lossless load resonance at CL ${fmt(load * 1e12)} pF (${solved.reason})`,
  };
}

/**
 * Check one sample against its datasheet. The main mode is the one the extraction recorded
 * (`sample.mainMode`, picked with this datasheet's frequency and overtone).
 */
export function checkCompliance(sample: ComplianceSample, datasheet: Datasheet = {}): ComplianceResult {
  const main = sample.mainMode;
  const mode = sample.modes[main.index];
  const items: ComplianceItem[] = [];
  const result: ComplianceResult = { sample: sample.sample, mainMode: main.index, mainModeRule: main.rule, items };

  // Frequency.
  const f = mode
    ? frequencyAtDatasheetLoad(sample, main.index, datasheet.loadCapacitanceF)
    : { reason: 'no main mode' };
  if ('freqHz' in f) {
    result.frequencyHz = f.freqHz;
    result.frequencyBasis = f.basis;
  }
  if (!('freqHz' in f) || datasheet.frequencyHz === undefined) {
    const why = !('freqHz' in f) ? f.reason : 'no datasheet frequency';
    items.push({ check: 'frequency', unit: 'ppm', verdict: 'unknown', reason: why });
  } else {
    const offset = (f.freqHz / datasheet.frequencyHz - 1) * 1e6;
    const tol = datasheet.tolerancePpm;
    const temp =
      sample.temperatureC !== undefined && Math.abs(sample.temperatureC - 25) > 5
        ? `; measured at ${fmt(sample.temperatureC, 3)} °C, the tolerance holds at 25 °C`
        : '';
    const what = `${f.basis}: ${fmt(f.freqHz, 12)} Hz, ${offset >= 0 ? '+' : ''}${offset.toFixed(3)} ppm from nominal ${fmt(datasheet.frequencyHz, 12)} Hz`;
    if (tol === undefined) {
      items.push({
        check: 'frequency',
        value: offset,
        unit: 'ppm',
        verdict: 'unknown',
        reason: `${what}; no datasheet tolerance${temp}`,
      });
    } else {
      const margin = tol - Math.abs(offset);
      items.push({
        check: 'frequency',
        value: offset,
        limit: tol,
        unit: 'ppm',
        margin,
        marginUnit: 'ppm',
        verdict: margin >= 0 ? 'pass' : 'fail',
        reason: `${what}; ${margin >= 0 ? 'within' : 'outside'} ±${fmt(tol)} ppm (margin ${margin.toFixed(3)} ppm)${temp}`,
      });
    }
  }

  // ESR.
  if (!mode) items.push({ check: 'esr', unit: 'ohm', verdict: 'unknown', reason: 'no main mode' });
  else {
    const useRr = mode.rrOhm !== undefined;
    const value = useRr ? mode.rrOhm! : mode.r1Ohm;
    const which = useRr
      ? 'resistance at fr (Rr)'
      : `R1 (Rr not available; they differ by about 1/M² = ${fmt(100 / (mode.m * mode.m), 2)} %)`;
    items.push(limitItem('esr', value, datasheet.esrMaxOhm, 'ohm', `${which} ${fmt(value)} Ω`, 'esrMax'));
  }

  // C0.
  items.push(limitItem('c0', sample.c0F, datasheet.c0MaxF, 'F', `C0 ${fmt(sample.c0F * 1e12)} pF`, 'c0Max'));

  // Overtone.
  if (!mode) items.push({ check: 'overtone', unit: '', verdict: 'unknown', reason: 'no main mode' });
  else if (datasheet.overtone === undefined) {
    items.push({
      check: 'overtone',
      value: mode.overtone,
      unit: '',
      verdict: 'unknown',
      reason: `main mode is overtone ${mode.overtone}; no datasheet overtone`,
    });
  } else if (main.rule !== NEAREST_NOMINAL_RULE) {
    items.push({
      check: 'overtone',
      value: mode.overtone,
      limit: datasheet.overtone,
      unit: '',
      verdict: 'unknown',
      reason: 'no mode near the datasheet frequency to locate the main mode',
    });
  } else {
    const same = mode.overtone === datasheet.overtone;
    items.push({
      check: 'overtone',
      value: mode.overtone,
      limit: datasheet.overtone,
      unit: '',
      verdict: same ? 'pass' : 'fail',
      reason: `the mode nearest the datasheet frequency is overtone ${mode.overtone}; datasheet says ${datasheet.overtone}`,
    });
  }
  return result;
}

function limitItem(
  check: 'esr' | 'c0',
  value: number,
  limit: number | undefined,
  unit: 'ohm' | 'F',
  what: string,
  field: string,
): ComplianceItem {
  if (limit === undefined) return { check, value, unit, verdict: 'unknown', reason: `${what}; no datasheet ${field}` };
  const margin = ((limit - value) / limit) * 100;
  const shown = unit === 'F' ? `${fmt(limit * 1e12)} pF` : `${fmt(limit)} Ω`;
  return {
    check,
    value,
    limit,
    unit,
    margin,
    marginUnit: '%',
    verdict: value <= limit ? 'pass' : 'fail',
    reason: `${what} ${value <= limit ? 'within' : 'above'} the datasheet ${field} ${shown} (margin ${margin.toFixed(1)} %)`,
  };
}
