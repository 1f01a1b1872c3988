import { describe, expect, it } from 'vitest';
import { synthesizeSweep, type SynthSweepSpec } from '../../../src/lib/synth/synth-sweep.ts';
import { synthesizeCompensation } from '../../../src/lib/synth/synth-compensation.ts';
import { sParametersOf } from '../../../src/lib/synth/fixture-network.ts';
import { networkToImpedance } from '../../../src/lib/fixture/to-impedance.ts';
import { compensateOpenShort } from '../../../src/lib/fixture/compensation.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import type { ImpedanceSweep, NetworkData } from '../../../src/lib/sweep/sweep.ts';
import type { Fixture } from '../../../src/lib/schema/part.ts';

// Reference resonator X1 (synthetic, not a real part): L1 = 10 mH, C1 = 10 fF,
// R1 = 20 Ω, C0 = 3 pF, ωs = 1e8 rad/s exactly.
const X1_FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: X1_FS, r1Ohm: 20, c1F: 10e-15 }] };
const X1_FP = X1_FS * Math.sqrt(1 + 10e-15 / 3e-12);

/** A pure resistance at one frequency: a lossy branch exactly at its series resonance, no C0. */
function resistorAt(freqHz: number, ohm: number): BvdModel {
  return { c0F: 0, branches: [{ fsHz: freqHz, r1Ohm: ohm, c1F: 1e-12 }] };
}

function maxRelativeError(a: ImpedanceSweep, b: ImpedanceSweep): number {
  let worst = 0;
  for (let i = 0; i < a.freqHz.length; i++) {
    const d = Math.hypot(a.zRe[i] - b.zRe[i], a.zIm[i] - b.zIm[i]) / Math.hypot(b.zRe[i], b.zIm[i]);
    worst = Math.max(worst, d);
  }
  return worst;
}

function conditionOf(n: NetworkData, fixture: Fixture, i: number): number {
  if (fixture === 'impedance') return 1;
  const k = fixture === 'reflection' ? 0 : 2;
  const re = n.re[k][i];
  const im = n.im[k][i];
  const oneMinus = Math.hypot(1 - re, im);
  if (fixture !== 'reflection') return 1 / oneMinus;
  return (2 * Math.hypot(re, im)) / (oneMinus * Math.hypot(1 + re, im));
}

const CASES: Array<{ fixture: Fixture; ports?: 1 | 2; parameter?: 'Z' | 'Y' }> = [
  { fixture: 'reflection', ports: 1 },
  { fixture: 'reflection', ports: 2 },
  { fixture: 'series-thru' },
  { fixture: 'shunt-thru' },
  { fixture: 'impedance', parameter: 'Z' },
  { fixture: 'impedance', parameter: 'Y' },
];

