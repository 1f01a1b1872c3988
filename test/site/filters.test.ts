import { describe, expect, it } from 'vitest';
import {
  compareEntries,
  compileFilters,
  emptyFilterState,
  parseAtMostFilter,
  parseEngValue,
  parseRangeFilter,
  readFilterState,
  writeFilterState,
} from '../../src/site/filters.ts';
import type { IndexEntry } from '../../src/site/types.ts';

// SI prefixes: BIPM SI Brochure (M = 1e6, k = 1e3, p = 1e-12); the range forms are the
// project's own notation (src/site/filters.ts module doc).
const range = (text: string, unit: 'Hz' | 'F' | 'ohm') => {
  const r = parseRangeFilter(text, unit);
  if (!r || !r.ok) throw new Error(`did not parse: ${text} ${r && !r.ok ? r.message : ''}`);
  return [r.range.min, r.range.max];
};

describe('parseRangeFilter', () => {
  it('reads 11.9M–12.1M (en dash) and 11.9M-12.1M as [11.9e6, 12.1e6]', () => {
    for (const t of [
      '11.9M–12.1M',
      '11.9M-12.1M',
      '11.9 MHz - 12.1 MHz',
      '11.9M..12.1M',
      '11.9M to 12.1M',
      '11.9e6-12.1e6',
    ]) {
      const [lo, hi] = range(t, 'Hz');
      expect(lo, t).toBeCloseTo(11.9e6, 3);
      expect(hi, t).toBeCloseTo(12.1e6, 3);
    }
  });

  it('reads one-sided and single-value forms', () => {
    expect(range('>20M', 'Hz')).toEqual([20e6, Infinity]);
    expect(range('<=1M', 'Hz')).toEqual([0, 1e6]);
    expect(range('32.768k+', 'Hz')).toEqual([32768, Infinity]);
    const [lo, hi] = range('12M', 'Hz');
    expect(lo).toBeCloseTo(11.88e6, 3);
    expect(hi).toBeCloseTo(12.12e6, 3);
  });

  it('reads bare load capacitances as pF and keeps explicit units', () => {
    const [lo, hi] = range('8-12', 'F');
    expect(lo).toBeCloseTo(8e-12, 24);
    expect(hi).toBeCloseTo(12e-12, 24);
    expect(range('8p–12pF', 'F')[1]).toBeCloseTo(12e-12, 24);
  });

  it('reports bad text and reversed bounds with the text', () => {
    const bad = parseRangeFilter('twelve', 'Hz');
    expect(bad?.ok).toBe(false);
    if (bad && !bad.ok) expect(bad.message).toContain('"twelve"');
    const reversed = parseRangeFilter('12.1M-11.9M', 'Hz');
    expect(reversed && !reversed.ok && reversed.message).toContain('lower bound first');
    expect(parseRangeFilter('  ', 'Hz')).toBeUndefined();
  });
});

describe('parseAtMostFilter and parseEngValue', () => {
  it('reads ESR limits 50, 50 ohm, 50Ω and 1k', () => {
    for (const [t, v] of [
      ['50', 50],
      ['50 ohm', 50],
      ['50Ω', 50],
      ['1k', 1000],
      ['<= 80 ohms', 80],
      ['2.2kOhm', 2200],
    ] as const) {
      const r = parseAtMostFilter(t, 'ohm');
      expect(r?.ok && r.range.max, t).toBe(v);
    }
  });
  it('refuses a unit of another kind', () => {
    expect(parseEngValue('8 pF', 'ohm').ok).toBe(false);
    expect(parseEngValue('12 MHz', 'Hz')).toEqual({ ok: true, value: 12e6 });
  });
});

const entry = (id: string, fsHz: number, r1Ohm: number, extra: Partial<IndexEntry> = {}): IndexEntry => ({
  id,
  title: id,
  kind: 'quartz-at',
  samples: 1,
  state: 'pass',
  fsHz,
  r1Ohm,
  ...extra,
});

describe('compileFilters', () => {
  const entries = [
    entry('A', 12e6, 30),
    entry('B', 12.05e6, 60),
    entry('C', 16e6, 20),
    entry('D', 11.95e6, 45, { package: '3225', overtone: 1 }),
  ];

  it('combines a frequency range and an ESR limit', () => {
    const { test, errors } = compileFilters({ ...emptyFilterState(), f: '11.9M–12.1M', esr: '50' });
    expect(errors).toEqual({});
    expect(entries.filter(test).map((e) => e.id)).toEqual(['A', 'D']);
  });

  it('ignores a field that does not parse and reports it', () => {
    const { test, errors } = compileFilters({ ...emptyFilterState(), f: 'abc' });
    expect(errors.f).toBeDefined();
    expect(entries.filter(test)).toHaveLength(4);
  });

  it('matches package and overtone exactly and leaves out parts without the value', () => {
    const { test } = compileFilters({ ...emptyFilterState(), pkg: '3225', ot: '1' });
    expect(entries.filter(test).map((e) => e.id)).toEqual(['D']);
  });
});

describe('URL state and sorting', () => {
  it('round-trips a filter state through URL parameters, leaving defaults out', () => {
    const s = { ...emptyFilterState(), q: 'fork', f: '30k-40k', sort: 'r1Ohm' as const, dir: 'desc' as const };
    const params = writeFilterState(s);
    expect(params.toString()).toBe('q=fork&f=30k-40k&sort=r1Ohm&dir=desc');
    expect(readFilterState(params)).toEqual(s);
  });

  it('falls back to defaults for unknown sort keys and states', () => {
    const s = readFilterState(new URLSearchParams('sort=evil&state=bogus&dir=x'));
    expect([s.sort, s.state, s.dir]).toEqual(['id', '', 'asc']);
  });

  it('sorts numbers numerically and puts missing values last in both directions', () => {
    const list = [entry('X', 1, 30), entry('Y', 1, 5), { ...entry('Z', 1, 0), r1Ohm: undefined }];
    expect([...list].sort((a, b) => compareEntries(a, b, 'r1Ohm', 'asc')).map((e) => e.id)).toEqual(['Y', 'X', 'Z']);
    expect([...list].sort((a, b) => compareEntries(a, b, 'r1Ohm', 'desc')).map((e) => e.id)).toEqual(['X', 'Y', 'Z']);
  });
});
