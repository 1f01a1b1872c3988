import { describe, expect, it } from 'vitest';
import { formatParametersCsv, formatParametersJson } from '../../../src/lib/report/parameters-export.ts';
import { modeOf, sampleOf } from '../osc/sample-fixtures.ts';
import { OT3, OT3_LABELS, X1 } from '../models/spice-cases.ts';

const ot3 = sampleOf(
  'B1',
  OT3,
  OT3.branches.map((b, i) => modeOf(b, OT3.c0F, OT3_LABELS[i].overtone, OT3_LABELS[i].spurious)),
  { temperatureC: 25 },
);

describe('parameter export', () => {
  it('writes CSV with a unit-bearing header and one row per mode', () => {
    const lines = formatParametersCsv(ot3).trimEnd().split('\n');
    const header = lines[0].split(',');
    expect(header.slice(0, 5)).toEqual(['mode', 'overtone', 'spurious', 'fs (Hz)', 'fp (Hz)']);
    expect(header).toContain('R1 (ohm)');
    expect(header).toContain('L1 (H)');
    expect(header).toContain('C1 (F)');
    expect(header).toContain('C0 (F)');
    expect(lines).toHaveLength(4);
    const row = (i: number) => Object.fromEntries(header.map((h, k) => [h, lines[i + 1].split(',')[k]]));
    expect(row(1)['overtone']).toBe('3');
    expect(row(2)['spurious']).toBe('true');
    expect(Number(row(1)['fs (Hz)'])).toBe(100e6);
    expect(Number(row(0)['C1 (F)'])).toBe(9e-15);
    expect(Number(row(0)['C0 (F)'])).toBe(3e-12);
    expect(Number(row(0)['temperature (C)'])).toBe(25);
    // A value the extraction did not give is an empty cell, never NaN.
    expect(row(0)['fr (Hz)']).toBe('');
    expect(lines.join('\n')).not.toMatch(/NaN|undefined/);
  });

  it('writes JSON in SI base units that parses back to the same numbers', () => {
    const parsed = JSON.parse(formatParametersJson(sampleOf('A1', X1), { partId: 'X1', date: '2026-05-02' }));
    expect(parsed.part).toBe('X1');
    expect(parsed.sample).toBe('A1');
    expect(parsed.measured).toBe('2026-05-02');
    expect(parsed.c0F).toBe(3e-12);
    expect(parsed.modes[0].r1Ohm).toBe(20);
    expect(parsed.modes[0].c1F).toBe(1e-14);
    expect(parsed.modes[0].fsHz).toBe(X1.branches[0].fsHz);
    expect(parsed.modes[0].uncertainty.fsHz).toBe(0.01);
  });
});
