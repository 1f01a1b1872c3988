import { describe, expect, it } from 'vitest';
import { E_SERIES, nearestPreferred, preferredNeighbours, preferredRange } from '../../../src/lib/osc/e-series.ts';

// IEC 60063:2015 values (cross-checked against public tables).
const IEC_60063 = {
  E6: '1.0 1.5 2.2 3.3 4.7 6.8',
  E12: '1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2',
  E24: '1.0 1.1 1.2 1.3 1.5 1.6 1.8 2.0 2.2 2.4 2.7 3.0 3.3 3.6 3.9 4.3 4.7 5.1 5.6 6.2 6.8 7.5 8.2 9.1',
};

describe('E-series tables', () => {
  for (const [name, list] of Object.entries(IEC_60063)) {
    it(`${name} holds exactly the IEC 60063 values`, () => {
      expect(E_SERIES[name as keyof typeof E_SERIES]).toEqual(list.split(' ').map(Number));
    });
  }

  it('differs from round(10^(i/n), 1) where the historical rounding of IEC 60063 does', () => {
    const formula = (n: number) => Array.from({ length: n }, (_, i) => Math.round(10 ** (i / n) * 10) / 10);
    const diff = (n: number, table: readonly number[]) => table.filter((v, i) => v !== formula(n)[i]);
    expect(diff(24, E_SERIES.E24)).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
    expect(diff(12, E_SERIES.E12)).toEqual([2.7, 3.3, 3.9, 4.7, 8.2]);
    expect(diff(6, E_SERIES.E6)).toEqual([3.3, 4.7]);
  });
});

describe('nearest preferred value (by |ln|, boundaries at geometric means)', () => {
  it('picks 12 for 11 in E12 although 10 and 12 tie linearly (boundary 10.954)', () => {
    expect(nearestPreferred(11, 'E12')).toBe(12);
    expect(nearestPreferred(10.95, 'E12')).toBe(10);
    expect(nearestPreferred(10.96, 'E12')).toBe(12);
  });
  it('picks 4.7 for 4.0 in E6 (boundary 3.938)', () => {
    expect(nearestPreferred(4.0, 'E6')).toBe(4.7);
    expect(nearestPreferred(3.93, 'E6')).toBe(3.3);
  });
  it('picks 2.7 for 2.45 in E12 (boundary 2.437)', () => {
    expect(nearestPreferred(2.45, 'E12')).toBe(2.7);
    expect(nearestPreferred(2.43, 'E12')).toBe(2.2);
  });
  it('wraps the decade: E24 9.6 → 10 and 9.5 → 9.1 (boundary 9.539); E12 above 9.055 → 10', () => {
    expect(nearestPreferred(9.6, 'E24')).toBe(10);
    expect(nearestPreferred(9.5, 'E24')).toBe(9.1);
    expect(nearestPreferred(9.06, 'E12')).toBe(10);
    expect(nearestPreferred(9.05, 'E12')).toBe(8.2);
  });
  it('works in farads and returns clean doubles', () => {
    expect(nearestPreferred(11e-12, 'E12')).toBe(12e-12);
    expect(nearestPreferred(2.45e-12, 'E12')).toBe(2.7e-12);
    expect(nearestPreferred(96e-12, 'E24')).toBe(100e-12);
  });
  it('has no answer for zero, negative or non-finite values', () => {
    expect(nearestPreferred(0, 'E12')).toBeUndefined();
    expect(nearestPreferred(-1e-12, 'E12')).toBeUndefined();
    expect(nearestPreferred(Number.NaN, 'E12')).toBeUndefined();
  });
});

describe('floor and ceiling neighbours', () => {
  it('brackets 11 pF by 10 and 12 pF in E12', () => {
    expect(preferredNeighbours(11e-12, 'E12')).toEqual({ floor: 10e-12, ceil: 12e-12 });
  });
  it('returns the value itself when it is preferred', () => {
    expect(preferredNeighbours(4.7e-12, 'E6')).toEqual({ floor: 4.7e-12, ceil: 4.7e-12 });
  });
  it('wraps the decade for the ceiling (9.5 pF in E12 → 8.2 and 10 pF)', () => {
    expect(preferredNeighbours(9.5e-12, 'E12')).toEqual({ floor: 8.2e-12, ceil: 10e-12 });
  });
  it('lists two values either side for the pair search', () => {
    expect(preferredRange(11e-12, 'E12', 2, 2)).toEqual([6.8e-12, 8.2e-12, 10e-12, 12e-12, 15e-12, 18e-12]);
  });
});
