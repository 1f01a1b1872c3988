/**
 * The negative-resistance curve: each point equals the network at that load (pierce-network.ts is
 * checked against SPICE in pierce-network-spice.test.ts), and the magnitude falls as the load grows.
 */
import { describe, expect, it } from 'vitest';
import { CURVE_POINTS, negativeResistanceCurve } from '../../../src/lib/osc/negative-resistance-curve.ts';
import { impedanceSeenByMotionalBranch } from '../../../src/lib/osc/pierce-network.ts';
import { loadFrequencyHz } from '../../../src/lib/osc/load.ts';
import { DEMO_CIRCUIT, X1 } from '../../site/fixture.ts';

describe('negative resistance against load capacitance', () => {
  const curve = negativeResistanceCurve({
    model: X1,
    mainBranch: 0,
    circuit: DEMO_CIRCUIT,
    esrMaxOhm: 60,
    chosenClF: 10e-12,
  })!;

  it('rises to a peak and then falls as the capacitors grow (≈ 1/(ω²CaCb) at large loads)', () => {
    const peak = curve.motionalOhm.indexOf(Math.max(...curve.motionalOhm));
    expect(peak).toBeGreaterThan(0);
    expect(peak).toBeLessThan(curve.clF.length - 1);
    for (let k = 1; k < curve.clF.length; k++) {
      expect(curve.clF[k]).toBeGreaterThan(curve.clF[k - 1]);
      if (k > peak) expect(curve.motionalOhm[k]).toBeLessThan(curve.motionalOhm[k - 1]);
    }
  });

  it('the motional branch sees less than the pins (C0 shunts part of the gain)', () => {
    curve.motionalOhm.forEach((m, k) => expect(m).toBeLessThan(curve.pinsOhm[k]));
  });

  it('each point is the network at the load resonance of its own CL', () => {
    const k = 11;
    const c = DEMO_CIRCUIT;
    // invert CL for the equal external capacitor: Ca = x + Cin + Cb..., checked by recomputing
    const x = 1e-12 * 40 ** (k / (CURVE_POINTS - 1));
    const ca = x + c.inputCapacitanceF + c.boardStrayF;
    const cb = x + c.outputCapacitanceF + c.boardStrayF;
    const cl = (ca * cb) / (ca + cb) + c.pinToPinStrayF;
    expect(curve.clF[k]).toBeCloseTo(cl, 20);
    const f = loadFrequencyHz(X1.branches[0], X1.c0F, cl);
    const z = impedanceSeenByMotionalBranch({ gmS: c.gmS, caF: ca, cbF: cb, pinToPinF: c.pinToPinStrayF }, X1.c0F, f);
    expect(curve.motionalOhm[k]).toBeCloseTo(-z.reOhm, 9);
    expect(curve.r1Ohm).toBe(20);
    expect(curve.esrMaxOhm).toBe(60);
  });
});
