/**
 * Property-based tests of the part record reader (src/lib/io/part-yaml.ts, README: The part record): random
 * text, YAML-word soup, random YAML documents and mutated valid records never throw; every issue
 * names the file and a line inside it (or concerns the whole file); a record comes back only
 * without errors, and then holds no NaN or Infinity; nothing pollutes Object.prototype; each
 * input within the time budget. Generated valid records (hostile free text included) are read
 * back to the same values.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { stringify } from 'yaml';
import { afterAll, describe, expect, it } from 'vitest';
import { parsePartYaml, type PartYamlResult } from '../../src/lib/io/part-yaml.ts';
import { FIXTURES, KNOWN_KEYS, PART_KINDS } from '../../src/lib/schema/part.ts';
import { formatSi } from '../../src/lib/units/si.ts';
import {
  expectLocated,
  firstNonFinite,
  FUZZ_SEED,
  FuzzCounter,
  INPUT_BUDGET_MS,
  mutate,
  mutationsArb,
  randomTextArb,
  ROOT,
  timed,
  tokenSoupArb,
} from './fuzz-support.ts';

const counter = new FuzzCounter('part-yaml');
afterAll(() => counter.write());

function recordsUnder(dir: string): Array<{ name: string; text: string }> {
  const out: Array<{ name: string; text: string }> = [];
  const walk = (d: string) => {
    if (!existsSync(d)) return;
    for (const e of readdirSync(d, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === 'part.yaml') out.push({ name: p.slice(ROOT.length + 1), text: readFileSync(p, 'utf8') });
    }
  };
  walk(join(ROOT, dir));
  return out;
}

const SEEDS = [
  ...recordsUnder('test/fixtures/good-records'),
  ...recordsUnder('test/fixtures/bad-records'),
  ...recordsUnder('content/parts').slice(0, 10),
];

const ALL_KEYS = [...new Set(Object.values(KNOWN_KEYS).flat())];

const WORDS = [
  ...ALL_KEYS.map((k) => `${k}:`),
  '- id:',
  '- file:',
  '  ',
  '    ',
  '- ',
  '-',
  ':',
  'quartz-at',
  'series-thru',
  'reflection',
  '12 MHz',
  '8 pF',
  '80 ohm',
  '-40 to 85 C',
  'A1',
  'a1.s1p',
  '../x.s1p',
  '/etc/passwd',
  '&a',
  '*a',
  '<<: *a',
  '!!str',
  '!!binary',
  '!!js/function',
  '!foo',
  '? ',
  '---',
  '...',
  '%YAML 1.1',
  '%TAG ! tag:example.com,2000:',
  '{',
  '}',
  '[',
  ']',
  ',',
  '|',
  '|-',
  '>',
  '"',
  "'",
  '#',
  '\t',
  '__proto__:',
  'constructor:',
  'prototype:',
  '~',
  'null',
  'true',
  'yes',
  '0x1F',
  '.inf',
  '.nan',
  '2026-05-02',
  '1e999',
  '<script>',
];

const PROTO_KEYS = Object.getOwnPropertyNames(Object.prototype).sort().join(',');

function check(text: string, file: string, property: string): PartYamlResult {
  counter.tick(property);
  const r = timed(() => parsePartYaml(text, file));
  if (r.ms >= INPUT_BUDGET_MS)
    throw new Error(
      `took ${r.ms.toFixed(0)} ms (budget ${INPUT_BUDGET_MS} ms) on ${JSON.stringify(text.slice(0, 300))}`,
    );
  if (r.error !== undefined)
    throw new Error(
      `threw ${(r.error as Error)?.name}: ${(r.error as Error)?.message} on ${JSON.stringify(text.slice(0, 300))}`,
    );
  const res = r.value!;
  for (const issue of res.issues) expectLocated(issue, file, text);
  const errors = res.issues.filter((i) => i.severity === 'error');
  if (res.part !== undefined && errors.length > 0) throw new Error(`record returned with ${errors.length} errors`);
  if (res.part === undefined && errors.length === 0)
    throw new Error(`no record and no error for ${JSON.stringify(text.slice(0, 300))}`);
  if (res.part) {
    const bad = firstNonFinite(res.part);
    if (bad) throw new Error(`record holds ${bad[1]} at ${bad[0]} from ${JSON.stringify(text.slice(0, 300))}`);
  }
  if (
    Object.getOwnPropertyNames(Object.prototype).sort().join(',') !== PROTO_KEYS ||
    ({} as Record<string, unknown>).polluted !== undefined
  ) {
    throw new Error(`Object.prototype changed by ${JSON.stringify(text.slice(0, 300))}`);
  }
  return res;
}

describe('parsePartYaml on hostile input', () => {
  it('random text: located issues or a finite record, never an exception, each within the budget', () => {
    fc.assert(
      fc.property(randomTextArb, (t) => void check(t, 'part.yaml', 'random-text')),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });

  it('YAML-word soup (anchors, aliases, merge keys, tags, directives, __proto__): located issues or a finite record', () => {
    fc.assert(
      fc.property(tokenSoupArb(WORDS, 60), (t) => void check(t, 'part.yaml', 'word-soup')),
      { seed: FUZZ_SEED, numRuns: 2000 },
    );
  });

  it('random YAML documents over the record keys: located issues or a finite record', () => {
    const leaf = fc.oneof(
      fc.constantFrom(
        '12 MHz',
        '8 pF',
        '80 ohm',
        '-40 to 85 C',
        '10 ppm',
        '100 uW',
        'quartz-at',
        'series-thru',
        'A1',
        'a1.s1p',
        '../a.s1p',
        '2026-05-02',
        'series',
        'parallel',
      ),
      fc.string({ maxLength: 20 }),
      fc.double(),
      fc.integer(),
      fc.boolean(),
      fc.constant(null),
    );
    const doc = fc.anything({
      key: fc.constantFrom(...ALL_KEYS, '__proto__', 'constructor', 'polluted', ''),
      values: [leaf],
      maxDepth: 5,
      maxKeys: 6,
    });
    fc.assert(
      fc.property(doc, (value) => {
        let text: string;
        try {
          text = stringify(value);
        } catch {
          return; // not every JS value has a YAML form; not the reader's concern
        }
        check(text, 'part.yaml', 'random-document');
      }),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });

  it('mutated valid, bad and demo records (flips, truncation, duplicated lines, NaN/huge numbers, NUL, unicode): located issues or a finite record', () => {
    expect(SEEDS.length).toBeGreaterThanOrEqual(30);
    fc.assert(
      fc.property(
        fc.nat({ max: SEEDS.length - 1 }),
        mutationsArb,
        (k, ms) => void check(mutate(SEEDS[k].text, ms, WORDS), SEEDS[k].name, 'mutated-record'),
      ),
      { seed: FUZZ_SEED, numRuns: 3000 },
    );
  });
});

// ---------------------------------------------------------------- generated valid records

/** Free text a user might type, hostile markup included (it must come back unchanged). */
const freeTextArb = fc
  .oneof(
    fc.string({ unit: 'grapheme-ascii', minLength: 1, maxLength: 60 }),
    fc.string({ unit: 'grapheme', minLength: 1, maxLength: 30 }),
    fc.constantFrom(
      '<script>alert(1)</script>',
      '"><img src=x onerror=alert(1)>',
      '[x](javascript:alert(1))',
      '*/\n.control\nshell rm -rf /',
      '{{ 7*7 }}',
      '`id`',
      '\u202eevil\u202c',
      'null',
      '0012',
      'yes',
      '- a',
      'a: b',
      '#x',
      '&a *a',
    ),
  )
  .filter((s) => s.trim().length > 0 && !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffd\ud800-\udfff]/.test(s));

