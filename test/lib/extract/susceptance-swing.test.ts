import { describe, expect, it } from 'vitest';
import { susceptanceSwing } from '../../../src/lib/extract/susceptance-swing.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { gaussian } from '../../support/rng.ts';
import { linGrid, synthSweep } from './synthetic.ts';

// Reference resonator X1 (invented; IEEE Std 177 model); half-power width 318.31 Hz (fs/Q).
const FS = 1e8 / (2 * Math.PI);
const BW = 2 * Math.PI * FS * FS * 20 * 10e-15;
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };

describe('susceptanceSwing', () => {
  it('measures exactly the swing of a resonance, whatever C0 adds (noiseless X1, 10 points per bandwidth)', () => {
    // the motional circle (derived from the BVD model) plus ωC0, which the fitted line takes up
    const f = linGrid(FS - 20 * BW, FS + 20 * BW, 401);
    for (const c0F of [3e-12, 300e-12]) {
      const s = partAlone(synthSweep({ ...X1, c0F }, f));
      const r = susceptanceSwing(f, s.bS, 200, FS, 20, BW, f[1] - f[0])!;
      expect(Math.abs(r.gamma - 1)).toBeLessThan(1e-9);
      expect(r.points).toBe(61);
    }
  });

  it('finds the swing of X1 in −40 dB noise within a few standard errors of 1', () => {
    const f = linGrid(FS - 20 * BW, FS + 20 * BW, 401);
    const s = partAlone(synthSweep(X1, f, { noiseDb: -40, seed: 2 }));
    const r = susceptanceSwing(f, s.bS, 200, FS, 20, BW, f[1] - f[0])!;
    expect(Math.abs(r.gamma - 1)).toBeLessThan(4 * r.gammaSigma);
    expect(r.gamma).toBeGreaterThan(0.9);
  });

  it('finds no swing in noise that happens to peak: mean about 0, below 1 % of trials pass 0.5 and 3 standard errors', () => {
    // pure white noise on B (σ = 1), a "peak" of 4σ two steps wide at the centre; common practice (1000 seeded trials)
    const f = linGrid(1e6, 1.001e6, 41);
    let pass = 0;
    let sum = 0;
    const trials = 1000;
    for (let t = 1; t <= trials; t++) {
      const g = gaussian(t);
      const b = Float64Array.from(f, () => g());
      const r = susceptanceSwing(f, b, 20, f[20], 1 / 4, 2 * (f[1] - f[0]), f[1] - f[0])!;
      sum += r.gamma;
      if (r.gamma >= 0.5 && r.gamma >= 3 * r.gammaSigma) pass++;
    }
    expect(Math.abs(sum / trials)).toBeLessThan(0.05);
    expect(pass / trials).toBeLessThan(0.01);
  });

  it('gives no answer with fewer than 5 points or impossible estimates', () => {
    const f = linGrid(FS - 2 * BW, FS + 2 * BW, 4);
    const s = partAlone(synthSweep(X1, f));
    expect(susceptanceSwing(f, s.bS, 1, FS, 20, BW, f[1] - f[0])).toBeUndefined();
    const g = linGrid(FS - 20 * BW, FS + 20 * BW, 401);
    const t = partAlone(synthSweep(X1, g));
    expect(susceptanceSwing(g, t.bS, 200, FS, -20, BW, g[1] - g[0])).toBeUndefined();
    expect(susceptanceSwing(g, t.bS, 200, FS, 20, 0, g[1] - g[0])).toBeUndefined();
  });
});
