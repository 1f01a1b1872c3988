/**
 * Frequency budget of one part in one circuit: every cause of deviation from the nominal
 * frequency as a term [min, max] in ppm with its source, summed worst case and root-sum-square,
 * against the circuit's requirement (common practice for clock budgets; the terms are those of
 * IEC 60444-11 / IEC 60122-1 crystal specifications: calibration tolerance, load capacitance,
 * temperature stability, aging).
 *
 * Terms:
 * - initial offset: the extracted sample's load resonance at the chosen capacitors (measured);
 * - capacitors and board stray: the band over capacitor tolerance and stray uncertainty,
 *   relative to the initial offset (circuit tolerance);
 * - temperature: the measured f(T) of the sample over the operating range, relative to 25 °C,
 *   where the sample has it, else the datasheet stability ± (datasheet);
 * - part-to-part: the datasheet tolerance ± (datasheet): other parts of the type differ from this
 *   sample by up to that much, so the initial offset and this term overlap for this one sample
 *   (the sum is then conservative);
 * - aging: ± where given.
 * Worst case: Σmin … Σmax. Root-sum-square: Σcentre ± √Σ(half-width²), each term taken as an
 * independent spread around its centre.
 */
import type { TemperatureFit } from '../extract/types.ts';

export type BudgetSource = 'measured' | 'measured f(T)' | 'datasheet' | 'circuit tolerance';

export interface BudgetTerm {
  name: string;
  source: BudgetSource;
  minPpm: number;
  maxPpm: number;
  /** How the term was found. */
  note: string;
}

export type BudgetVerdict = 'pass' | 'warn' | 'fail' | 'unknown';

export interface FrequencyBudget {
  terms: BudgetTerm[];
  worstCasePpm: { min: number; max: number };
  rssPpm: { min: number; max: number };
  /** The circuit's requirement (±), ppm. */
  requirementPpm?: number;
  /** pass: worst case inside; warn: only the RSS inside; fail: RSS outside; unknown: no requirement. */
  verdict: BudgetVerdict;
  reason: string;
  /** Causes the budget could not include. */
  missing: string[];
}

export interface BudgetInput {
  offsetPpm: number;
  /** Band of the offset over capacitor tolerance and stray (absolute, includes the offset), ppm. */
  bandPpm: { min: number; max: number };
  capacitorToleranceFraction: number;
  temperature?: TemperatureFit;
  operatingRangeC?: { min: number; max: number };
  stabilityPpm?: number;
  tolerancePpm?: number;
  agingPpm?: number;
  requirementPpm?: number;
}

/** Reference temperature of crystal calibration tolerances, °C (IEC 60122-1). */
export const REFERENCE_TEMPERATURE_C = 25;

function fmt(x: number, digits = 3): string {
  return Number(x.toPrecision(digits)).toString();
}

/** Δf/f of the fitted f(T) at T, relative to its value at 25 °C, ppm (min and max over a range). */
export function temperatureDeviationPpm(
  fit: TemperatureFit,
  rangeC: { min: number; max: number },
): { min: number; max: number } {
  const rel = (t: number) => fit.coeffs.reduce((s, c, i) => s + c * (t - fit.t0C) ** (i + 1), 0) * 1e6;
  const ref = rel(REFERENCE_TEMPERATURE_C);
  let min = Infinity;
  let max = -Infinity;
  const steps = Math.max(1, Math.ceil(rangeC.max - rangeC.min) * 4);
  for (let k = 0; k <= steps; k++) {
    const d = rel(rangeC.min + ((rangeC.max - rangeC.min) * k) / steps) - ref;
    min = Math.min(min, d);
    max = Math.max(max, d);
  }
  return { min, max };
}

