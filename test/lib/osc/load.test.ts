import { describe, expect, it } from 'vitest';
import {
  loadCapacitanceForHz,
  loadCapacitanceForWithLoss,
  loadFrequencyHz,
  loadOffsetPpm,
  loadResistanceOhm,
  loadResonanceWithLoss,
  pullingPpm,
  trimSensitivityPpmPerPf,
} from '../../../src/lib/osc/load.ts';
import { engineImpedance, ngspiceImpedance, type ImpedanceRow } from '../../support/spice.ts';
import { requireTool } from '../../support/tools.ts';
import { LOAD_CASES, seriesLoadDeck, TF1, X1 } from '../models/spice-cases.ts';

const x1 = X1.branches[0];
const tf1 = TF1.branches[0];
const pF = 1e-12;

// Check table for X1 (IEEE Std 177 BVD model; values computed independently with mpmath):
// CL, fL exact lossless (Hz), DL exact / approx (ppm), fL with R1 (Hz), RL numeric / formula (Ω), S (ppm/pF, approximate form)
const TABLE: Array<[number, number, number, number, number, number, number, number]> = [
  [8, 15922726.981, 454.4422, 454.5455, 15922728.295, 37.8151, 37.8125, 41.3223],
  [10, 15921614.476, 384.5414, 384.6154, 15921615.718, 33.8021, 33.8, 29.5858],
  [12, 15920798.59, 333.2778, 333.3333, 15920799.784, 31.2518, 31.25, 22.2222],
  [20, 15918953.823, 217.3677, 217.3913, 15918954.922, 26.4513, 26.45, 9.4518],
];

describe('load resonance of X1 against the mpmath check table', () => {
  for (const [cl, fl, dlExact, dlApprox, flR1, rlNum, rlFormula, s] of TABLE) {
    it(`gives fL, DL, RL and trim sensitivity at ${cl} pF as tabulated`, () => {
      expect(loadFrequencyHz(x1, X1.c0F, cl * pF)).toBeCloseTo(fl, 3);
      const dl = loadOffsetPpm(x1, X1.c0F, cl * pF);
      expect(dl.exact).toBeCloseTo(dlExact, 4);
      expect(dl.approx).toBeCloseTo(dlApprox, 4);
      const withLoss = loadResonanceWithLoss(X1, 0, cl * pF);
      expect(withLoss.ok).toBe(true);
      if (!withLoss.ok) return;
      expect(withLoss.freqHz).toBeCloseTo(flR1, 3);
      expect(withLoss.rlOhm).toBeCloseTo(rlNum, 4);
      expect(loadResistanceOhm(x1.r1Ohm, X1.c0F, cl * pF)).toBeCloseTo(rlFormula, 4);
      const sens = trimSensitivityPpmPerPf(x1, X1.c0F, cl * pF);
      // The check table holds the approximate S; the exact one is −dDL/dCL of the exact DL
      // (checked here by a central difference over ±0.001 pF).
      expect(sens.approx).toBeCloseTo(s, 4);
      const h = 0.001 * pF;
      const numeric =
        -(loadOffsetPpm(x1, X1.c0F, cl * pF + h).exact - loadOffsetPpm(x1, X1.c0F, cl * pF - h).exact) / 0.002;
      expect(sens.exact).toBeCloseTo(numeric, 5);
      expect(sens.exact).toBeLessThan(sens.approx);
    });
  }

  it('gives the pulling from 10 to 20 pF (167.2241 approx, 167.1738 exact ppm)', () => {
    const p = pullingPpm(x1, X1.c0F, 10 * pF, 20 * pF);
    expect(p.approx).toBeCloseTo(167.2241, 4);
    expect(p.exact).toBeCloseTo(167.1738, 4);
  });

  it('gives TF1 at 12.5 pF DL 109.4891 ppm approx and 109.4831 ppm exact', () => {
    const dl = loadOffsetPpm(tf1, TF1.c0F, 12.5 * pF);
    expect(dl.approx).toBeCloseTo(109.4891, 4);
    expect(dl.exact).toBeCloseTo(109.4831, 4);
  });

  it('gives the overtone pulling of one plate (10 MHz plate, C0 4 pF, CL 10 pF)', () => {
    // C1n ≈ C1/n² (QCM review, Sensors 21(10):3490, 2021): 714.2857 / 79.3651 / 28.5714 ppm, approx form.
    const plate = (c1F: number) => ({ fsHz: 10e6, r1Ohm: 10, c1F });
    expect(loadOffsetPpm(plate(20e-15), 4 * pF, 10 * pF).approx).toBeCloseTo(714.2857, 4);
    expect(loadOffsetPpm(plate(20e-15 / 9), 4 * pF, 10 * pF).approx).toBeCloseTo(79.3651, 4);
    expect(loadOffsetPpm(plate(20e-15 / 25), 4 * pF, 10 * pF).approx).toBeCloseTo(28.5714, 4);
    // r = C0/C1: 1800 for n = 3, 5000 for n = 5.
    expect((4 * pF) / (20e-15 / 9)).toBeCloseTo(1800, 6);
    expect((4 * pF) / (20e-15 / 25)).toBeCloseTo(5000, 6);
  });

  it('solves the load capacitance that hits a frequency exactly, lossless and with R1', () => {
    // Round trip through the check table's 8 pF row.
    const lossless = loadCapacitanceForHz(x1, X1.c0F, 15922726.981);
    expect(lossless.ok && lossless.clF / pF).toBeCloseTo(8, 5);
    const lossy = loadCapacitanceForWithLoss(X1, 0, 15922728.295);
    expect(lossy.ok && lossy.clF / pF).toBeCloseTo(8, 5);
  });

  it('reports why no load capacitance reaches a frequency at or below fs', () => {
    const r = loadCapacitanceForHz(x1, X1.c0F, x1.fsHz * (1 - 1e-6));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/not above fs/);
    const high = loadCapacitanceForHz(x1, X1.c0F, x1.fsHz * (1 + 2000e-6));
    expect(high.ok).toBe(false);
  });

  it('reports a missing zero-phase load resonance for a very lossy part instead of a number', () => {
    const lossy = { c0F: 3 * pF, branches: [{ fsHz: x1.fsHz, r1Ohm: 20000, c1F: x1.c1F }] };
    const r = loadResonanceWithLoss(lossy, 0, 8 * pF);
    expect(r.ok).toBe(false);
  });
});

