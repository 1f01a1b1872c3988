/**
 * The frequency budget against worked examples written out here with their arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { frequencyBudget, temperatureDeviationPpm } from '../../../src/lib/osc/frequency-budget.ts';
import type { TemperatureFit } from '../../../src/lib/extract/types.ts';

describe('frequency budget: worked example (our own)', () => {
  // A part at +3.0 ppm with the chosen capacitors; the tolerance band of the capacitors and strays
  // is −1.0 … +6.2 ppm (absolute), so that term is −1.0 − 3.0 = −4.0 … +6.2 − 3.0 = +3.2 ppm.
  // Datasheet: stability ±10 ppm, tolerance ±10 ppm, aging ±3 ppm.
  // Worst case: min = 3.0 − 4.0 − 10 − 10 − 3 = −24.0 ppm; max = 3.0 + 3.2 + 10 + 10 + 3 = +29.2 ppm.
  // RSS: centres 3.0 + (−4.0 + 3.2)/2 + 0 + 0 + 0 = 2.6 ppm;
  //      half-widths 0, 3.6, 10, 10, 3: √(0 + 12.96 + 100 + 100 + 9) = √221.96 = 14.8983 ppm;
  //      2.6 ± 14.8983 = −12.2983 … +17.4983 ppm.
  const input = {
    offsetPpm: 3.0,
    bandPpm: { min: -1.0, max: 6.2 },
    capacitorToleranceFraction: 0.05,
    stabilityPpm: 10,
    tolerancePpm: 10,
    agingPpm: 3,
  };

  it('sums worst case and root-sum-square as written out', () => {
    const b = frequencyBudget({ ...input, requirementPpm: 30 });
    expect(b.terms.map((t) => t.source)).toEqual([
      'measured',
      'circuit tolerance',
      'datasheet',
      'datasheet',
      'datasheet',
    ]);
    expect(b.terms[1].minPpm).toBeCloseTo(-4.0, 12);
    expect(b.terms[1].maxPpm).toBeCloseTo(3.2, 12);
    expect(b.worstCasePpm.min).toBeCloseTo(-24.0, 12);
    expect(b.worstCasePpm.max).toBeCloseTo(29.2, 12);
    expect(b.rssPpm.min).toBeCloseTo(2.6 - Math.sqrt(221.96), 12);
    expect(b.rssPpm.max).toBeCloseTo(17.4983, 3);
    expect(b.missing).toEqual([]);
  });

  it('verdicts: ±30 ppm passes (worst case inside), ±25 ppm warns (only RSS inside), ±15 ppm fails (RSS outside), none: unknown', () => {
    expect(frequencyBudget({ ...input, requirementPpm: 30 }).verdict).toBe('pass');
    expect(frequencyBudget({ ...input, requirementPpm: 25 }).verdict).toBe('warn');
    expect(frequencyBudget({ ...input, requirementPpm: 15 }).verdict).toBe('fail');
    expect(frequencyBudget(input).verdict).toBe('unknown');
  });

  it('names what it could not include', () => {
    const b = frequencyBudget({
      offsetPpm: 1,
      bandPpm: { min: 0, max: 2 },
      capacitorToleranceFraction: 0.1,
      requirementPpm: 50,
    });
    expect(b.missing.length).toBe(3);
    expect(b.reason).toMatch(/not included: temperature/);
  });
});

describe('temperature term from a measured f(T)', () => {
  // A tuning fork's parabola, Δf/f = −0.034 ppm/°C² · (T − 25 °C)² (the usual fork coefficient,
  // from memory). Over −40 … 85 °C: at −40 °C −0.034 · 65² = −143.65 ppm; at 85 °C −0.034 · 60² =
  // −122.4 ppm; at 25 °C 0. So the term is −143.65 … 0 ppm.
  const fit: TemperatureFit = {
    form: 'parabola',
    t0C: 25,
    f0Hz: 32768,
    coeffs: [0, -0.034e-6],
    turnoverC: [25],
    spanPpm: 143.65,
    spanRangeC: { min: -40, max: 85 },
    points: [],
    rmsResidualPpm: 0,
  };

  it('takes the deviation from 25 °C over the operating range', () => {
    const d = temperatureDeviationPpm(fit, { min: -40, max: 85 });
    expect(d.min).toBeCloseTo(-143.65, 9);
    expect(d.max).toBeCloseTo(0, 12);
  });

  it('measured f(T) wins over the datasheet stability', () => {
    const b = frequencyBudget({
      offsetPpm: 0,
      bandPpm: { min: 0, max: 0 },
      capacitorToleranceFraction: 0.05,
      temperature: fit,
      operatingRangeC: { min: -40, max: 85 },
      stabilityPpm: 5,
    });
    const t = b.terms.find((x) => x.name === 'temperature')!;
    expect(t.source).toBe('measured f(T)');
    expect(t.minPpm).toBeCloseTo(-143.65, 9);
  });

  it('a fit referenced away from 25 °C is re-referenced to 25 °C', () => {
    // same parabola written about t0 = 0 °C: −0.034(T − 25)² = −0.034(T² − 50T + 625) → with u = T − 0:
    // Δ(u) = 1.7e-6·u − 0.034e-6·u² (the constant −21.25 ppm drops out when referenced to 25 °C)
    const shifted: TemperatureFit = { ...fit, t0C: 0, coeffs: [1.7e-6, -0.034e-6] };
    const d = temperatureDeviationPpm(shifted, { min: -40, max: 85 });
    expect(d.min).toBeCloseTo(-143.65, 9);
    expect(d.max).toBeCloseTo(0, 9);
  });
});
