/**
 * Behaviour unchanged: every demo part's `extract --json`, netlists and advice equal the golden
 * copy (test/demo/golden.ts says how and when to rewrite it).
 */
import { describe, expect, it } from 'vitest';
import { demoIds, goldenOf, readGolden } from './golden.ts';

describe('demo outputs equal the golden copy', () => {
  for (const id of demoIds()) {
    it(id, async () => {
      expect(await goldenOf(id)).toBe(readGolden(id));
    });
  }
});
