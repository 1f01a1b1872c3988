/**
 * Property-based tests of the SI quantity reader (src/lib/units/si.ts): random and mutated
 * quantity texts never throw, give a finite value or a message saying what was expected, each
 * within the time budget; formatSi output reads back within its rounding.
 */
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { formatSi, parseQuantity, parseQuantityRange, type UnitKind } from '../../src/lib/units/si.ts';
import {
  FUZZ_SEED,
  FuzzCounter,
  INPUT_BUDGET_MS,
  mutate,
  mutationsArb,
  randomTextArb,
  timed,
  tokenSoupArb,
} from './fuzz-support.ts';

const counter = new FuzzCounter('quantity');
afterAll(() => counter.write());

const KINDS: UnitKind[] = [
  'frequency',
  'capacitance',
  'resistance',
  'inductance',
  'power',
  'temperature',
  'ppm',
  'conductance',
  'voltage',
  'current',
  'time',
];

/** Valid quantities of README: The part record and the foundation issue, and ranges. */
const VALID = [
  '12 MHz',
  '12MHz',
  '12e6 Hz',
  '8 pF',
  '80 ohm',
  '80 Ω',
  '100 uW',
  '100 µW',
  '10 ppm',
  '25 C',
  '25 °C',
  '-40 to 85 C',
  '-40 C to 85 C',
  '-40..85 C',
  '3 pF',
  '32.768 kHz',
  '0.5 mH',
  '5 mA/V',
  '5 mS',
  '3.3 V',
  '1 mA',
  '1 ms',
  '+1.5e-3 F',
  '.5 kohm',
  '1.0E+2 Ohm',
];

const WORDS = [
  '1',
  '12',
  '-40',
  '+3',
  '.5',
  '5.',
  '1e6',
  '1E-3',
  'e',
  'to',
  '..',
  '…',
  ' ',
  ' ',
  '\n',
  '\t',
  'Hz',
  'MHz',
  'mHz',
  'mhz',
  'kHz',
  'F',
  'pF',
  'fF',
  'aF',
  'ohm',
  'Ω',
  'Ω',
  'kohm',
  'R',
  'W',
  'uW',
  'µW',
  'μW',
  'H',
  'mH',
  'C',
  '°C',
  '℃',
  'degC',
  'ppm',
  'S',
  'A/V',
  'V',
  'Vpp',
  'A',
  's',
  'MEG',
  'NaN',
  'Infinity',
  '1e999',
  '0x10',
  '١',
  '%',
  '-',
  '+',
];

