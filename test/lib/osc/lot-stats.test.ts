import { describe, expect, it } from 'vitest';
import { lotStatistics, median } from '../../../src/lib/osc/lot-stats.ts';
import { X1 } from '../models/spice-cases.ts';
import { sampleOf } from './sample-fixtures.ts';

const x1 = X1.branches[0];
const lot = (r1s: number[]) =>
  r1s.map((r, i) => sampleOf(`S${i + 1}`, { c0F: X1.c0F, branches: [{ ...x1, r1Ohm: r }] }));

describe('lot statistics', () => {
  it('gives n, mean, sample standard deviation, min, max and median per parameter', () => {
    const s = lotStatistics(lot([20, 21, 19, 20.5, 22]));
    const r1 = s.parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(r1.n).toBe(5);
    expect(r1.mean).toBeCloseTo(20.5, 12);
    // (n − 1) form: deviations −0.5, 0.5, −1.5, 0, 1.5 → Σd² = 5 → √(5/4).
    expect(r1.std).toBeCloseTo(Math.sqrt(5 / 4), 12);
    expect([r1.min, r1.max, r1.median]).toEqual([19, 22, 20.5]);
    expect(r1.outliers).toEqual([]);
  });

  it('flags a value more than 3.5·1.4826·MAD from the median (modified z-score)', () => {
    // median 20.5, |d| = 0.5 0.5 1.5 0 19.5 → MAD 0.5, threshold 3.5·1.4826·0.5 = 2.59 Ω.
    const r1 = lotStatistics(lot([20, 21, 19, 20.5, 40])).parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(r1.mad).toBe(0.5);
    expect(r1.outliers.map((o) => o.sample)).toEqual(['S5']);
    expect(r1.outliers[0].score).toBeCloseTo(19.5 / (1.4826 * 0.5), 9);
    // 19 is 1.5 Ω away: inside the threshold.
    const edge = lotStatistics(lot([20, 21, 19, 20.5, 23.1])).parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(edge.outliers.map((o) => o.sample)).toEqual(['S5']);
    const inside = lotStatistics(lot([20, 21, 19, 20.5, 23.0])).parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(inside.outliers).toEqual([]);
  });

  it('makes no outlier test below three samples and says so', () => {
    const s = lotStatistics(lot([20, 40]));
    const r1 = s.parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(r1.outliers).toEqual([]);
    expect(r1.note).toBe('no outlier test with 2 samples (needs 3)');
    expect(s.notes.join(' ')).toMatch(/too few for an outlier test/);
    expect(lotStatistics(lot([20])).parameters[0].std).toBeUndefined();
  });

  it('makes no outlier test when more than half the values are equal (MAD = 0)', () => {
    const r1 = lotStatistics(lot([20, 20, 20, 25])).parameters.find((p) => p.parameter === 'r1Ohm')!;
    expect(r1.note).toMatch(/median absolute deviation is zero/);
  });

  it('includes the frequency at the datasheet load capacitance (mpmath check value: 15 922 728.295 Hz at 8 pF)', () => {
    const s = lotStatistics(lot([20, 20, 20]), { loadCapacitanceF: 8e-12 });
    const f = s.parameters.find((p) => p.parameter === 'loadFreqHz')!;
    expect(f.median).toBeCloseTo(15922728.295, 3);
    expect(s.loadBasis).toBe('load resonance with R1 at CL 8 pF');
  });

  it('takes the mean of the middle two as the median of an even count', () => {
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([7])).toBe(7);
  });
});
