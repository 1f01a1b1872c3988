import { describe, expect, it } from 'vitest';
import { formatSi, parseQuantity, parseQuantityRange, type UnitKind } from '../../../src/lib/units/si.ts';

// Expected values are the SI prefix definitions (BIPM SI Brochure, 9th ed., table 7):
// k = 1e3, M = 1e6, G = 1e9, m = 1e-3, µ = 1e-6, n = 1e-9, p = 1e-12, f = 1e-15.

function value(text: string, kind: UnitKind): number {
  const r = parseQuantity(text, kind);
  if (!r.ok) throw new Error(`parse failed: ${r.message}`);
  return r.value;
}

function message(text: string, kind: UnitKind): string {
  const r = parseQuantity(text, kind);
  if (r.ok) throw new Error(`expected a failure for "${text}", got ${r.value}`);
  return r.message;
}

describe('parseQuantity', () => {
  it.each([
    ['12 MHz', 'frequency', 12e6],
    ['12MHz', 'frequency', 12e6],
    ['12e6 Hz', 'frequency', 12e6],
    ['32.768 kHz', 'frequency', 32768],
    ['2 GHz', 'frequency', 2e9],
    ['8 pF', 'capacitance', 8e-12],
    ['10 fF', 'capacitance', 1e-14],
    ['.5 pF', 'capacitance', 5e-13],
    ['80 Ω', 'resistance', 80],
    ['80 ohm', 'resistance', 80],
    ['4.7kΩ', 'resistance', 4700],
    ['1 kohm', 'resistance', 1000],
    ['100 µW', 'power', 1e-4],
    ['100 μW', 'power', 1e-4], // Greek mu U+03BC as well as the micro sign U+00B5
    ['100 uW', 'power', 1e-4],
    ['10 mH', 'inductance', 0.01],
    ['10 ppm', 'ppm', 10],
    ['25 °C', 'temperature', 25],
    ['25 C', 'temperature', 25],
    ['-40 C', 'temperature', -40],
    ['5 mA/V', 'conductance', 0.005],
  ] as Array<[string, UnitKind, number]>)('reads "%s" as a %s of %d in SI base units', (text, kind, expected) => {
    expect(value(text, kind)).toBe(expected);
  });

  it('gives exact decimal values for sub-unit prefixes (100 uW is exactly 1e-4 W)', () => {
    // 100 * 1e-6 is 1.0000000000000002e-4 in binary floating point; dividing by 1e6 is exact.
    expect(value('100 uW', 'power')).toBe(1e-4);
    expect(value('3 pF', 'capacitance')).toBe(3e-12);
  });

  it('reads a bare number as ppm, where ppm is expected', () => {
    expect(value('10', 'ppm')).toBe(10);
  });

  it('refuses a bare number for a dimensional quantity and says a unit is missing', () => {
    expect(message('12', 'frequency')).toBe('expected a frequency such as "12 MHz", got "12" with no unit');
    expect(message('80', 'resistance')).toMatch(/with no unit/);
  });

  it('names both the expected and the found dimension for a wrong unit', () => {
    expect(message('8 pF', 'resistance')).toBe('expected a resistance such as "80 ohm", got "8 pF" (a capacitance)');
    expect(message('12 MHz', 'capacitance')).toBe('expected a capacitance such as "8 pF", got "12 MHz" (a frequency)');
    expect(message('10 ppm', 'power')).toBe('expected a power such as "100 uW", got "10 ppm" (a ppm value)');
    expect(message('25 C', 'frequency')).toMatch(/\(a temperature\)$/);
  });

  it('names an unknown unit', () => {
    expect(message('25 K', 'temperature')).toBe(
      'expected a temperature such as "25 C", got unknown unit "K" in "25 K"',
    );
    expect(message('3 ppb', 'ppm')).toMatch(/unknown unit "ppb"/);
  });

  it('refuses text that is not a number', () => {
    expect(message('abc', 'frequency')).toBe('expected a frequency such as "12 MHz", got "abc"');
    expect(message('', 'frequency')).toMatch(/got ""/);
    expect(message('Infinity Hz', 'frequency')).toMatch(/expected a frequency/);
  });

  it('refuses a number that overflows to infinity', () => {
    expect(message('1e400 Hz', 'frequency')).toBe('expected a finite number, got "1e400 Hz"');
  });

  it('reads "mhz" as megahertz and refuses "mHz" as ambiguous', () => {
    // common practice: Touchstone (IBIS spec v2.0) takes units case-insensitively, so "mhz" means MHz there.
    expect(value('12 mhz', 'frequency')).toBe(12e6);
    expect(message('12 mHz', 'frequency')).toBe(
      'expected a frequency such as "12 MHz", got ambiguous unit "mHz" in "12 mHz" (write MHz for megahertz)',
    );
  });

  it('keeps prefix case: m is milli and M is mega', () => {
    expect(value('1 mF', 'capacitance')).toBe(1e-3);
    expect(value('1 MOhm', 'resistance')).toBe(1e6);
    expect(value('1 mohm', 'resistance')).toBe(1e-3);
  });

  it('refuses prefixes on units that take none (°C, ppm)', () => {
    expect(message('25 mC', 'temperature')).toMatch(/unknown unit "mC"/);
    expect(message('10 kppm', 'ppm')).toMatch(/unknown unit "kppm"/);
  });
});

