import { describe, expect, it } from 'vitest';
import { createSearcher } from '../../src/site/search.ts';
import type { IndexEntry } from '../../src/site/types.ts';

const e = (id: string, title: string, extra: Partial<IndexEntry> = {}): IndexEntry => ({
  id,
  title,
  kind: 'quartz-at',
  samples: 1,
  state: 'pass',
  ...extra,
});
const entries = [
  e('XT-0001', '16 MHz crystal, 3225', { supplier: 'Example Crystals' }),
  e('XT-0005', '32.768 kHz tuning fork', { kind: 'quartz-tuning-fork', notes: 'RTC clock' }),
  e('XT-0006', '4 MHz ceramic resonator', { kind: 'ceramic', package: '3-pin' }),
];

// Behaviour of the project's own search rule (src/site/search.ts module doc); fuse.js 7 fuzzy scores.
describe('createSearcher', () => {
  const s = createSearcher(entries);
  it('narrows to exactly the part whose id is typed', () => {
    expect([...s.search('XT-0005')!]).toEqual(['XT-0005']);
  });
  it('needs every word, case-insensitive, across fields', () => {
    expect([...s.search('mhz 3225')!]).toEqual(['XT-0001']);
    expect([...s.search('rtc FORK')!]).toEqual(['XT-0005']);
  });
  it('falls back to fuzzy matching for a typing error', () => {
    expect([...s.search('tunnig')!]).toContain('XT-0005');
  });
  it('returns undefined (everything) for an empty query and an empty set for nonsense', () => {
    expect(s.search('   ')).toBeUndefined();
    expect(s.search('zzzzqqqq')!.size).toBe(0);
  });
});