/** Lower zero of Im Z (crystal + series CL): first − to + sign change, linear interpolation. */
function zeroPhase(rows: ImpedanceRow[]): number {
  for (let i = 1; i < rows.length; i++) {
    const [f0, , x0] = rows[i - 1];
    const [f1, , x1v] = rows[i];
    if (x0 < 0 && x1v >= 0) return f0 + ((f1 - f0) * -x0) / (x1v - x0);
  }
  throw new Error('no zero-phase point in the sweep');
}

function loadSuite(name: string, run: (deck: string) => Promise<ImpedanceRow[]> | ImpedanceRow[]): void {
  for (const c of LOAD_CASES) {
    it(`${name}: the zero phase of X1 + series ${c.clF / pF} pF matches fL with R1 (mpmath check value)`, async () => {
      const rows = await run(seriesLoadDeck(c.clF, c.sweep));
      const simHz = zeroPhase(rows);
      const ours = loadResonanceWithLoss(X1, 0, c.clF);
      expect(ours.ok).toBe(true);
      if (!ours.ok) return;
      // Simulator vs our solver: within 1e-4 Hz (6e-12 relative); both vs the 3-decimal mpmath check value.
      expect(Math.abs(simHz - ours.freqHz)).toBeLessThan(1e-4);
      expect(Math.abs(simHz - c.fieldFlWithR1Hz)).toBeLessThan(6e-4);
      // The lossless form sits about 1.1–1.3 Hz lower: the simulation tells them apart.
      expect(simHz - loadFrequencyHz(x1, X1.c0F, c.clF)).toBeGreaterThan(1);
    });
  }
}

describe('fL(CL) against a SPICE simulation of X1 with a series capacitor (eecircuit-engine)', () => {
  loadSuite('eecircuit-engine', (deck) => engineImpedance(deck));
});

describe.skipIf(!requireTool('ngspice'))('fL(CL) against Debian ngspice', () => {
  loadSuite('ngspice', (deck) => ngspiceImpedance(deck));
});
