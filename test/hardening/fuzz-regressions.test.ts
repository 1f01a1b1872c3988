/**
 * Regression inputs the fuzzers found (test/fixtures/fuzz, see its README): each is a located
 * error with a short message, never another exception and never non-finite data.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseTouchstone } from '../../src/lib/io/touchstone.ts';
import { parseSweepCsv } from '../../src/lib/io/sweep-csv.ts';
import { parsePartYaml } from '../../src/lib/io/part-yaml.ts';
import { expectLocated, expectLocatedOrValue, ROOT } from './fuzz-support.ts';

const DIR = join(ROOT, 'test/fixtures/fuzz');
const read = (name: string) => readFileSync(join(DIR, name), 'utf8');

describe('inputs the fuzzers found', () => {
  it.each([
    ['touchstone-db-overflow.s1p', 4],
    ['touchstone-z-normalised-overflow.s1p', 4],
    ['touchstone-y-normalised-overflow.s1p', 3],
  ])('%s: refused at line %d, the overflow named, no Infinity returned', (name, line) => {
    const text = read(name);
    expect(expectLocatedOrValue(() => parseTouchstone(text, name), name, text)).toBeUndefined();
    let issues: Array<{ line?: number; message: string }> = [];
    try {
      parseTouchstone(text, name);
    } catch (e) {
      issues = (e as { issues: typeof issues }).issues;
    }
    expect(issues).toEqual([expect.objectContaining({ line, message: expect.stringMatching(/overflow/) })]);
  });

  it('csv-unterminated-quote.csv: refused at line 2', () => {
    const text = read('csv-unterminated-quote.csv');
    expect(expectLocatedOrValue(() => parseSweepCsv(text, 'x.csv'), 'x.csv', text)).toBeUndefined();
    expect(() => parseSweepCsv(text, 'x.csv')).toThrow(/^x\.csv:2: unterminated quoted field$/);
  });

  it('part-cr-line-endings.yaml: a located error whose message does not quote the whole file', () => {
    const text = read('part-cr-line-endings.yaml');
    const r = parsePartYaml(text, 'part.yaml');
    expect(r.part).toBeUndefined();
    expect(r.issues.length).toBeGreaterThan(0);
    for (const issue of r.issues) expectLocated(issue, 'part.yaml', text);
  });
});
