import { describe, expect, it } from 'vitest';
import { analyseDriveLevel } from '../../../src/lib/extract/drive-level.ts';

describe('analyseDriveLevel', () => {
  it('gives the max/min resistance ratio γ and the frequency shift from lowest to highest drive', () => {
    // IEC 60444-6 drive-level dependence: γ = max/min resistance over the levels
    const r = analyseDriveLevel([
      { driveW: 100e-6, r1Ohm: 28.8, fsHz: 20e6 + 9, sweep: 'd100' },
      { driveW: 0.5e-6, r1Ohm: 33.5, fsHz: 20e6, sweep: 'd05' },
      { driveW: 10e-6, r1Ohm: 29.4, fsHz: 20e6 + 1, sweep: 'd10' },
    ])!;
    expect(r.resistanceRatio).toBeCloseTo(33.5 / 28.8, 12);
    expect(r.frequencyShiftPpm).toBeCloseTo(9 / 20, 9);
    expect(r.points.map((p) => p.sweep)).toEqual(['d05', 'd10', 'd100']);
  });

  it('needs two different drive levels', () => {
    expect(
      analyseDriveLevel([
        { driveW: 1e-6, r1Ohm: 30, fsHz: 1e7, sweep: 'a' },
        { driveW: 1e-6, r1Ohm: 31, fsHz: 1e7, sweep: 'b' },
      ]),
    ).toBeUndefined();
  });
});