function checkQuantity(text: string, kind: UnitKind, property: string): void {
  counter.tick(property);
  const r = timed(() => parseQuantity(text, kind));
  if (r.ms >= INPUT_BUDGET_MS) throw new Error(`took ${r.ms.toFixed(0)} ms on ${JSON.stringify(text.slice(0, 200))}`);
  if (r.error !== undefined) throw new Error(`threw ${String(r.error)} on ${JSON.stringify(text)}`);
  const q = r.value!;
  if (q.ok) {
    if (!Number.isFinite(q.value)) throw new Error(`ok with ${q.value} for ${JSON.stringify(text)}`);
  } else {
    expect(q.message).toMatch(/^expected /);
    expect(q.message.length).toBeLessThan(400);
    expect(q.message).not.toMatch(/\bundefined\b|\[object /);
  }
}

function checkRange(text: string, kind: UnitKind, property: string): void {
  counter.tick(property);
  const r = timed(() => parseQuantityRange(text, kind));
  if (r.ms >= INPUT_BUDGET_MS) throw new Error(`took ${r.ms.toFixed(0)} ms on ${JSON.stringify(text.slice(0, 200))}`);
  if (r.error !== undefined) throw new Error(`threw ${String(r.error)} on ${JSON.stringify(text)}`);
  const q = r.value!;
  if (q.ok) {
    expect(Number.isFinite(q.min) && Number.isFinite(q.max)).toBe(true);
    expect(q.min).toBeLessThan(q.max);
  } else {
    expect(q.message).toMatch(/^expected /);
    expect(q.message.length).toBeLessThan(400);
  }
}

describe('parseQuantity and parseQuantityRange on hostile input', () => {
  it('random text: a finite value or a message saying what was expected, never an exception', () => {
    fc.assert(
      fc.property(randomTextArb, fc.constantFrom(...KINDS), (t, k) => {
        checkQuantity(t, k, 'random-text');
        checkRange(t, k, 'random-text-range');
      }),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });

  it('quantity-word soup: a finite value or a message', () => {
    fc.assert(
      fc.property(tokenSoupArb(WORDS, 8), fc.constantFrom(...KINDS), (t, k) => {
        checkQuantity(t, k, 'word-soup');
        checkRange(t, k, 'word-soup-range');
      }),
      { seed: FUZZ_SEED, numRuns: 2500 },
    );
  });

  it('mutated valid quantities: a finite value or a message', () => {
    fc.assert(
      fc.property(fc.constantFrom(...VALID), mutationsArb, fc.constantFrom(...KINDS), (v, ms, k) => {
        const t = mutate(v, ms, WORDS);
        checkQuantity(t, k, 'mutated');
        checkRange(t, k, 'mutated-range');
      }),
      { seed: FUZZ_SEED, numRuns: 2000 },
    );
  });
});

/** Units formatSi writes with a prefix, and the kind parseQuantity must find in them. */
const PREFIXED: Array<[string, UnitKind]> = [
  ['Hz', 'frequency'],
  ['F', 'capacitance'],
  ['Ω', 'resistance'],
  ['ohm', 'resistance'],
  ['H', 'inductance'],
  ['W', 'power'],
  ['S', 'conductance'],
  ['V', 'voltage'],
  ['A', 'current'],
  ['s', 'time'],
];

/** |x| log-uniform over [10^lo, 10^hi], either sign. */
const magnitudeArb = (lo: number, hi: number) =>
  fc.tuple(fc.double({ min: lo, max: hi, noNaN: true }), fc.boolean()).map(([e, neg]) => (neg ? -1 : 1) * 10 ** e);

function expectRoundTrip(x: number, unit: string, kind: UnitKind, digits: number): void {
  counter.tick('round-trip');
  const text = formatSi(x, unit, digits);
  const q = parseQuantity(text, kind);
  if (!q.ok) throw new Error(`formatSi(${x}, '${unit}', ${digits}) = "${text}" refused: ${q.message}`);
  // rounding to `digits` significant digits: half a unit of the last digit (plus binary slack)
  const tol = 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(x))) - digits + 1) * (1 + 1e-9) + Math.abs(x) * 1e-15;
  if (Math.abs(q.value - x) > tol)
    throw new Error(`formatSi(${x}, '${unit}', ${digits}) = "${text}" read back as ${q.value}`);
}

describe('formatSi → parseQuantity', () => {
  it('reads back within the rounding of the written digits, femto to tera', () => {
    // frequencies from 1 Hz: "mHz" is refused on purpose (ambiguous with MHz, src/lib/units/si.ts)
    fc.assert(
      fc.property(
        magnitudeArb(-15, 14.9),
        fc.constantFrom(...PREFIXED),
        fc.integer({ min: 1, max: 12 }),
        (x, [unit, kind], digits) => {
          if (kind === 'frequency' && Math.abs(x) < 1) x = x * 1e15;
          expectRoundTrip(x, unit, kind, digits);
        },
      ),
      { seed: FUZZ_SEED, numRuns: 2000 },
    );
    expectRoundTrip(0, 'F', 'capacitance', 4);
  });

  it('reads back the atto range it writes (uncertainties of C1 are a few aF, e.g. 4e-18 F)', () => {
    fc.assert(
      fc.property(magnitudeArb(-18, -15.01), fc.integer({ min: 1, max: 8 }), (x, digits) =>
        expectRoundTrip(x, 'F', 'capacitance', digits),
      ),
      { seed: FUZZ_SEED, numRuns: 300 },
    );
  });
});