describe('synthesizeSweep, noiseless', () => {
  for (const c of CASES) {
    const name = `${c.fixture}${c.ports ? ` ${c.ports}-port` : ''}${c.parameter ? ` ${c.parameter}` : ''}`;
    it(`${name}: the recorded network converts back to the model impedance within 1e-12 around fs`, () => {
      const s = synthesizeSweep({
        model: X1,
        grid: { kind: 'centered', centerHz: X1_FS, spanHz: 3000, points: 301 },
        ...c,
      });
      // Inverse conversion written independently (src/lib/fixture/to-impedance.ts, conversions derived from the circuit).
      const back = networkToImpedance(s.network, c.fixture, 'x');
      expect(maxRelativeError(back, s.part)).toBeLessThan(1e-12);
      expect(maxRelativeError(s.measured, s.part)).toBeLessThan(1e-12);
    });

    it(`${name}: around fp (|Z| ≈ 550 kΩ) the round trip is exact to the conditioning of the inverse formula`, () => {
      const s = synthesizeSweep({
        model: X1,
        grid: { kind: 'centered', centerHz: X1_FP, spanHz: 3000, points: 301 },
        ...c,
      });
      const back = networkToImpedance(s.network, c.fixture, 'x');
      for (let i = 0; i < back.freqHz.length; i++) {
        const err =
          Math.hypot(back.zRe[i] - s.part.zRe[i], back.zIm[i] - s.part.zIm[i]) /
          Math.hypot(s.part.zRe[i], s.part.zIm[i]);
        // Relative condition number of Z(S) (derived from the fixture conversions): reflection 2|S|/|1 − S²|,
        // series-thru 1/|1 − S21|, shunt-thru 1/|1 − S21|; 1 for Z/Y records.
        expect(err).toBeLessThan(32 * Number.EPSILON * (1 + conditionOf(s.network, c.fixture, i)));
      }
    });
  }

  it('reproduces the mpmath X1 impedance at fs (19.99928 − j0.119996 Ω) and at 16 MHz', () => {
    // check X1 (IEEE Std 177 model, mpmath values rounded to 7 digits).
    const s = synthesizeSweep({ model: X1, grid: { kind: 'explicit', freqHz: [X1_FS, 16e6] }, fixture: 'impedance' });
    expect(s.network.re[0][0]).toBeCloseTo(19.99928, 5);
    expect(s.network.im[0][0]).toBeCloseTo(-0.119996, 6);
    expect(s.network.re[0][1]).toBeCloseTo(4.153896, 6);
    expect(s.network.im[0][1]).toBeCloseTo(-4826.817, 3);
  });

  it('gives the mpmath check S-parameters of a 20 Ω device in each fixture', () => {
    // check values (mpmath), Z = 20 Ω: S11 = −0.428571, series S21 = 0.833333, shunt S21 = 0.444444.
    const f = 16e6;
    const grid = { kind: 'explicit' as const, freqHz: [f] };
    const refl = synthesizeSweep({ model: resistorAt(f, 20), grid, fixture: 'reflection' });
    expect(refl.network.re[0][0]).toBeCloseTo(-0.428571, 6);
    expect(refl.network.im[0][0]).toBeCloseTo(0, 12);
    const series = synthesizeSweep({ model: resistorAt(f, 20), grid, fixture: 'series-thru' });
    expect(series.network.re[2][0]).toBeCloseTo(0.833333, 6);
    expect(series.network.re[1][0]).toBeCloseTo(0.833333, 6); // reciprocal: S12 = S21
    const shunt = synthesizeSweep({ model: resistorAt(f, 20), grid, fixture: 'shunt-thru' });
    expect(shunt.network.re[2][0]).toBeCloseTo(0.444444, 6);
  });

  it('gives the mpmath check S-parameters of 20 + j30 Ω (resistor plus series fixture inductance)', () => {
    // check values (mpmath), Z = 20 + j30 Ω: S11 = −0.206897 + j0.517241; series S21 = 0.784314 − j0.196078;
    // shunt S21 = 0.615385 + j0.256410.
    const f = 16e6;
    const grid = { kind: 'explicit' as const, freqHz: [f] };
    const parasitics = { lsH: 30 / (2 * Math.PI * f) };
    const pick = (fixture: Fixture, k: number) => {
      const n = synthesizeSweep({ model: resistorAt(f, 20), grid, fixture, parasitics }).network;
      return [n.re[k][0], n.im[k][0]];
    };
    const [a, b] = pick('reflection', 0);
    expect(a).toBeCloseTo(-0.206897, 6);
    expect(b).toBeCloseTo(0.517241, 6);
    const [c, d] = pick('series-thru', 2);
    expect(c).toBeCloseTo(0.784314, 6);
    expect(d).toBeCloseTo(-0.196078, 6);
    const [e, g] = pick('shunt-thru', 2);
    expect(e).toBeCloseTo(0.615385, 6);
    expect(g).toBeCloseTo(0.25641, 6);
  });

  it('sParametersOf takes the open-circuit limits when the impedance is infinite', () => {
    // Limits of the fixture conversions for Z → ∞ (derived).
    expect(sParametersOf(null, 'reflection', 50, 1)[0]).toEqual({ re: 1, im: 0 });
    expect(sParametersOf(null, 'series-thru', 50, 2)[2]).toEqual({ re: 0, im: 0 });
    expect(sParametersOf(null, 'shunt-thru', 50, 2)[2]).toEqual({ re: 1, im: 0 });
  });
});

