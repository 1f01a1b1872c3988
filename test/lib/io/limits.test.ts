/**
 * Decimal text helpers used by the sweep readers and writers (unit scaling on the decimal text,
 * so frequencies in kHz/MHz/GHz read and write back to the same double; common practice).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseScaledDecimal, shiftDecimalText } from '../../../src/lib/io/limits.ts';

describe('decimal scaling', () => {
  it('scales decimal text without binary rounding', () => {
    expect(parseScaledDecimal('32.760', 3)).toBe(32760);
    expect(32.76 * 1e3).not.toBe(32760); // the naive product that the text shift avoids
    expect(parseScaledDecimal('15.915494309189533', 6)).toBe(15915494.309189533);
    expect(parseScaledDecimal('-1.5e-3', 9)).toBe(-1.5e6);
    expect(parseScaledDecimal('2E+2', -3)).toBe(0.2);
  });

  it('moves the decimal point of the shortest form', () => {
    expect(shiftDecimalText(15915494.309189534, -6)).toBe('15.915494309189534');
    expect(shiftDecimalText(1000, -3)).toBe('1');
    expect(shiftDecimalText(32760, -3)).toBe('32.76');
    expect(shiftDecimalText(0.5, -9)).toBe('0.0000000005');
    expect(shiftDecimalText(-12.5, 3)).toBe('-12500');
    expect(shiftDecimalText(0, -9)).toBe('0');
    expect(shiftDecimalText(1e21, -9)).toBe('1e12');
  });

  it('round-trips every finite double through a unit shift', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(0, 3, 6, 9), (x, k) => {
        expect(parseScaledDecimal(shiftDecimalText(x, -k), k)).toBe(Object.is(x, -0) ? 0 : x);
      }),
      { numRuns: 2000 },
    );
  });
});
