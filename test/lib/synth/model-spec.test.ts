import { describe, expect, it } from 'vitest';
import { parseModelSpec } from '../../../src/lib/synth/model-spec.ts';
import { makeFreqGrid, quantizeGrid } from '../../../src/lib/synth/freq-grid.ts';

describe('parseModelSpec', () => {
  it('reads one branch with prefixed values and optional units', () => {
    const r = parseModelSpec('fs=16MHz r1=20 c1=10f c0=3p');
    expect(r).toEqual({ ok: true, model: { c0F: 3e-12, branches: [{ fsHz: 16e6, r1Ohm: 20, c1F: 1e-14 }] } });
  });

  it('reads several branches, l1 instead of c1, and fixture parasitics', () => {
    const r = parseModelSpec('fs=10MHz r1=15 l1=10mH c0=4pF rs=0.5ohm; fs=10.05MHz r1=150 c1=1.8f');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.model.branches).toHaveLength(2);
    // C1 = 1/((2πfs)²L1) (derived from the BVD model).
    expect(r.model.branches[0].c1F).toBeCloseTo(1 / ((2 * Math.PI * 10e6) ** 2 * 10e-3), 25);
    expect(r.model.rsOhm).toBe(0.5);
  });

  it('names the bad token and what was expected', () => {
    expect(parseModelSpec('fs=16MHz r1=20 c1=10f')).toEqual({ ok: false, message: 'expected c0, e.g. "c0=3p"' });
    expect(parseModelSpec('fs=16MHz r1=20pF c1=10f c0=3p')).toMatchObject({
      ok: false,
      message: expect.stringContaining('r1: expected a resistance'),
    });
    expect(parseModelSpec('fs=16MHz q=20 c0=3p')).toMatchObject({
      ok: false,
      message: expect.stringContaining('unknown key "q"'),
    });
    expect(parseModelSpec('fs=16MHz r1=20 c1=10f l1=1m c0=3p')).toMatchObject({
      ok: false,
      message: expect.stringContaining('exactly one of c1 or l1'),
    });
  });
});

describe('makeFreqGrid', () => {
  it('lays out linear, centred and logarithmic grids with exact end points', () => {
    expect(Array.from(makeFreqGrid({ kind: 'linear', startHz: 10, stopHz: 20, points: 3 }))).toEqual([10, 15, 20]);
    const c = makeFreqGrid({ kind: 'centered', centerHz: 1e6, spanHz: 1e3, points: 11 });
    expect(c[0]).toBe(999500);
    expect(c[10]).toBe(1000500);
    const g = makeFreqGrid({ kind: 'log', startHz: 1e3, stopHz: 1e6, points: 4 });
    expect(g[1]).toBeCloseTo(1e4, 6);
    expect(g[3]).toBe(1e6);
  });

  it('merges segments into one strictly rising list', () => {
    const g = makeFreqGrid({
      kind: 'segments',
      segments: [
        { kind: 'linear', startHz: 0, stopHz: 100, points: 11 },
        { kind: 'linear', startHz: 45, stopHz: 55, points: 11 },
      ],
    });
    expect(g.length).toBe(11 + 11 - 1); // 50 is in both
    for (let i = 1; i < g.length; i++) expect(g[i]).toBeGreaterThan(g[i - 1]);
  });

  it('refuses grids that cannot be laid out', () => {
    expect(() => makeFreqGrid({ kind: 'linear', startHz: 10, stopHz: 10, points: 3 })).toThrow(/start < stop/);
    expect(() => makeFreqGrid({ kind: 'log', startHz: 0, stopHz: 10, points: 3 })).toThrow(/0 < start/);
    expect(() => makeFreqGrid({ kind: 'explicit', freqHz: [1, 1] })).toThrow(/rise strictly/);
  });

  it('quantizes frequencies to a power-of-ten resolution with short decimal forms', () => {
    const q = quantizeGrid(Float64Array.from([15915494.30918953, 15915494.3101]), 0.001);
    expect(Array.from(q)).toEqual([15915494.309, 15915494.31]);
    expect(() => quantizeGrid(Float64Array.from([1]), 0.002)).toThrow(/power of ten/);
  });
});