describe('synthesizeSweep, fixture parasitics and added capacitors', () => {
  it('puts series Rs, Ls toward the instrument and Cp across the part (mpmath check value)', () => {
    // check value (mpmath): 16 MHz, Rs = 0.5 Ω, Ls = 5 nH, Cp = 1 pF, DUT 20 Ω → Zm = 20.499919 + j0.462443 Ω.
    const f = 16e6;
    const s = synthesizeSweep({
      model: resistorAt(f, 20),
      grid: { kind: 'explicit', freqHz: [f] },
      fixture: 'reflection',
      parasitics: { rsOhm: 0.5, lsH: 5e-9, cpF: 1e-12 },
    });
    expect(s.impedance.zRe[0]).toBeCloseTo(20.499919, 6);
    expect(s.impedance.zIm[0]).toBeCloseTo(0.462443, 6);
    expect(s.part.zRe[0]).toBeCloseTo(20, 12);
  });

  it('open/short sweeps of the same fixture compensate back to the part (exact O/S)', () => {
    const parasitics = { rsOhm: 0.5, lsH: 5e-9, cpF: 1e-12 };
    for (const fixture of ['reflection', 'series-thru', 'shunt-thru', 'impedance'] as const) {
      const s = synthesizeSweep({
        model: X1,
        grid: { kind: 'centered', centerHz: X1_FS, spanHz: 60e3, points: 401 },
        fixture,
        parasitics,
      });
      // The standards on their own, coarser grid; the loader interpolates them (linear in f).
      const comp = synthesizeCompensation({
        parasitics,
        grid: { kind: 'centered', centerHz: X1_FS, spanHz: 80e3, points: 81 },
        fixture,
      });
      const zm = networkToImpedance(s.network, fixture, 'dut');
      const zo = networkToImpedance(comp.open.network, fixture, 'open');
      const zs = networkToImpedance(comp.short.network, fixture, 'short');
      const z = compensateOpenShort(zm, zo, zs);
      // Linear interpolation of Zom ∝ 1/f over 1 kHz steps leaves ≈ (Δf/f)²/8 = 5e-10 relative in
      // the open, amplified near fp by |Zdut|/|Zom| ≈ 50 (derived): a few 1e-8.
      expect(maxRelativeError(z, s.part), fixture).toBeLessThan(1e-7);
      expect(maxRelativeError(zm, s.part), fixture).toBeGreaterThan(1e-3);
    }
  });

  it('a series or a parallel added capacitor moves the lossless resonance to fs·√(1 + C1/(C0 + CL))', () => {
    // series CL (load resonance) and parallel CL (load antiresonance) give the same
    // lossless fL (derived from the BVD model). Nearly lossless X1 (R1 = 1 µΩ), CL = 10 pF.
    const model: BvdModel = { c0F: 3e-12, branches: [{ fsHz: X1_FS, r1Ohm: 1e-6, c1F: 10e-15 }] };
    const cl = 10e-12;
    const fl = X1_FS * Math.sqrt(1 + 10e-15 / (3e-12 + cl));
    // Bisection on the sign of the reactance (series: a zero; parallel: a pole, so use the admittance).
    const reactanceSign = (connection: 'series' | 'parallel', f: number) => {
      const s = synthesizeSweep({
        model,
        grid: { kind: 'explicit', freqHz: [f] },
        fixture: 'impedance',
        added: { capacitanceF: cl, connection },
      });
      const x = s.impedance.zIm[0];
      const r = s.impedance.zRe[0];
      return connection === 'series' ? Math.sign(x) : -Math.sign(x / (r * r + x * x));
    };
    for (const connection of ['series', 'parallel'] as const) {
      let lo = fl - 50;
      let hi = fl + 50;
      expect(reactanceSign(connection, lo)).not.toBe(reactanceSign(connection, hi));
      for (let k = 0; k < 60; k++) {
        const mid = (lo + hi) / 2;
        if (reactanceSign(connection, mid) === reactanceSign(connection, lo)) lo = mid;
        else hi = mid;
      }
      expect(Math.abs((lo + hi) / 2 - fl) / fl, connection).toBeLessThan(1e-10);
    }
  });
});

describe('synthesizeSweep, noise', () => {
  for (const noiseDb of [-80, -70, -60]) {
    it(`adds complex Gaussian noise ${noiseDb} dB relative to each recorded entry`, () => {
      const base: SynthSweepSpec = {
        model: X1,
        grid: { kind: 'centered', centerHz: X1_FS, spanHz: 5000, points: 10001 },
        fixture: 'series-thru',
        seed: 7,
      };
      const clean = synthesizeSweep(base).network;
      const noisy = synthesizeSweep({ ...base, noiseDb }).network;
      let power = 0;
      let sumRe = 0;
      let sumIm = 0;
      let count = 0;
      for (const k of [0, 1, 2, 3]) {
        for (let i = 0; i < clean.freqHz.length; i++) {
          const mag = Math.hypot(clean.re[k][i], clean.im[k][i]);
          const dr = (noisy.re[k][i] - clean.re[k][i]) / mag;
          const di = (noisy.im[k][i] - clean.im[k][i]) / mag;
          power += dr * dr + di * di;
          sumRe += dr;
          sumIm += di;
          count++;
        }
      }
      // 40 004 complex samples: the mean power is within ±0.05 dB at 3 standard deviations
      // (relative std of a chi-square mean with 2N degrees of freedom is 1/√N; common practice).
      expect(10 * Math.log10(power / count)).toBeCloseTo(noiseDb, 1);
      const rms = 10 ** (noiseDb / 20);
      expect(Math.abs(sumRe / count)).toBeLessThan((4 * rms) / Math.sqrt(2 * count));
      expect(Math.abs(sumIm / count)).toBeLessThan((4 * rms) / Math.sqrt(2 * count));
    });
  }

  it('is deterministic per seed and differs between seeds', () => {
    const spec: SynthSweepSpec = {
      model: X1,
      grid: { kind: 'centered', centerHz: X1_FS, spanHz: 3000, points: 101 },
      fixture: 'reflection',
      noiseDb: -70,
      seed: 3,
    };
    const a = synthesizeSweep(spec).network;
    const b = synthesizeSweep(spec).network;
    const c = synthesizeSweep({ ...spec, seed: 4 }).network;
    expect(Array.from(a.re[0])).toEqual(Array.from(b.re[0]));
    expect(Array.from(a.re[0])).not.toEqual(Array.from(c.re[0]));
  });
});
