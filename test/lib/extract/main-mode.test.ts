import { describe, expect, it } from 'vitest';
import { mainMode } from '../../../src/lib/extract/main-mode.ts';

// Synthetic third-overtone part: fundamental (strong), main 3rd overtone, spurious mode above it.
const modes = [
  { overtone: 1, spurious: false, fsHz: 33.24e6, r1Ohm: 25 },
  { overtone: 3, spurious: false, fsHz: 100e6, r1Ohm: 60 },
  { overtone: 3, spurious: true, fsHz: 100.15e6, r1Ohm: 30 },
];

describe('mainMode', () => {
  it('takes the non-spurious mode nearest the datasheet frequency first', () => {
    expect(mainMode(modes, { frequencyHz: 100e6, overtone: 1 })).toEqual({
      index: 1,
      rule: 'mode nearest the datasheet frequency',
    });
  });
  it('ignores a datasheet frequency no mode is within 5 % of, then uses the datasheet overtone', () => {
    expect(mainMode(modes, { frequencyHz: 50e6, overtone: 3 }).index).toBe(1);
  });
  it('falls back to the strongest non-spurious mode (lowest R1), never a spurious one', () => {
    expect(mainMode(modes).index).toBe(0);
  });
  it('takes the strongest mode when every mode is spurious, and −1 without modes', () => {
    expect(mainMode([modes[2]]).rule).toMatch(/all modes spurious/);
    expect(mainMode([]).index).toBe(-1);
  });
});
