import { describe, expect, it } from 'vitest';
import { estimateC0 } from '../../../src/lib/extract/c0-estimate.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { fsOf, linGrid, synthSweep } from './synthetic.ts';

// Reference resonator X1 and an illustrative ceramic resonator (values from memory).
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const CER_FS = fsOf(0.385e-3, 4.1e-12);
const CERAMIC: BvdModel = { c0F: 20.6e-12, branches: [{ fsHz: CER_FS, r1Ohm: 8, c1F: 4.1e-12 }] };
const hint = (m: BvdModel) =>
  m.branches.map((b) => ({
    fsHz: b.fsHz,
    q: 1 / (2 * Math.PI * b.fsHz * b.r1Ohm * b.c1F),
    c1F: b.c1F * 1.001,
    r1Ohm: b.r1Ohm,
  }));

describe('estimateC0', () => {
  it('recovers C0 of X1 from a ±1 % sweep at −65 dB within its uncertainty and 0.05 %', () => {
    // Ceff = C0 + ΣCk/(1 − (f/fk)²) (derived from the BVD model), fitted on both sides of the mode
    const f = linGrid(0.99 * FS, 1.01 * FS, 2001);
    const r = estimateC0([partAlone(synthSweep(X1, f, { noiseDb: -65, seed: 3 }))], hint(X1));
    expect(r.ok).toBe(true);
    expect(Math.abs(r.c0F / 3e-12 - 1)).toBeLessThan(5e-4);
    expect(Math.abs(r.c0F - 3e-12)).toBeLessThan(3 * r.uncertaintyF);
    expect(r.fitted).toEqual([true]);
  });

  it('removes a capacitor added across or in series with the part', () => {
    // parallel C adds to Im Y; series C adds 1/(jωC) to Z (derived from the circuit; removed by partAlone)
    const f = linGrid(0.99 * FS, 1.01 * FS, 2001);
    for (const connection of ['parallel', 'series'] as const) {
      const s = partAlone(
        synthSweep(X1, f, { noiseDb: -70, seed: 5, addedCF: 10e-12, connection }),
        10e-12,
        connection,
      );
      const r = estimateC0([s], hint(X1));
      expect(r.ok).toBe(true);
      expect(Math.abs(r.c0F / 3e-12 - 1)).toBeLessThan(1e-3);
    }
  });

  it('keeps the mode term for a ceramic resonator, where a low-frequency reading is 20 % high', () => {
    // a single low-f reading errs by +ΣCk/C0 (~20 % ceramic); the Ceff fit removes it
    const f = linGrid(0.5 * CER_FS, 1.3 * CER_FS, 3001);
    const s = partAlone(synthSweep(CERAMIC, f, { noiseDb: -65, seed: 7 }));
    const lowReading = s.bS[0] / (2 * Math.PI * f[0]);
    expect(lowReading / 20.6e-12 - 1).toBeGreaterThan(0.2);
    const r = estimateC0([s], hint(CERAMIC));
    expect(Math.abs(r.c0F / 20.6e-12 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(r.branchCF[0] / 4.1e-12 - 1)).toBeLessThan(1e-3);
  });

  it('holds C1 at the estimate when every point lies on one side of the mode', () => {
    const f = linGrid(0.9 * FS, 0.99 * FS, 801);
    const r = estimateC0([partAlone(synthSweep(X1, f, { noiseDb: -70, seed: 9 }))], hint(X1));
    expect(r.fitted).toEqual([false]);
    // A 0.1 % error in the held C1 moves C0 by about C1·0.001·mean term (≈ 0.2 aF here).
    expect(Math.abs(r.c0F / 3e-12 - 1)).toBeLessThan(1e-4);
  });

  it('says why when the sweeps never leave the resonance', () => {
    const f = linGrid(FS - 300, FS + 300, 201);
    const r = estimateC0([partAlone(synthSweep(X1, f))], hint(X1));
    expect(r.ok).toBe(false);
    expect(r.reason).toBe('only 0 points lie away from the resonances (need 5); sweep a wider span for C0');
  });

  it('leaves out points above the trusted instrument range', () => {
    const f = linGrid(0.99 * FS, 1.01 * FS, 2001);
    const s = partAlone(synthSweep(X1, f, { noiseDb: -70, seed: 11 }));
    const all = estimateC0([s], hint(X1));
    const lower = estimateC0([{ ...s, maxTrustedHz: FS }], hint(X1));
    expect(lower.points).toBeLessThan(all.points * 0.6);
    expect(Math.abs(lower.c0F / 3e-12 - 1)).toBeLessThan(1e-3);
  });
});