const idArb = fc.stringMatching(/^[A-Za-z0-9][A-Za-z0-9._-]{0,15}$/);

const recordArb = fc.record({
  id: idArb,
  title: freeTextArb,
  kind: fc.constantFrom(...PART_KINDS),
  supplier: fc.option(freeTextArb, { nil: undefined }),
  notes: fc.option(freeTextArb, { nil: undefined }),
  frequencyHz: fc.double({ min: 1e3, max: 3e9, noNaN: true }),
  c0F: fc.double({ min: 1e-14, max: 1e-10, noNaN: true }),
  esrOhm: fc.double({ min: 1e-2, max: 1e6, noNaN: true }),
  samples: fc.uniqueArray(
    fc.record({
      id: idArb,
      by: fc.option(freeTextArb, { nil: undefined }),
      file: fc.stringMatching(/^[a-z0-9][a-z0-9 _&'()-]{0,12}\.(s1p|s2p|csv)$/),
      fixture: fc.constantFrom(...FIXTURES),
    }),
    { minLength: 1, maxLength: 3, selector: (s) => s.id },
  ),
});

describe('generated valid records', () => {
  it('are accepted with no error and read back to the same text and values (quantities within their written rounding)', () => {
    fc.assert(
      fc.property(recordArb, (r) => {
        const doc = {
          id: r.id,
          title: r.title,
          kind: r.kind,
          ...(r.supplier ? { supplier: r.supplier } : {}),
          ...(r.notes ? { notes: r.notes } : {}),
          datasheet: {
            frequency: formatSi(r.frequencyHz, 'Hz', 9),
            c0Max: formatSi(r.c0F, 'F', 9),
            esrMax: formatSi(r.esrOhm, 'ohm', 9),
          },
          samples: r.samples.map((s) => ({
            id: s.id,
            ...(s.by ? { by: s.by } : {}),
            sweeps: [{ file: s.file, fixture: s.fixture }],
          })),
        };
        const text = stringify(doc);
        const res = check(text, 'part.yaml', 'generated-valid');
        const errors = res.issues.filter((i) => i.severity === 'error');
        if (!res.part) throw new Error(`refused:\n${text}\n${errors.map((e) => e.message).join('\n')}`);
        expect(res.part.id).toBe(r.id);
        expect(res.part.title).toBe(r.title);
        expect(res.part.supplier).toBe(r.supplier);
        expect(res.part.notes).toBe(r.notes);
        expect(res.part.samples.map((s) => [s.id, s.by, s.sweeps[0].file])).toEqual(
          r.samples.map((s) => [s.id, s.by, s.file]),
        );
        // 9 significant digits written: relative error below 5e-9
        expect(Math.abs(res.part.datasheet!.frequencyHz! / r.frequencyHz - 1)).toBeLessThan(5e-9);
        expect(Math.abs((res.part.datasheet!.c0MaxF as number) / r.c0F - 1)).toBeLessThan(5e-9);
        expect(Math.abs(res.part.datasheet!.esrMaxOhm! / r.esrOhm - 1)).toBeLessThan(5e-9);
      }),
      { seed: FUZZ_SEED, numRuns: 600 },
    );
  });
});
