import { describe, expect, it } from 'vitest';
import { formatExtractText } from '../../../src/lib/extract/format-text.ts';
import { extractPart } from '../../../src/lib/extract/extract-part.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { linGrid, syntheticPart } from './synthetic.ts';

describe('formatExtractText', () => {
  it('shows C0, one row per mode with its kind, the cross-check verdicts and the spurious strength', () => {
    // two-branch reference part (X1 plus a 150 Ω branch 100 kHz above), synthetic
    const fs = 1e8 / (2 * Math.PI);
    const model: BvdModel = {
      c0F: 3e-12,
      branches: [
        { fsHz: fs, r1Ohm: 20, c1F: 10e-15 },
        { fsHz: fs + 100e3, r1Ohm: 150, c1F: 2.468878e-15 },
      ],
    };
    const { part, inputs } = syntheticPart(model, [{ file: 'w.s1p', freqHz: linGrid(fs - 50e3, fs + 150e3, 20_001) }], {
      noiseDb: -75,
      seed: 4,
    });
    const text = formatExtractText(extractPart(part, inputs));
    const lines = text.split('\n');
    expect(lines[0]).toBe('part SYN-1');
    expect(lines[2]).toBe('sample A');
    // Value and standard uncertainty in the GUM's concise form, one unit (JCGM 100:2008 §7.2.2).
    expect(lines[3]).toMatch(/^ {2}C0 [23]\.\d+\(\d+(\.\d+)?\) pF {3}\[c0F agree \(\d\)\]$/);
    expect(lines[4]).toMatch(/^ {2}mode +fs +fp +R1 +L1 +C1 +Q +M +note$/);
    expect(lines[5]).toMatch(/^ {2}fundamental +15915494\.\d+\(\d+(\.\d+)?\) Hz +/);
    expect(lines[6]).toMatch(
      /^ {2}spurious \(near fundamental\) +1601549\d(\.\d+)?\(\d+(\.\d+)?\) Hz .* 17\.5 dB \(R ratio 7\.50\)$/,
    );
    expect(text).toContain('  cross-checks:\n    fundamental at 15.915494 MHz: fsHz agree (4), r1Ohm agree (4)');
    expect(text.endsWith('\n')).toBe(true);
  });
});
