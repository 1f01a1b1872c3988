/**
 * Statistics of a part's samples (the lot): n, mean, standard deviation (n − 1), min, max and
 * median of the main mode's fs, R1, C1, L1, Q, of C0 and of the frequency at the datasheet load,
 * with outliers flagged by a robust rule.
 *
 * Outlier rule (modified z-score, Iglewicz & Hoaglin 1993): a value is an outlier when
 * |x − median| > 3.5 · 1.4826 · MAD, MAD = median |x − median| (1.4826·MAD estimates σ for
 * normal data). With fewer than {@link MIN_OUTLIER_N} samples no test is made; when MAD is zero
 * (more than half the values equal) no test is made either — both say so in `note`.
 */
import type { Datasheet } from '../schema/part.ts';
import type { SampleResult } from '../extract/types.ts';
import { frequencyAtDatasheetLoad } from './compliance.ts';

/** Parameters summarised per lot. */
export const LOT_PARAMETERS = ['fsHz', 'r1Ohm', 'c1F', 'l1H', 'c0F', 'q', 'loadFreqHz'] as const;
export type LotParameter = (typeof LOT_PARAMETERS)[number];

/** Fewest samples for an outlier test. */
export const MIN_OUTLIER_N = 3;
/** Threshold on the modified z-score. */
export const OUTLIER_THRESHOLD = 3.5;
/** 1.4826 · MAD estimates the standard deviation of normal data. */
export const MAD_TO_SIGMA = 1.4826;

export interface LotOutlier {
  sample: string;
  value: number;
  /** |x − median| / (1.4826·MAD). */
  score: number;
}

export interface ParameterStats {
  parameter: LotParameter;
  n: number;
  mean: number;
  /** Sample standard deviation (n − 1); absent for n = 1. */
  std?: number;
  min: number;
  max: number;
  median: number;
  /** Median absolute deviation; absent when no test was made for lack of samples. */
  mad?: number;
  outliers: LotOutlier[];
  /** Why no outlier test was made, if so. */
  note?: string;
}

export interface LotStatistics {
  /** Samples with a main mode. */
  n: number;
  /** Parameters with at least one value. */
  parameters: ParameterStats[];
  /** What frequency loadFreqHz is (e.g. "load resonance with R1 at CL 8 pF"). */
  loadBasis?: string;
  /** The rule stated for display. */
  outlierRule: string;
  notes: string[];
}

/** Median of a non-empty list (mean of the middle two for even length). */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

function summarise(parameter: LotParameter, rows: Array<{ sample: string; value: number }>): ParameterStats {
  const values = rows.map((r) => r.value);
  const n = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const std = n > 1 ? Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (n - 1)) : undefined;
  const med = median(values);
  const stats: ParameterStats = {
    parameter,
    n,
    mean,
    std,
    min: Math.min(...values),
    max: Math.max(...values),
    median: med,
    outliers: [],
  };
  if (n < MIN_OUTLIER_N) {
    stats.note = `no outlier test with ${n} sample${n === 1 ? '' : 's'} (needs ${MIN_OUTLIER_N})`;
    return stats;
  }
  const mad = median(values.map((v) => Math.abs(v - med)));
  stats.mad = mad;
  if (!(mad > 0)) {
    stats.note = 'no outlier test: median absolute deviation is zero (more than half the values equal)';
    return stats;
  }
  const scale = MAD_TO_SIGMA * mad;
  for (const r of rows) {
    const score = Math.abs(r.value - med) / scale;
    if (score > OUTLIER_THRESHOLD) stats.outliers.push({ sample: r.sample, value: r.value, score });
  }
  return stats;
}

/** Lot statistics over a part's samples (the main mode each sample's extraction recorded). */
export function lotStatistics(
  samples: Array<Pick<SampleResult, 'sample' | 'c0F' | 'modes' | 'mainMode'>>,
  datasheet: Datasheet = {},
): LotStatistics {
  const rows = new Map<LotParameter, Array<{ sample: string; value: number }>>(LOT_PARAMETERS.map((p) => [p, []]));
  const notes: string[] = [];
  let n = 0;
  let loadBasis: string | undefined;
  for (const s of samples) {
    const main = s.mainMode;
    const m = s.modes[main.index];
    if (!m) {
      notes.push(`sample ${s.sample}: no modes, left out`);
      continue;
    }
    n++;
    const push = (p: LotParameter, v: number) => {
      if (Number.isFinite(v)) rows.get(p)!.push({ sample: s.sample, value: v });
    };
    push('fsHz', m.fsHz);
    push('r1Ohm', m.r1Ohm);
    push('c1F', m.c1F);
    push('l1H', m.l1H);
    push('c0F', s.c0F);
    push('q', m.q);
    const f = frequencyAtDatasheetLoad(s, main.index, datasheet.loadCapacitanceF);
    if ('freqHz' in f) {
      push('loadFreqHz', f.freqHz);
      loadBasis ??= f.basis.replace(/ \(.*\)$/, '');
    }
  }
  const parameters = LOT_PARAMETERS.filter((p) => rows.get(p)!.length > 0).map((p) => summarise(p, rows.get(p)!));
  if (n < MIN_OUTLIER_N)
    notes.push(`${n} sample${n === 1 ? '' : 's'}: too few for an outlier test (needs ${MIN_OUTLIER_N})`);
  return {
    n,
    parameters,
    loadBasis,
    outlierRule: `outlier when |x − median| > ${OUTLIER_THRESHOLD} · ${MAD_TO_SIGMA} · MAD (modified z-score, Iglewicz & Hoaglin); no test below ${MIN_OUTLIER_N} samples`,
    notes,
  };
}
