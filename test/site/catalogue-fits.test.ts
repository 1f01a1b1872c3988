/**
 * Catalogue "fits circuit" state and cells: the URL round trip, the verdict filter and the texts.
 */
import { describe, expect, it } from 'vitest';
import { compileFilters, emptyFilterState, readFilterState, writeFilterState } from '../../src/site/filters.ts';
import { fitCells } from '../../src/site/catalogue-fits.ts';
import type { IndexEntry } from '../../src/site/types.ts';

const entry = (id: string, fits: IndexEntry['fits']): IndexEntry => ({
  id,
  title: id,
  kind: 'quartz-at',
  samples: 1,
  state: 'pass',
  fits,
});
const A = entry('A', [
  {
    circuit: 'hub',
    verdict: 'fits',
    inputCapF: 18e-12,
    outputCapF: 12e-12,
    offsetPpm: 0.288,
    gainMargin: 52,
    startupTimeS: 4.64e-4,
  },
]);
const B = entry('B', [
  { circuit: 'hub', verdict: 'no', inputCapF: 6.8e-12, outputCapF: 6.8e-12, offsetPpm: -3, gainMargin: 0.4 },
]);
const C = entry('C', []);

describe('fits circuit filter state', () => {
  it('keeps circuit and verdict in the URL and drops an unknown verdict', () => {
    const s = { ...emptyFilterState(), circuit: 'hub', fit: 'fits' as const };
    const q = writeFilterState(s).toString();
    expect(q).toBe('circuit=hub&fit=fits');
    expect(readFilterState(new URLSearchParams(q))).toMatchObject({ circuit: 'hub', fit: 'fits' });
    expect(readFilterState(new URLSearchParams('circuit=hub&fit=maybe')).fit).toBe('');
  });
  it('filters by verdict only when a circuit is chosen; a part without the circuit is outside', () => {
    const t = (fit: string, circuit = 'hub') =>
      [A, B, C].filter(compileFilters({ ...emptyFilterState(), circuit, fit: fit as never }).test).map((e) => e.id);
    expect(t('fits')).toEqual(['A']);
    expect(t('no')).toEqual(['B']);
    expect(t('outside')).toEqual(['C']);
    expect(t('fits', '')).toEqual(['A', 'B', 'C']);
  });
});

describe('fit cells', () => {
  it('prints the pair, offset, margin, start-up and verdict', () => {
    const c = fitCells(A.fits, 'hub');
    expect(c.texts[0]).toMatch(/^18 pF \/ 12 pF$/);
    expect(c.texts[1]).toMatch(/0\.29 ppm/);
    expect(c.texts[3]).toMatch(/464 µs/);
    expect(c.verdict).toBe('fits');
    expect(fitCells(B.fits, 'hub').texts[3]).toBe('does not start');
    expect(fitCells(C.fits, 'hub').verdict).toBe('outside range');
  });
});
