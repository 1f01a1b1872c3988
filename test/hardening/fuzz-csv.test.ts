/**
 * Property-based tests of the CSV/TSV impedance reader (src/lib/io/sweep-csv.ts, README: The part
 * record, "Sweep files"): random text and mutated valid files are either read into finite,
 * rising data or refused with the project's InputError, every issue located, each input within
 * the time budget; sweeps written by formatSweepCsv read back to the same values.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { formatSweepCsv, parseSweepCsv, type FormatSweepCsvOptions } from '../../src/lib/io/sweep-csv.ts';
import type { ImpedanceSweep } from '../../src/lib/sweep/sweep.ts';
import {
  expectLocatedOrValue,
  firstNonFinite,
  FUZZ_SEED,
  FuzzCounter,
  mutate,
  mutationsArb,
  randomTextArb,
  ROOT,
  tokenSoupArb,
} from './fuzz-support.ts';

const counter = new FuzzCounter('csv');
afterAll(() => counter.write());

/** First lines of a file (long demo sweeps are cut so one input stays small). */
const head = (text: string, lines = 40) => text.split('\n').slice(0, lines).join('\n');

function csvFiles(dir: string): Array<{ name: string; text: string }> {
  const abs = join(ROOT, dir);
  if (!existsSync(abs)) return [];
  return readdirSync(abs)
    .filter((n) => /\.(csv|tsv|txt)$/i.test(n))
    .sort()
    .map((name) => ({ name, text: head(readFileSync(join(abs, name), 'utf8')) }));
}

const HAND_WRITTEN = [
  'frequency (MHz);|Z| (ohm);phase (deg)\n11,999;25,1;-3,5\n12,000;24,9;0,5\n12,001;25,3;4,0\n',
  'f\tr\tx\n1000\t10\t-5\n2000\t11\t-4\n3000\t12\t-3\n',
  '# exported by a bench analyser\n! second comment\n"Frequency [kHz]","Re [kohm]","Im [kohm]"\n1.5,"0.01",-0.02\n2.5,0.011,-0.021\n',
  '\ufeffFREQ (GHz),MAG,THETA (rad)\n0.001,50,0.1\n0.002,51,-0.1\n',
  'frequency (Hz),r (ohm),x (ohm),|z| (ohm),phase (deg),comment\n1,2,3,4,5,a\n2,2,3,4,5,"b, c"\n',
  'f,r (mohm),x (Mohm)\n0,1e3,-1e-3\n1e-3,2E3,+.5\n',
];

const SEEDS = [
  ...HAND_WRITTEN.map((text, i) => ({ name: `hand-${i}.csv`, text })),
  ...csvFiles('test/fixtures/bad-sweeps'),
  ...csvFiles('test/fixtures/good-records/nested/xo-good-b'),
  ...(existsSync(join(ROOT, 'content/parts'))
    ? readdirSync(join(ROOT, 'content/parts'))
        .sort()
        .flatMap((d) => csvFiles(`content/parts/${d}`))
        .slice(0, 8)
    : []),
];

const WORDS = [
  'frequency',
  'freq',
  'f',
  'r',
  're',
  'real',
  'resistance',
  'x',
  'im',
  'imag',
  'reactance',
  'z',
  '|z|',
  'mag',
  'magnitude',
  'phase',
  'theta',
  '(Hz)',
  '(kHz)',
  '(MHz)',
  '[GHz]',
  '(ohm)',
  '(kohm)',
  '(mohm)',
  '(Ω)',
  '(deg)',
  '(rad)',
  '(pF)',
  '()',
  '[',
  ',',
  ',',
  ';',
  '\t',
  '"',
  '""',
  '#',
  '!',
  '0',
  '1',
  '-1',
  '1e6',
  '1,5',
  '.5',
  'NaN',
  'inf',
  '1e999',
  '',
  ' ',
];

function check(text: string, name: string, property: string): void {
  counter.tick(property);
  const s = expectLocatedOrValue(() => parseSweepCsv(text, name), name, text);
  if (!s) return;
  const bad = firstNonFinite({ f: s.freqHz, re: s.zRe, im: s.zIm });
  if (bad) throw new Error(`published ${bad[1]} at ${bad[0]} from ${JSON.stringify(text.slice(0, 300))}`);
  expect(s.freqHz.length).toBeGreaterThan(0);
  expect(s.zRe.length).toBe(s.freqHz.length);
  expect(s.zIm.length).toBe(s.freqHz.length);
  for (let i = 0; i < s.freqHz.length; i++) {
    expect(s.freqHz[i]).toBeGreaterThanOrEqual(0);
    if (i > 0) expect(s.freqHz[i]).toBeGreaterThan(s.freqHz[i - 1]);
  }
}

