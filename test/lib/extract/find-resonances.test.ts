import { describe, expect, it } from 'vitest';
import { findResonances } from '../../../src/lib/extract/find-resonances.ts';
import { partAlone, type AdmittanceSweep } from '../../../src/lib/extract/part-alone.ts';
import { parallelResonanceOf, zeroPhaseOf } from '../../../src/lib/extract/closed-form.ts';
import { admittanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';
import { gaussian } from '../../support/rng.ts';
import { fsOf, linGrid, synthSweep } from './synthetic.ts';

// Reference resonators X1 and TF1 and an illustrative ceramic resonator (invented, values from
// memory; IEEE Std 177 model).
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const TF1: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
const CER_FS = fsOf(0.385e-3, 4.1e-12);
const CERAMIC: BvdModel = { c0F: 20.6e-12, branches: [{ fsHz: CER_FS, r1Ohm: 8, c1F: 4.1e-12 }] };

function find(model: BvdModel, f: Float64Array, noiseDb?: number, seed = 1, source = 'x.s1p') {
  return findResonances(partAlone(synthSweep(model, f, { noiseDb, seed, source })));
}

/** A Lorentzian conductance bump added to a sweep, with or without the susceptance swing of a resonance. */
interface Bump {
  fHz: number;
  g0S: number;
  bandwidthHz: number;
  swing: boolean;
}

/**
 * Admittance of the model plus complex noise of constant absolute size `sigmaS` on Y: what a
 * reflection or shunt-through record gives where |Z| ≫ Z0, since there dY/dS is about constant
 * (reflection, Y = (1 − S11)/(Z0(1 + S11)), dY/dS11 → −1/(2Z0) as S11 → 1).
 */
function admittanceSweep(model: BvdModel, f: Float64Array, sigmaS: number, seed: number, bump?: Bump): AdmittanceSweep {
  const n = f.length;
  const gS = new Float64Array(n);
  const bS = new Float64Array(n);
  const zRe = new Float64Array(n);
  const zIm = new Float64Array(n);
  const g = gaussian(seed);
  for (let i = 0; i < n; i++) {
    let [re, im] = admittanceAt(model, f[i]);
    if (bump) {
      const u = (2 * (f[i] - bump.fHz)) / bump.bandwidthHz;
      re += bump.g0S / (1 + u * u);
      if (bump.swing) im -= (bump.g0S * u) / (1 + u * u);
    }
    gS[i] = re + sigmaS * g();
    bS[i] = im + sigmaS * g();
    const d = gS[i] * gS[i] + bS[i] * bS[i];
    zRe[i] = gS[i] / d;
    zIm[i] = -bS[i] / d;
  }
  return { freqHz: f, gS, bS, zRe, zIm, source: 'y.s1p' };
}

describe('findResonances', () => {
  it('finds X1 at fs with R1 = 1/Gmax and its zero-phase and |Z|-maximum frequencies', () => {
    // Gmax = 1/R1 at fs (derived from the BVD model); fr, fa, fn of X1 (IEEE Std 177 symbols;
    // mpmath: fn − fp = +0.953308 Hz)
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

  it('takes no noise near the anti-resonance for a mode when the noise of Y is constant, not proportional to |Y|', () => {
    // X1 over 0.999…1.004 fs with 1 µS to 100 µS of absolute noise on Y: near fa (|Y| ≈ 2 µS) the
    // relative noise is hundreds of per cent (derived from the fixture conversions), at fs (|Y| ≈ 50 mS) it stays small
    const f = linGrid(0.999 * FS, 1.004 * FS, 2001);
    for (const sigmaS of [1e-6, 1e-5, 3e-5, 1e-4]) {
      for (let seed = 1; seed <= 5; seed++) {
        const r = findResonances(admittanceSweep(X1, f, sigmaS, seed));
        const inner = r.resonances.filter((x) => !x.atBoundary);
        expect(inner, `σ ${sigmaS} S seed ${seed}`).toHaveLength(1);
        expect(Math.abs(inner[0].fsHz - FS)).toBeLessThan(0.1 * 318.31);
      }
    }
  });

  it('ignores a conductance bump without the susceptance swing of a resonance, and finds it with the swing', () => {
    // a bump 10 noise deviations high and 150 Hz wide on a plain capacitor (derived from the BVD model: a mode's
    // admittance traces a circle, so B swings by Gmax across it); 20 seeded trials each
    const f = linGrid(FS - 20_000, FS + 20_000, 2001);
    const cap: BvdModel = { c0F: 3e-12, branches: [] };
    let withSwing = 0;
    let without = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const bump = { fHz: FS + 123, g0S: 10e-6, bandwidthHz: 150 };
      withSwing += findResonances(admittanceSweep(cap, f, 1e-6, seed, { ...bump, swing: true })).resonances.filter(
        (x) => !x.atBoundary,
      ).length;
      const r = findResonances(admittanceSweep(cap, f, 1e-6, seed, { ...bump, swing: false }));
      without += r.resonances.filter((x) => !x.atBoundary).length;
      if (r.diagnostics.some((d) => d.code === 'signal-to-noise')) {
        expect(r.diagnostics[0].message).toMatch(
          /^sweep y\.s1p: \d+ conductance peaks? without the susceptance swing of a resonance ignored as noise$/,
        );
      }
    }
    expect(withSwing).toBeGreaterThanOrEqual(18);
    expect(without).toBe(0);
  });

  it('keeps one resonance when two maxima of one peak refine onto the same fs', () => {
    // noiseless X1 at 159 points per bandwidth with a 3 % notch over the top five points
    const s = partAlone(synthSweep(X1, linGrid(FS - 1600, FS + 1600, 1601)));
    for (let k = -2; k <= 2; k++) s.gS[800 + k] *= 0.97;
    const r = findResonances(s);
    expect(r.resonances).toHaveLength(1);
    expect(Math.abs(r.resonances[0].fsHz - FS)).toBeLessThan(0.1);
  });

  it('says "capacitive only between 3.97 and 4.03 MHz" for a sweep below the resonance', () => {
    // issue 3 item 6: a sweep that shows no resonance is a clear error, not garbage numbers
    const part: BvdModel = { c0F: 5e-12, branches: [{ fsHz: 4.2e6, r1Ohm: 50, c1F: 20e-15 }] };
    const r = find(part, linGrid(3.97e6, 4.03e6, 801), -70, 1, 'a1-narrow.s1p');
    expect(r.resonances).toEqual([]);
    expect(r.diagnostics).toEqual([
      {
        code: 'no-resonance',
        severity: 'error',
        sweep: 'a1-narrow.s1p',
        message:
          'sweep a1-narrow.s1p: no resonance: capacitive only between 3.97 and 4.03 MHz; sweep across the expected resonance, and check the fixture and the frequency unit',
      },
    ]);
  });

  it('says "inductive only" between the resonance and the anti-resonance', () => {
    const r = find(X1, linGrid(FS + 5000, FS + 20_000, 401), -70);
    // The conductance still rises toward fs at the lower edge: that is said too.
    expect(r.diagnostics.map((d) => d.message)).toEqual([
      'sweep x.s1p: conductance rises to the sweep edge at 15.92049 MHz; a resonance may lie just outside — widen the span',
      'sweep x.s1p: no resonance: inductive only between 15.92 and 15.94 MHz; sweep across the expected resonance, and check the fixture and the frequency unit',
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
    expect(outside.diagnostics[0].message).toMatch(
      /^sweep x\.s1p: conductance rises to the sweep edge at 15\.91589 MHz/,
    );
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
    // X1 half-power width fs/Q = 318.31 Hz; 50 Hz steps give 6.4 points
    const r = find(X1, linGrid(FS - 5000, FS + 5000, 201));
    expect(r.resonances[0].stepHz).toBeCloseTo(50, 6);
    expect(r.resonances[0].pointsPerBandwidth).toBeCloseTo(318.30989 / 50, 3);
  });
});
