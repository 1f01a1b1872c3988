import { describe, expect, it } from 'vitest';
import { formatMeasured, measuredCells, roundMeasured } from '../../../src/lib/units/measured.ts';

// Check values: JCGM 100:2008 (GUM), quoted from memory (the text was not at hand to re-read).
// §7.2.2 reports one result, m_S = 100.021 47 g with u_c = 0.35 mg, in four ways: (1) the value
// with "u_c = 0.35 mg"; (2) the concise form 100.021 47(35) g, the parentheses holding u_c in
// units of the last digits; (3) 100.021 47(0.000 35) g, u_c in the unit of the value; (4)
// (100.021 47 ± 0.000 35) g, which the GUM advises against for a standard uncertainty.
// §7.2.6: u_c at most two significant digits; y = 10.057 62 Ω with u_c = 27 mΩ is rounded to
// 10.058 Ω. The GUM groups digits in threes with a thin space; the project prints them ungrouped.

describe('GUM rounding of a measured value (JCGM 100:2008 §7.2.2, §7.2.6)', () => {
  it('writes the §7.2.2 result in the concise form, value and uncertainty in one unit', () => {
    expect(formatMeasured(100.02147, 0.35e-3, 'g', { prefixed: false })).toBe('100.02147(35) g');
    const r = roundMeasured(100.02147, 0.35e-3, false)!;
    // Form 3: u in the unit of the value, to the same decimal place.
    expect(r.value).toBe('100.02147');
    expect(r.uncertainty).toBe('0.00035');
    expect(r.lastDigits).toBe(35n);
  });

  it('rounds the value to the decimal place of a two-digit uncertainty (§7.2.6: 10.057 62 Ω, 27 mΩ → 10.058 Ω)', () => {
    expect(formatMeasured(10.05762, 0.027, 'Ω')).toBe('10.058(27) Ω');
    expect(roundMeasured(10.05762, 0.027)!.value).toBe('10.058');
  });

  it('keeps at most two significant digits of u, rounding to nearest and carrying into the next place', () => {
    // The example: 25.79883 Ω with u = 955 µΩ, printed "25.79883 Ω ± 955 µΩ" before.
    expect(formatMeasured(25.798834, 955e-6, 'Ω')).toBe('25.79883(96) Ω');
    // 0.0999 rounds to 0.10: two significant digits, one decimal place fewer.
    expect(formatMeasured(1.23456, 0.0999, 'V')).toBe('1.23(10) V');
    // A trailing zero of the value is significant and kept.
    expect(formatMeasured(25.7988, 0.001, 'Ω')).toBe('25.7988(10) Ω');
  });

  it('picks one SI prefix for the pair', () => {
    expect(formatMeasured(11995583.026026836, 0.0024335, 'Hz')).toBe('11.9955830260(24) MHz');
    expect(formatMeasured(7.500076231e-15, 3.6306e-20, 'F')).toBe('7.500076(36) fF');
    expect(formatMeasured(0.02347101460377273, 1.1361728841757409e-7, 'H')).toBe('23.47101(11) mH');
  });

  it('shows u across the decimal point in the unit of the value (u ≥ 1 in the last place)', () => {
    expect(formatMeasured(1234.5678, 1.234, 'Ω')).toBe('1.2346(12) kΩ');
    expect(formatMeasured(63179.38, 1.645, '', { prefixed: false })).toBe('63179.4(1.6)');
    expect(formatMeasured(63179.38, 164.5, '', { prefixed: false })).toBe('63180(160)');
  });

  it('handles u ≥ |value| by moving to the prefix where both carry decimals', () => {
    expect(formatMeasured(0.3e-3, 0.5e-3, 'Ω')).toBe('0.30(50) mΩ');
    expect(formatMeasured(2, 15, 'Ω')).toBe('2(15) Ω');
    expect(formatMeasured(0, 0.012, 'V')).toBe('0(12) mV');
  });

  it('states no uncertainty when u is zero, absent or not finite, and prints a dash for a missing value', () => {
    expect(roundMeasured(12e6, 0)).toBeUndefined();
    expect(formatMeasured(12e6, 0, 'Hz')).toBe('12 MHz');
    expect(formatMeasured(11.99965, undefined, 'Hz', { fallbackDigits: 4 })).toBe('12 Hz');
    expect(formatMeasured(12e6, Number.NaN, 'Hz')).toBe('12 MHz');
    expect(formatMeasured(undefined, 1, 'Hz')).toBe('—');
    expect(formatMeasured(Number.NaN, 1, 'Hz')).toBe('—');
  });

  it('keeps the sign of negative values, with the minus sign asked for', () => {
    expect(formatMeasured(-12.34567, 0.012, 'ppm', { prefixed: false })).toBe('-12.346(12) ppm');
    expect(formatMeasured(-12.34567, 0.012, 'ppm', { prefixed: false, minus: '−' })).toBe('−12.346(12) ppm');
    expect(formatMeasured(-0.0004, 0.012, 'ppm', { prefixed: false })).toBe('0.000(12) ppm');
  });

  it('writes ppm values unprefixed', () => {
    expect(formatMeasured(3.14159, 0.27, 'ppm', { prefixed: false })).toBe('3.14(27) ppm');
    expect(formatMeasured(1520, 35, 'ppm', { prefixed: false })).toBe('1520(35) ppm');
  });

  it('gives CSV cells in SI base units rounded together, full precision when u is absent', () => {
    expect(measuredCells(100.02147, 0.35e-3)).toEqual(['100.02147', '0.00035']);
    expect(measuredCells(11995583.026026836, 0.0024335)).toEqual(['11995583.0260', '0.0024']);
    expect(measuredCells(7.500076231e-15, 3.6306e-20)).toEqual(['7.500076e-15', '3.6e-20']);
    expect(measuredCells(25.798834, undefined)).toEqual(['25.798834', '']);
    expect(Number(measuredCells(2.1000038202009046e-12, 4.2337108411066e-18)[0])).toBe(2.1000038e-12);
  });
});
