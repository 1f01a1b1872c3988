import { describe, expect, it } from 'vitest';
import { crossCheck } from '../../../src/lib/extract/cross-check.ts';

describe('crossCheck', () => {
  it('agrees within three combined standard uncertainties', () => {
    const c = crossCheck('r1Ohm', [
      { method: 'joint-fit', value: 20.0, uncertainty: 0.3 },
      { method: 'conductance-peak', value: 21.2, uncertainty: 0.4 }, // 1.2 < 3·0.5 = 1.5
    ]);
    expect(c.verdict).toBe('agree');
    expect(c.rule).toBe('within 3 combined standard uncertainties or 1 %');
  });

  it('agrees within the stated tolerance when the uncertainties are tiny', () => {
    const c = crossCheck('fsHz', [
      { method: 'joint-fit', value: 16e6, uncertainty: 0.001 },
      { method: 'half-power', value: 16e6 + 10 }, // 0.625 ppm < 1 ppm
    ]);
    expect(c.verdict).toBe('agree');
  });

  it('disagrees beyond both, naming the methods, the size and the likely cause', () => {
    const c = crossCheck(
      'c1F',
      [
        { method: 'joint-fit', value: 10e-15, uncertainty: 1e-18 },
        { method: 'half-power', value: 10.05e-15 },
        { method: 'load-shift', value: 10.5e-15, note: 'cl10.s1p' },
      ],
      "the added capacitor's value",
    );
    expect(c.verdict).toBe('disagree');
    expect(c.message).toBe(
      "c1F: load-shift 10.500 fF differs from joint-fit 10.000 fF by 5.00 %; likely cause: the added capacitor's value",
    );
  });

  it('reports a single method as such and drops non-finite values', () => {
    const c = crossCheck('c0F', [
      { method: 'capacitive-region', value: 3e-12 },
      { method: 'two-load', value: NaN },
    ]);
    expect(c.verdict).toBe('single');
    expect(c.values).toHaveLength(1);
  });
});
