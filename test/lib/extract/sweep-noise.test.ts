import { describe, expect, it } from 'vitest';
import { sweepNoise, LOCAL_NOISE_BLOCK } from '../../../src/lib/extract/sweep-noise.ts';
import { partAlone, type AdmittanceSweep } from '../../../src/lib/extract/part-alone.ts';
import { admittanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';
import { gaussian } from '../../support/rng.ts';
import { linGrid, synthSweep } from './synthetic.ts';

// Reference resonator X1 (invented; IEEE Std 177 model) and its C0 alone as a plain capacitor.
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const CAP: BvdModel = { c0F: 3e-12, branches: [] };
// synthetic.ts noise: each component of Z gets |Z|·σc·N(0, 1), σc = 10^(dB/20)/√2.
const sigmaC = (db: number) => 10 ** (db / 20) / Math.SQRT2;

function noiseOf(s: Pick<AdmittanceSweep, 'gS' | 'bS'>) {
  return sweepNoise(
    s.gS,
    s.bS,
    Float64Array.from(s.gS, (g, i) => Math.hypot(g, s.bS[i])),
  );
}

describe('sweepNoise', () => {
  it('recovers the relative noise of a seeded sweep over the whole sweep within 10 %', () => {
    // relative noise on Z is relative noise on Y per component (first order, common practice)
    for (let seed = 1; seed <= 5; seed++) {
      const s = partAlone(synthSweep(CAP, linGrid(15e6, 17e6, 2001), { noiseDb: -60, seed }));
      expect(Math.abs(noiseOf(s).relative / sigmaC(-60) - 1)).toBeLessThan(0.1);
    }
  });

  it('tells a quiet half of the sweep from a noisy half where the sweep-wide figure tells neither', () => {
    // −80 dB then −40 dB relative noise: each half's local estimate within a factor 1.5 of its own level
    for (let seed = 1; seed <= 3; seed++) {
      const f = linGrid(15e6, 17e6, 2001);
      const z = synthSweep(CAP, f);
      const g = gaussian(seed);
      for (let i = 0; i < f.length; i++) {
        const s = (i < 1000 ? sigmaC(-80) : sigmaC(-40)) * Math.hypot(z.zRe[i], z.zIm[i]);
        z.zRe[i] += s * g();
        z.zIm[i] += s * g();
      }
      const n = noiseOf(partAlone(z));
      const quiet = n.relativeAt(300) / sigmaC(-80);
      const noisy = n.relativeAt(1700) / sigmaC(-40);
      expect(quiet).toBeGreaterThan(1 / 1.5);
      expect(quiet).toBeLessThan(1.5);
      expect(noisy).toBeGreaterThan(1 / 1.5);
      expect(noisy).toBeLessThan(1.5);
      expect(n.relative / sigmaC(-80)).toBeGreaterThan(2);
      expect(n.relative / sigmaC(-40)).toBeLessThan(0.5);
    }
  });

  it('estimates constant absolute noise of G (as a fixture far from its accurate range gives) within 10 % on average', () => {
    // absolute complex noise of 1 µS on Y: every window within a factor 2, the mean of the windows within 10 %
    for (let seed = 1; seed <= 3; seed++) {
      const f = linGrid(15e6, 17e6, 2001);
      const g = gaussian(seed);
      const gS = new Float64Array(f.length);
      const bS = new Float64Array(f.length);
      f.forEach((fr, i) => {
        const [re, im] = admittanceAt(CAP, fr);
        gS[i] = re + 1e-6 * g();
        bS[i] = im + 1e-6 * g();
      });
      const n = noiseOf({ gS, bS });
      let sum = 0;
      let count = 0;
      for (let i = 0; i < f.length; i += LOCAL_NOISE_BLOCK) {
        const v = n.conductanceAt(i) / 1e-6;
        expect(v).toBeGreaterThan(0.5);
        expect(v).toBeLessThan(2);
        sum += v;
        count++;
      }
      expect(Math.abs(sum / count - 1)).toBeLessThan(0.1);
      expect(Math.abs(n.backgroundAt(1000))).toBeLessThan(1e-6);
    }
  });

  it("is not fooled by a resonance's own curvature: 8 local deviations stay below a tenth of the peak", () => {
    // noiseless X1 (half-power width fs/Q = 318.31 Hz) sampled at 1 to 100 points per bandwidth
    for (const perBw of [1, 2, 4, 8, 16, 32, 100]) {
      const step = 318.31 / perBw;
      const s = partAlone(synthSweep(X1, linGrid(FS - 1000 * step, FS + 1000 * step, 2001)));
      const n = noiseOf(s);
      const g0 = s.gS[1000];
      expect(8 * n.relativeAt(1000) * Math.hypot(g0, s.bS[1000]), `${perBw} relative`).toBeLessThan(0.1 * g0);
      expect(8 * n.conductanceAt(1000), `${perBw} absolute`).toBeLessThan(0.1 * g0);
    }
  });
});
