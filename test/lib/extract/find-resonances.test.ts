import { describe, expect, it } from 'vitest';
import { findResonances } from '../../../src/lib/extract/find-resonances.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import { parallelResonanceOf, zeroPhaseOf } from '../../../src/lib/extract/closed-form.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { fsOf, linGrid, synthSweep } from './synthetic.ts';

// FIELD.md §0 reference resonators X1 and TF1, §7 ceramic example (IEEE 177 model).
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const TF1: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
const CER_FS = fsOf(0.385e-3, 4.1e-12);
const CERAMIC: BvdModel = { c0F: 20.6e-12, branches: [{ fsHz: CER_FS, r1Ohm: 8, c1F: 4.1e-12 }] };

function find(model: BvdModel, f: Float64Array, noiseDb?: number, seed = 1, source = 'x.s1p') {
  return findResonances(partAlone(synthSweep(model, f, { noiseDb, seed, source })));
}

describe('findResonances', () => {
  it('finds X1 at fs with R1 = 1/Gmax and its zero-phase and |Z|-maximum frequencies', () => {
    // FIELD.md §2b (Gmax = 1/R1 at fs), §1.3 (fr, fa, fn of X1: fn − fp = +0.953308 Hz)
    const f = linGrid(FS - 2000, FS + 30_000, 32_001);
    const r = find(X1, f);
    expect(r.resonances).toHaveLength(1);
    const x = r.resonances[0];
    expect(Math.abs(x.fsHz - FS)).toBeLessThan(1e-6);
    expect(x.r1Ohm).toBeCloseTo(20, 8);
    expect(x.pointsPerBandwidth).toBeCloseTo(318.30989, 2);
    const zp = zeroPhaseOf(X1, 0)!;
    expect(Math.abs(x.frHz! - zp.frHz)).toBeLessThan(1e-3);
    expect(Math.abs(x.faHz! - zp.faHz)).toBeLessThan(1e-3);
    expect(x.fnHz! - parallelResonanceOf(X1, 0)!).toBeCloseTo(0.953308, 2);
    expect(r.diagnostics).toEqual([]);
  });

  it('finds exactly one resonance in noisy sweeps from Q ≈ 1200 (ceramic) to tuning forks', () => {
    // seeded noise −60 dB: no false peaks on the flanks, the right frequency within a tenth of a bandwidth
    const cases: Array<[BvdModel, Float64Array]> = [
      [CERAMIC, linGrid(0.9 * CER_FS, 1.15 * CER_FS, 5001)],
      [TF1, linGrid(32_700, 32_850, 5001)],
      [X1, linGrid(0.998 * FS, 1.003 * FS, 5001)],
    ];
    for (const [model, f] of cases) {
      const b = model.branches[0];
      const bw = b.fsHz * 2 * Math.PI * b.fsHz * b.r1Ohm * b.c1F;
      for (let seed = 1; seed <= 5; seed++) {
        const r = find(model, f, -60, seed);
        expect(r.resonances).toHaveLength(1);
        expect(Math.abs(r.resonances[0].fsHz - b.fsHz)).toBeLessThan(0.1 * bw);
        expect(r.noiseRelative).toBeGreaterThan(2e-4);
        expect(r.noiseRelative).toBeLessThan(2e-3);
      }
    }
  });

  it('says "capacitive only between 3.97 and 4.03 MHz" for a sweep below the resonance', () => {
    // issue 3 item 6: a sweep that shows no resonance is a clear error, not garbage numbers
    const part: BvdModel = { c0F: 5e-12, branches: [{ fsHz: 4.2e6, r1Ohm: 50, c1F: 20e-15 }] };
    const r = find(part, linGrid(3.97e6, 4.03e6, 801), -70, 1, 'a1-narrow.s1p');
    expect(r.resonances).toEqual([]);
    expect(r.diagnostics).toEqual([{ code: 'no-resonance', severity: 'error', sweep: 'a1-narrow.s1p', message: 'sweep a1-narrow.s1p: no resonance: capacitive only between 3.97 and 4.03 MHz' }]);
  });

  it('says "inductive only" between the resonance and the anti-resonance', () => {
    const r = find(X1, linGrid(FS + 5000, FS + 20_000, 401), -70);
    // The conductance still rises toward fs at the lower edge: that is said too.
    expect(r.diagnostics.map((d) => d.message)).toEqual([
      'sweep x.s1p: conductance rises to the sweep edge at 15.92049 MHz; a resonance may lie just outside — widen the span',
      'sweep x.s1p: no resonance: inductive only between 15.92 and 15.94 MHz',
    ]);
  });

  it('flags a resonance cut by the sweep edge and one whose peak lies outside', () => {
    const cut = find(X1, linGrid(FS - 100, FS + 1600, 801));
    expect(cut.resonances[0].atEdge).toBe(true);
    expect(cut.resonances[0].atBoundary).toBe(false);
    expect(cut.diagnostics.map((d) => d.code)).toEqual(['resonance-at-edge']);
    const outside = find(X1, linGrid(FS + 400, FS + 2000, 401));
    expect(outside.resonances[0].atBoundary).toBe(true);
    expect(outside.diagnostics[0].severity).toBe('warning');
    expect(outside.diagnostics[0].message).toMatch(/^sweep x\.s1p: conductance rises to the sweep edge at 15\.91589 MHz/);
  });

  it('flags two modes closer than the sweep resolves', () => {
    // X1 plus an equal branch 0.4 bandwidths above: one broad peak that no single mode fits
    const two: BvdModel = { c0F: 3e-12, branches: [X1.branches[0], { fsHz: FS + 130, r1Ohm: 20, c1F: 10e-15 }] };
    const r = find(two, linGrid(FS - 2000, FS + 2000, 801), -70);
    expect(r.resonances).toHaveLength(1);
    expect(r.resonances[0].unresolved).toBe(true);
    expect(r.diagnostics.some((d) => d.code === 'modes-unresolved')).toBe(true);
    // …while X1 alone at the same noise is a clean single mode.
    expect(find(X1, linGrid(FS - 2000, FS + 2000, 801), -70).resonances[0].unresolved).toBe(false);
  });

  it('counts points per bandwidth of a coarse sweep', () => {
    // FIELD.md §3.3: X1 half-power width 318.31 Hz; 50 Hz steps give 6.4 points
    const r = find(X1, linGrid(FS - 5000, FS + 5000, 201));
    expect(r.resonances[0].stepHz).toBeCloseTo(50, 6);
    expect(r.resonances[0].pointsPerBandwidth).toBeCloseTo(318.30989 / 50, 3);
  });
});