describe('parseSweepCsv on hostile input', () => {
  it('random text: a located InputError or sane data, never another exception, each within the budget', () => {
    fc.assert(
      fc.property(randomTextArb, (text) => check(text, 'x.csv', 'random-text')),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });

  it('CSV-word soup: a located InputError or sane data', () => {
    fc.assert(
      fc.property(tokenSoupArb(WORDS, 80), (text) => check(text, 'x.csv', 'word-soup')),
      { seed: FUZZ_SEED, numRuns: 2500 },
    );
  });

  it('mutated valid and bad CSV files (flips, truncation, duplicated lines, NaN/huge numbers, NUL, unicode): located errors or sane data', () => {
    expect(SEEDS.length).toBeGreaterThanOrEqual(15);
    fc.assert(
      fc.property(fc.nat({ max: SEEDS.length - 1 }), mutationsArb, (k, ms) =>
        check(mutate(SEEDS[k].text, ms, WORDS), SEEDS[k].name, 'mutated-file'),
      ),
      { seed: FUZZ_SEED, numRuns: 3000 },
    );
  });
});

const valueArb = fc.oneof(
  fc.constant(0),
  fc.double({ min: -1e3, max: 1e3, noNaN: true }),
  fc.double({ min: -1e12, max: 1e12, noNaN: true }),
  fc.double({ min: -1e-6, max: 1e-6, noNaN: true }),
);

const sweepArb: fc.Arbitrary<{ sweep: ImpedanceSweep; opts: FormatSweepCsvOptions }> = fc
  .record({
    f0: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 1e10, noNaN: true })),
    steps: fc.array(fc.double({ min: 1e-2, max: 1e8, noNaN: true }), { maxLength: 24 }),
    values: fc.array(valueArb, { minLength: 50, maxLength: 50 }),
    form: fc.constantFrom<'rx' | 'magphase'>('rx', 'magphase'),
    delimiter: fc.constantFrom<',' | ';' | '\t'>(',', ';', '\t'),
    freqUnit: fc.constantFrom<'Hz' | 'kHz' | 'MHz' | 'GHz'>('Hz', 'kHz', 'MHz', 'GHz'),
  })
  .map((r) => {
    const n = r.steps.length + 1;
    const freqHz = new Float64Array(n);
    freqHz[0] = r.f0;
    for (let i = 1; i < n; i++) freqHz[i] = freqHz[i - 1] + r.steps[i - 1];
    const zRe = Float64Array.from({ length: n }, (_, i) => r.values[(2 * i) % 50]);
    const zIm = Float64Array.from({ length: n }, (_, i) => r.values[(2 * i + 1) % 50]);
    return {
      sweep: { freqHz, zRe, zIm, source: 'x.csv' },
      opts: { form: r.form, delimiter: r.delimiter, freqUnit: r.freqUnit },
    };
  });

describe('formatSweepCsv → parseSweepCsv', () => {
  it('reads back every form, delimiter and frequency unit to the same values', () => {
    fc.assert(
      fc.property(sweepArb, ({ sweep, opts }) => {
        counter.tick('round-trip');
        const text = formatSweepCsv(sweep, opts);
        const got = expectLocatedOrValue(() => parseSweepCsv(text, 'x.csv'), 'x.csv', text);
        if (!got) throw new Error(`written file refused:\n${text}`);
        // frequency: decimal point moved on the text, exact; r/x: shortest round-trip decimals, exact;
        // |z|/phase: polar conversion, error relative to |Z| (common practice)
        expect(Array.from(got.freqHz)).toEqual(Array.from(sweep.freqHz));
        for (let i = 0; i < sweep.freqHz.length; i++) {
          const tol = opts.form === 'rx' ? 0 : 1e-14 * Math.hypot(sweep.zRe[i], sweep.zIm[i]);
          expect(Math.abs(got.zRe[i] - sweep.zRe[i])).toBeLessThanOrEqual(tol);
          expect(Math.abs(got.zIm[i] - sweep.zIm[i])).toBeLessThanOrEqual(tol);
        }
      }),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });
});
