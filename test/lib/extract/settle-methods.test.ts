/**
 * Settling one quantity between methods (src/lib/extract/settle-methods.ts): a method whose
 * assumptions fail is shown with its reason (`notCredible`) but does not vote and does not move
 * the published value; credible methods that still disagree widen the published standard
 * uncertainty by a rectangular distribution of half-width Δ, the largest difference from the
 * published value: u' = √(u² + Δ²/3). Source: ISO/IEC Guide 98-3 (GUM) 4.3.7 (a quantity known
 * only to lie within ±a has variance a²/3) combined in quadrature with u as uncorrelated
 * components (GUM 5.1.2). Agreement rule (cross-check.ts): within 3 combined standard
 * uncertainties or the quantity's tolerance (r1Ohm 1 %).
 */
import { describe, expect, it } from 'vitest';
import { settleQuantity, type Credibility } from '../../../src/lib/extract/settle-methods.ts';
import type { MethodName, MethodValue } from '../../../src/lib/extract/types.ts';

const allCredible: Credibility = () => undefined;
const notSeen = 'the anti-resonance is not seen above the noise';
const except =
  (...bad: MethodName[]): Credibility =>
  (m) =>
    bad.includes(m) ? notSeen : undefined;

describe('settleQuantity', () => {
  it('no values: nothing to settle', () => {
    expect(settleQuantity('r1Ohm', [], allCredible, 'x')).toBeUndefined();
  });

  it('a non-credible method is listed with its reason and does not vote', () => {
    const values: MethodValue[] = [
      { method: 'complex-fit', value: 20, uncertainty: 0.05 },
      { method: 'closed-form', value: 30, uncertainty: 0.1 },
    ];
    const s = settleQuantity('r1Ohm', values, except('closed-form'), 'cause')!;
    expect(s.value).toBe(20);
    expect(s.method).toBe('complex-fit');
    expect(s.uncertainty).toBe(0.05); // not widened: 30 Ω does not count
    expect(s.check.verdict).toBe('single');
    expect(s.check.message).toBeUndefined();
    expect(s.check.values.map((v) => v.method)).toEqual(['complex-fit', 'closed-form']);
    expect(s.check.values[0].notCredible).toBeUndefined();
    expect(s.check.values[1]).toMatchObject({ method: 'closed-form', value: 30, notCredible: notSeen });
    // the same values, both credible: they disagree and the uncertainty is widened by Δ = 10 Ω
    const both = settleQuantity('r1Ohm', values, allCredible, 'cause')!;
    expect(both.check.verdict).toBe('disagree');
    expect(both.uncertainty).toBeCloseTo(Math.sqrt(0.05 ** 2 + 100 / 3), 12);
  });

  it('a non-credible preferred method gives way to the first credible one', () => {
    const values: MethodValue[] = [
      { method: 'closed-form', value: 30, uncertainty: 0.1 },
      { method: 'complex-fit', value: 20, uncertainty: 0.05 },
      { method: 'half-power', value: 20.1, uncertainty: 0.05 },
    ];
    const s = settleQuantity('r1Ohm', values, except('closed-form'), 'cause')!;
    expect(s.method).toBe('complex-fit');
    expect(s.value).toBe(20);
    expect(s.uncertainty).toBe(0.05);
    expect(s.check.verdict).toBe('agree'); // 0.1 Ω ≤ 3·√(0.05² + 0.05²) = 0.21 Ω
    expect(s.check.values.find((v) => v.method === 'closed-form')?.notCredible).toBe(notSeen);
  });

  it('when no method is credible, the preferred one is published alone, still marked', () => {
    const values: MethodValue[] = [
      { method: 'conductance-peak', value: 21, uncertainty: 0.2 },
      { method: 'half-power', value: 25, uncertainty: 0.2 },
    ];
    const s = settleQuantity('r1Ohm', values, except('conductance-peak', 'half-power'), 'cause')!;
    expect(s.method).toBe('conductance-peak');
    expect(s.value).toBe(21);
    expect(s.uncertainty).toBe(0.2);
    expect(s.check.verdict).toBe('single');
    expect(s.check.values).toHaveLength(2);
    expect(s.check.values.every((v) => v.notCredible === notSeen)).toBe(true);
  });

  it('credible methods that disagree widen u to √(u² + Δ²/3), Δ the largest difference (GUM 4.3.7)', () => {
    const values: MethodValue[] = [
      { method: 'complex-fit', value: 20, uncertainty: 0.05 },
      { method: 'half-power', value: 20.5, uncertainty: 0.05 }, // 0.5 Ω > 0.21 Ω and > 1 %: disagrees
      { method: 'conductance-peak', value: 19, uncertainty: 0.1 }, // Δ = 1 Ω
      { method: 'closed-form', value: 40, uncertainty: 0.1 }, // not credible: not in Δ
    ];
    const s = settleQuantity('r1Ohm', values, except('closed-form'), 'too few points across the resonance')!;
    expect(s.check.verdict).toBe('disagree');
    expect(s.value).toBe(20);
    expect(s.method).toBe('complex-fit');
    // √(0.05² + 1²/3) = √(0.0025 + 0.333…) = 0.579511…
    expect(s.uncertainty).toBeCloseTo(0.5795113, 6);
    expect(s.check.message).toMatch(/too few points across the resonance/);
    expect(s.check.message).toMatch(/complex-fit kept, its uncertainty widened to 0\.58 to cover them/);
    // every credible method lies within √3·u of the published value (u ≥ Δ/√3)
    for (const v of s.check.values.filter((x) => !x.notCredible)) {
      expect(Math.abs(v.value - s.value)).toBeLessThanOrEqual(Math.sqrt(3) * s.uncertainty);
    }
    expect(s.check.values.map((v) => v.method)).toEqual([
      'complex-fit',
      'half-power',
      'conductance-peak',
      'closed-form',
    ]);
  });

  it('credible methods that agree leave the uncertainty alone', () => {
    const values: MethodValue[] = [
      { method: 'complex-fit', value: 20, uncertainty: 0.05 },
      { method: 'half-power', value: 20.15, uncertainty: 0.05 }, // within 1 % (0.2 Ω)
    ];
    const s = settleQuantity('r1Ohm', values, allCredible, 'cause')!;
    expect(s.check.verdict).toBe('agree');
    expect(s.uncertainty).toBe(0.05);
  });

  it("a published method without an uncertainty inherits the preferred one's, then widens", () => {
    const values: MethodValue[] = [
      { method: 'closed-form', value: 20.02, uncertainty: 0.3 }, // preferred, but not credible
      { method: 'conductance-peak', value: 20 }, // no uncertainty of its own
      { method: 'half-power', value: 22 }, // 10 % off: disagrees (no u, beyond 1 %)
    ];
    const s = settleQuantity('r1Ohm', values, except('closed-form'), 'cause')!;
    expect(s.method).toBe('conductance-peak');
    expect(s.check.verdict).toBe('disagree');
    expect(s.uncertainty).toBeCloseTo(Math.sqrt(0.3 ** 2 + 4 / 3), 12);
    const agree = settleQuantity('r1Ohm', values.slice(0, 2), except('closed-form'), 'cause')!;
    expect(agree.uncertainty).toBe(0.3);
  });

  it('fsHz: a 1 ppm tolerance; a 3 ppm disagreement of credible methods widens by Δ/√3', () => {
    const fs = 16e6;
    const values: MethodValue[] = [
      { method: 'joint-fit', value: fs, uncertainty: 1 },
      { method: 'conductance-peak', value: fs + 48, uncertainty: 2 }, // 3 ppm: > 1 ppm and > 3·√5 Hz
    ];
    const s = settleQuantity('fsHz', values, allCredible, 'cause')!;
    expect(s.check.verdict).toBe('disagree');
    expect(s.uncertainty).toBeCloseTo(Math.sqrt(1 + 48 ** 2 / 3), 9); // 27.73 Hz
  });
});