describe('parseQuantityRange', () => {
  it.each([
    ['-40 to 85 C', -40, 85],
    ['-40 C to 85 C', -40, 85],
    ['-40..85 C', -40, 85],
    ['-40 … 85 °C', -40, 85],
    ['0 to 70 C', 0, 70],
  ])('reads "%s" as %d to %d °C', (text, min, max) => {
    expect(parseQuantityRange(text, 'temperature')).toEqual({ ok: true, min, max });
  });

  it('refuses a range with the bounds reversed', () => {
    expect(parseQuantityRange('85 to -40 C', 'temperature')).toEqual({
      ok: false,
      message: 'expected the lower bound first, got "85 to -40 C"',
    });
  });

  it('refuses a range without a unit', () => {
    expect(parseQuantityRange('-40 to 85', 'temperature')).toEqual({
      ok: false,
      message: 'expected a temperature such as "25 C", got "85" with no unit',
    });
  });

  it('names the unit of a range in the wrong dimension', () => {
    const r = parseQuantityRange('-40 to 85 F', 'temperature');
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/\(a capacitance\)/);
  });

  it('refuses text that is not a range', () => {
    expect(parseQuantityRange('-40 - 85 C', 'temperature')).toEqual({
      ok: false,
      message: 'expected a range such as "-40 to 85 C", got "-40 - 85 C"',
    });
  });
});

describe('formatSi', () => {
  it.each([
    [12e6, 'Hz', '12 MHz'],
    [8e-12, 'F', '8 pF'],
    [80, 'Ω', '80 Ω'],
    [1e-4, 'W', '100 µW'],
    [0.00987, 'H', '9.87 mH'],
    [1.7822e-14, 'F', '17.82 fF'],
    [-3e-12, 'F', '-3 pF'],
    [0, 'F', '0 F'],
  ])('formats %d %s as "%s"', (v, unit, text) => {
    expect(formatSi(v, unit)).toBe(text);
  });

  it('rounds to the requested significant digits', () => {
    // reference resonator X1 (L1 10 mH, C1 10 fF): fs = 15 915 494.309 Hz
    expect(formatSi(15915494.309, 'Hz')).toBe('15.92 MHz');
    expect(formatSi(15915494.309, 'Hz', 6)).toBe('15.9155 MHz');
    expect(formatSi(32768, 'Hz', 5)).toBe('32.768 kHz');
  });

  it('moves to the next prefix when rounding reaches 1000', () => {
    expect(formatSi(999999, 'Hz')).toBe('1 MHz');
    expect(formatSi(999999, 'Hz', 6)).toBe('999.999 kHz');
  });

  it('keeps trailing zeros only when asked', () => {
    expect(formatSi(12e6, 'Hz', 4, true)).toBe('12.00 MHz');
    expect(formatSi(8e-12, 'F', 3, true)).toBe('8.00 pF');
  });

  it('shows a dash for a value that is not finite, never NaN', () => {
    expect(formatSi(Number.NaN, 'F')).toBe('— F');
    expect(formatSi(Number.POSITIVE_INFINITY, 'Hz')).toBe('— Hz');
  });

  it('round-trips through parseQuantity for plain values', () => {
    for (const [v, unit, kind] of [
      [12e6, 'Hz', 'frequency'],
      [8e-12, 'F', 'capacitance'],
      [1e-4, 'W', 'power'],
      [4.7e3, 'Ω', 'resistance'],
    ] as Array<[number, string, UnitKind]>) {
      expect(value(formatSi(v, unit), kind) / v).toBeCloseTo(1, 12);
    }
  });
});