/** The budget from its inputs. */
export function frequencyBudget(input: BudgetInput): FrequencyBudget {
  const terms: BudgetTerm[] = [];
  const missing: string[] = [];
  terms.push({
    name: 'initial offset at the chosen capacitors',
    source: 'measured',
    minPpm: input.offsetPpm,
    maxPpm: input.offsetPpm,
    note: 'load resonance of the extracted sample',
  });
  terms.push({
    name: 'capacitor tolerance and board stray',
    source: 'circuit tolerance',
    minPpm: input.bandPpm.min - input.offsetPpm,
    maxPpm: input.bandPpm.max - input.offsetPpm,
    note: `worst-case corners of ±${fmt(input.capacitorToleranceFraction * 100)} % capacitors and the stated stray uncertainties`,
  });
  if (input.temperature) {
    const range = input.operatingRangeC ?? input.temperature.spanRangeC;
    const d = temperatureDeviationPpm(input.temperature, range);
    const which = input.operatingRangeC ? 'datasheet operating range' : 'measured range (no datasheet operating range)';
    terms.push({
      name: 'temperature',
      source: 'measured f(T)',
      minPpm: d.min,
      maxPpm: d.max,
      note: `${input.temperature.form} fit of the sample's f(T), ${fmt(range.min)} to ${fmt(range.max)} °C (${which}), relative to 25 °C`,
    });
  } else if (input.stabilityPpm !== undefined) {
    terms.push({
      name: 'temperature',
      source: 'datasheet',
      minPpm: -input.stabilityPpm,
      maxPpm: input.stabilityPpm,
      note: 'datasheet stability over the operating range',
    });
  } else {
    missing.push('temperature (no measured f(T) and no datasheet stability)');
  }
  if (input.tolerancePpm !== undefined) {
    terms.push({
      name: 'part-to-part (calibration)',
      source: 'datasheet',
      minPpm: -input.tolerancePpm,
      maxPpm: input.tolerancePpm,
      note: 'datasheet tolerance at 25 °C; overlaps the initial offset for this sample',
    });
  } else {
    missing.push('part-to-part spread (no datasheet tolerance)');
  }
  if (input.agingPpm !== undefined) {
    terms.push({
      name: 'aging',
      source: 'datasheet',
      minPpm: -input.agingPpm,
      maxPpm: input.agingPpm,
      note: 'datasheet aging',
    });
  } else {
    missing.push('aging (not given)');
  }

  const worstCasePpm = { min: terms.reduce((s, t) => s + t.minPpm, 0), max: terms.reduce((s, t) => s + t.maxPpm, 0) };
  const centre = terms.reduce((s, t) => s + (t.minPpm + t.maxPpm) / 2, 0);
  const half = Math.sqrt(terms.reduce((s, t) => s + ((t.maxPpm - t.minPpm) / 2) ** 2, 0));
  const rssPpm = { min: centre - half, max: centre + half };
  const req = input.requirementPpm;
  const range = (r: { min: number; max: number }) =>
    `${r.min >= 0 ? '+' : ''}${fmt(r.min)} … ${r.max >= 0 ? '+' : ''}${fmt(r.max)} ppm`;
  const inside = (r: { min: number; max: number }) => req !== undefined && r.min >= -req && r.max <= req;
  let verdict: BudgetVerdict;
  let reason: string;
  if (req === undefined) {
    verdict = 'unknown';
    reason = `worst case ${range(worstCasePpm)}, root-sum-square ${range(rssPpm)}; the circuit states no frequency requirement`;
  } else if (inside(worstCasePpm)) {
    verdict = 'pass';
    reason = `worst case ${range(worstCasePpm)} within the requirement ±${fmt(req)} ppm`;
  } else if (inside(rssPpm)) {
    verdict = 'warn';
    reason = `worst case ${range(worstCasePpm)} exceeds the requirement ±${fmt(req)} ppm; root-sum-square ${range(rssPpm)} is within it`;
  } else {
    verdict = 'fail';
    reason = `root-sum-square ${range(rssPpm)} exceeds the requirement ±${fmt(req)} ppm`;
  }
  if (missing.length) reason += `; not included: ${missing.join(', ')}`;
  return { terms, worstCasePpm, rssPpm, requirementPpm: req, verdict, reason, missing };
}
