import { describe, expect, it } from 'vitest';
import { medianModel, modelFromResult } from '../../../src/lib/report/netlist-model.ts';
import type { MainModeHints } from '../../../src/lib/extract/main-mode.ts';
import { modeOf, sampleOf } from '../osc/sample-fixtures.ts';
import { OT3, OT3_LABELS } from '../models/spice-cases.ts';

function ot3Sample(id = 'B1', hints: MainModeHints = {}) {
  return sampleOf(
    id,
    OT3,
    OT3.branches.map((b, i) => modeOf(b, OT3.c0F, OT3_LABELS[i].overtone, OT3_LABELS[i].spurious)),
    {},
    hints,
  );
}

describe('modelFromResult', () => {
  it("labels the datasheet overtone's mode as main and keeps every mode by default", () => {
    const m = modelFromResult(ot3Sample('B1', { overtone: 3 }));
    expect(m.model.branches).toHaveLength(3);
    expect(m.mainIndex).toBe(1);
    expect(m.labels[1]).toEqual({ overtone: 3, spurious: false, main: true });
  });
  it('falls back to the strongest non-spurious mode without a datasheet', () => {
    const m = modelFromResult(ot3Sample());
    // The fundamental (25 Ω) is stronger than the third overtone (60 Ω).
    expect(m.mainIndex).toBe(0);
    expect(m.mainRule).toMatch(/strongest non-spurious/);
  });
  it('takes the main mode the extraction recorded, never picking again', () => {
    // The picker would take the fundamental (strongest); the recorded choice is the spurious branch.
    const s = { ...ot3Sample(), mainMode: { index: 2, rule: 'recorded' } };
    const m = modelFromResult(s, { mainModeOnly: true });
    expect(m.model.branches).toEqual([OT3.branches[2]]);
    expect(m.mainRule).toBe('recorded');
  });
  it('keeps only the main mode, or drops spurious modes, when asked', () => {
    expect(modelFromResult(ot3Sample('B1', { frequencyHz: 100e6 }), { mainModeOnly: true }).model.branches).toEqual([
      OT3.branches[1],
    ]);
    expect(modelFromResult(ot3Sample(), { includeSpurious: false }).model.branches).toEqual(OT3.branches.slice(0, 2));
  });
});

describe('medianModel', () => {
  it('takes the median of each parameter per mode across samples, and C0', () => {
    const shift = (k: number) => ({
      c0F: OT3.c0F * (1 + k * 0.01),
      branches: OT3.branches.map((b) => ({
        fsHz: b.fsHz * (1 + k * 1e-6),
        r1Ohm: b.r1Ohm * (1 + k * 0.1),
        c1F: b.c1F * (1 + k * 0.02),
      })),
    });
    const samples = [3, -1, 0].map((k, i) => {
      const m = shift(k);
      return sampleOf(
        `S${i}`,
        m,
        m.branches.map((b, j) => modeOf(b, m.c0F, OT3_LABELS[j].overtone, OT3_LABELS[j].spurious)),
      );
    });
    const med = medianModel(samples, { overtone: 3 });
    expect(med.n).toBe(3);
    expect(med.model.c0F).toBe(OT3.c0F);
    expect(med.model.branches).toEqual(OT3.branches);
    expect(med.labels.map((l) => [l.overtone, l.spurious, l.main])).toEqual([
      [1, false, false],
      [3, false, true],
      [3, true, false],
    ]);
    expect(med.counts).toEqual([3, 3, 3]);
  });
  it('leaves out a mode that fewer than half of the samples have', () => {
    const one = ot3Sample('S0');
    const two = sampleOf('S1', OT3, one.modes.slice(0, 2));
    const three = sampleOf('S2', OT3, one.modes.slice(0, 2));
    const med = medianModel([one, two, three]);
    expect(med.model.branches).toHaveLength(2);
    expect(med.labels.some((l) => l.spurious)).toBe(false);
  });
  it('averages the middle two for an even number of samples', () => {
    const a = sampleOf('A', { c0F: 2e-12, branches: [{ fsHz: 10e6, r1Ohm: 10, c1F: 1e-14 }] });
    const b = sampleOf('B', { c0F: 4e-12, branches: [{ fsHz: 10e6 + 2, r1Ohm: 30, c1F: 3e-14 }] });
    const med = medianModel([a, b]);
    expect(med.model.c0F).toBeCloseTo(3e-12, 24);
    expect(med.model.branches[0].fsHz).toBe(10e6 + 1);
    expect(med.model.branches[0].r1Ohm).toBe(20);
  });
});
