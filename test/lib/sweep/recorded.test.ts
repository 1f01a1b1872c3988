/**
 * The recorded quantity and its bilinear map Z = (aM + b)/(cM + d) (src/lib/sweep/recorded.ts),
 * as produced by every fixture conversion (src/lib/fixture/to-impedance.ts) and carried through
 * open/short(/load) compensation (src/lib/fixture/compensation.ts).
 *
 * The networks here are written by this test from the device impedance with textbook formulas
 * (not with the project's synthesiser), so the map is checked against an independent forward
 * conversion:
 * - reflection: S11 = (Z − Z0)/(Z + Z0) (definition of the reflection coefficient);
 * - a 2-port with real references Z01, Z02 from its ABCD matrix (Frickey, "Conversions between
 *   S, Z, Y, H, ABCD and T parameters", IEEE Trans. MTT 42(2), 1994, real references):
 *   Δ = A·Z02 + B + C·Z01·Z02 + D·Z01, S11 = (A·Z02 + B − C·Z01·Z02 − D·Z01)/Δ,
 *   S21 = S12 = 2√(Z01·Z02)/Δ (reciprocal), S22 = (−A·Z02 + B − C·Z01·Z02 + D·Z01)/Δ;
 *   series element ABCD = [1 Z; 0 1], shunt element ABCD = [1 0; 1/Z 1];
 * - Y parameters of a π network (series Z between the ports, shunt Ya, Yb to ground):
 *   Y11 = Ya + 1/Z, Y22 = Yb + 1/Z, Y12 = Y21 = −1/Z.
 *
 * Closed forms of |dZ/dM| (derived beside each case from the inverse conversion):
 * - reflection Z = Z0(1 + Γ)/(1 − Γ): dZ/dΓ = 2Z0/(1 − Γ)², 1 − Γ = 2Z0/(Z + Z0)
 *   ⇒ |dZ/dΓ| = |Z + Z0|²/(2Z0).
 * - series-through Z = 2r/S21 − (Z01 + Z02), r = √(Z01·Z02): dZ/dS21 = −2r/S21²,
 *   S21 = 2r/(Z + Z01 + Z02) ⇒ |dZ/dS21| = |Z + Z01 + Z02|²/(2r); equal ports: |Z + 2Z0|²/(2Z0).
 * - shunt-through Z = P·S/(2r − Σ·S), P = Z01·Z02, Σ = Z01 + Z02: dZ/dS = 2rP/(2r − ΣS)²,
 *   2r − ΣS = 2rP/(ΣZ + P) ⇒ |dZ/dS21| = |ΣZ + P|²/(2rP); equal ports: |2Z + Z0|²/(2Z0).
 * - Y record Z = 1/Y (or −1/Y21): |dZ/dY| = 1/|Y|² = |Z|².
 *
 * The device is the reference resonator X1 (synthetic, not a real part: L1 = 10 mH, C1 = 10 fF,
 * R1 = 20 Ω, C0 = 3 pF, ωs = 1e8 rad/s) on a grid from below fs to above fa, so the maps are
 * exercised where they are worst conditioned (|Z| ≈ 5.6e5 Ω at fa).
 */
import { describe, expect, it } from 'vitest';
import {
  compose,
  dZdMAbs,
  IDENTITY,
  impedanceRecord,
  mapAt,
  recordedFor,
  setMap,
  type Bilinear,
  type RecordedQuantity,
} from '../../../src/lib/sweep/recorded.ts';
import { networkToImpedance, type FixtureKind } from '../../../src/lib/fixture/to-impedance.ts';
import { compensateOpenShort, compensateOpenShortLoad } from '../../../src/lib/fixture/compensation.ts';
import { impedanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';
import type { ImpedanceSweep, NetworkData } from '../../../src/lib/sweep/sweep.ts';
import { gaussian } from '../../support/rng.ts';

// ---- complex arithmetic, written here so the checks do not lean on src/lib/sweep/complex.ts
interface C {
  re: number;
  im: number;
}
const c = (re: number, im = 0): C => ({ re, im });
const add = (x: C, y: C): C => c(x.re + y.re, x.im + y.im);
const sub = (x: C, y: C): C => c(x.re - y.re, x.im - y.im);
const mul = (x: C, y: C): C => c(x.re * y.re - x.im * y.im, x.re * y.im + x.im * y.re);
const scale = (x: C, k: number): C => c(x.re * k, x.im * k);
const div = (x: C, y: C): C => {
  const d = y.re * y.re + y.im * y.im;
  return c((x.re * y.re + x.im * y.im) / d, (x.im * y.re - x.re * y.im) / d);
};
const abs = (x: C): number => Math.hypot(x.re, x.im);
const abs2 = (x: C): number => x.re * x.re + x.im * x.im;
const ONE = c(1);
const relErr = (x: C, ref: C): number => abs(sub(x, ref)) / abs(ref);

/** Z = (aM + b)/(cM + d), evaluated here. */
function apply([a, b, cc, d]: Bilinear, m: C): C {
  return div(add(mul(a, m), b), add(mul(cc, m), d));
}

/**
 * |dF/dx| of a holomorphic F by a central difference along the real axis, with a step 1e-4 of
 * `scale` (the distance to the nearest pole or zero, so truncation is ~1e-8 relative). The step
 * is taken as the difference of the two rounded abscissae (exact by Sterbenz's lemma), so the
 * rounding of x ± h does not enter.
 */
function centralDifferenceAbs(f: (x: C) => C, x: C, scaleOf: number): number {
  const h = 1e-4 * scaleOf;
  const xp = x.re + h;
  const xm = x.re - h;
  return abs(sub(f(c(xp, x.im)), f(c(xm, x.im)))) / (xp - xm);
}

/** Distance from m to the pole of the map (cM + d = 0) and to its zero (aM + b = 0), and |m|. */
function safeScale([a, b, cc, d]: Bilinear, m: C): number {
  const toPole = abs(cc) > 0 ? abs(add(mul(cc, m), d)) / abs(cc) : Infinity;
  const toZero = abs(a) > 0 ? abs(add(mul(a, m), b)) / abs(a) : Infinity;
  return Math.min(toPole, toZero, abs(m) > 0 ? abs(m) : 1);
}

// ---- the device: reference resonator X1 (synthetic)
const X1_FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: X1_FS, r1Ohm: 20, c1F: 10e-15 }] };
const X1_FP = X1_FS * Math.sqrt(1 + 10e-15 / 3e-12);
/** 241 points from fs − 2 kHz to fp + 2 kHz, plus fs and fp themselves (explicit, rising). */
const FREQ = (() => {
  const lo = X1_FS - 2000;
  const hi = X1_FP + 2000;
  const f = Array.from({ length: 241 }, (_, i) => lo + ((hi - lo) * i) / 240);
  f.push(X1_FS, X1_FP);
  return Float64Array.from([...new Set(f)].sort((x, y) => x - y));
})();
const Z_DUT: C[] = Array.from(FREQ, (f) => {
  const [r, x] = impedanceAt(X1, f);
  return c(r, x);
});

// ---- forward networks written from the device impedance
function network(parameter: NetworkData['parameter'], z0Ohm: number[], entries: (z: C, f: number) => C[]): NetworkData {
  const ports = z0Ohm.length as 1 | 2;
  const k = ports * ports;
  const re = Array.from({ length: k }, () => new Float64Array(FREQ.length));
  const im = Array.from({ length: k }, () => new Float64Array(FREQ.length));
  FREQ.forEach((f, i) => {
    entries(Z_DUT[i], f).forEach((e, j) => {
      re[j][i] = e.re;
      im[j][i] = e.im;
    });
  });
  return { parameter, ports, z0Ohm, freqHz: FREQ, re, im, source: 'test', format: 'test', comments: [] };
}

/** S of a 2-port from its ABCD matrix, real references (Frickey 1994). Row-major [S11, S12, S21, S22]. */
function sFromAbcd(A: C, B: C, Cc: C, D: C, z01: number, z02: number): C[] {
  const den = add(add(scale(A, z02), B), add(scale(Cc, z01 * z02), scale(D, z01)));
  const s11 = div(sub(add(scale(A, z02), B), add(scale(Cc, z01 * z02), scale(D, z01))), den);
  const s22 = div(add(sub(B, scale(A, z02)), sub(scale(D, z01), scale(Cc, z01 * z02))), den);
  const s21 = div(c(2 * Math.sqrt(z01 * z02)), den);
  return [s11, s21, s21, s22];
}
const seriesS = (z01: number, z02: number) => (z: C) => sFromAbcd(ONE, z, c(0), ONE, z01, z02);
const shuntS = (z01: number, z02: number) => (z: C) => sFromAbcd(ONE, c(0), div(ONE, z), ONE, z01, z02);
const gamma = (z0: number) => (z: C) => div(sub(z, c(z0)), add(z, c(z0)));

interface FixtureCase {
  label: string;
  fixture: FixtureKind;
  data: NetworkData;
  name: RecordedQuantity['name'];
  /** The recorded M this test expects for a device impedance z (independent forward formula). */
  recordedOfZ: (z: C, f: number) => C;
  /** Closed form of |dZ/dM| at device impedance z (module comment). */
  closedForm: (z: C) => number;
}

const CASES: FixtureCase[] = (() => {
  const cases: FixtureCase[] = [];
  for (const z0 of [50, 75]) {
    cases.push({
      label: `reflection 1-port S, Z0 = ${z0} Ω`,
      fixture: 'reflection',
      data: network('S', [z0], (z) => [gamma(z0)(z)]),
      name: 'S11',
      recordedOfZ: gamma(z0),
      closedForm: (z) => abs2(add(z, c(z0))) / (2 * z0), // |Z + Z0|²/(2Z0)
    });
  }
  // 2-port reflection record: port 2 open (S22 = 1), −120 dB leakage; only S11 is recorded.
  cases.push({
    label: 'reflection 2-port S (port 2 open)',
    fixture: 'reflection',
    data: network('S', [50, 50], (z) => [gamma(50)(z), c(1e-6), c(1e-6), ONE]),
    name: 'S11',
    recordedOfZ: gamma(50),
    closedForm: (z) => abs2(add(z, c(50))) / 100,
  });
  for (const [z01, z02] of [
    [50, 50],
    [50, 75],
  ] as const) {
    const r = Math.sqrt(z01 * z02);
    const P = z01 * z02;
    const S = z01 + z02;
    cases.push({
      label: `series-through S, ports ${z01}/${z02} Ω`,
      fixture: 'series-thru',
      data: network('S', [z01, z02], seriesS(z01, z02)),
      name: 'S21',
      recordedOfZ: (z) => seriesS(z01, z02)(z)[2],
      // |Z + Z01 + Z02|²/(2√(Z01·Z02)); equal ports |Z + 2Z0|²/(2Z0)
      closedForm: (z) => abs2(add(z, c(S))) / (2 * r),
    });
    cases.push({
      label: `shunt-through S, ports ${z01}/${z02} Ω`,
      fixture: 'shunt-thru',
      data: network('S', [z01, z02], shuntS(z01, z02)),
      name: 'S21',
      recordedOfZ: (z) => shuntS(z01, z02)(z)[2],
      // |(Z01 + Z02)Z + Z01·Z02|²/(2√(Z01·Z02)·Z01·Z02); equal ports |2Z + Z0|²/(2Z0)
      closedForm: (z) => abs2(add(scale(z, S), c(P))) / (2 * r * P),
    });
  }
  // Series-through recorded as 2-port Y (unequal ports): the file's Y is converted to S21 with
  // the file's references, so the recorded quantity is still the S21 of the formula above.
  cases.push({
    label: 'series-through from 2-port Y data, ports 50/75 Ω',
    fixture: 'series-thru',
    data: network('Y', [50, 75], (z) => {
      const y = div(ONE, z);
      return [y, scale(y, -1), scale(y, -1), y];
    }),
    name: 'S21',
    recordedOfZ: (z) => seriesS(50, 75)(z)[2],
    closedForm: (z) => abs2(add(z, c(125))) / (2 * Math.sqrt(50 * 75)),
  });
  cases.push({
    label: 'impedance fixture, 1-port Y',
    fixture: 'impedance',
    data: network('Y', [50], (z) => [div(ONE, z)]),
    name: 'Y',
    recordedOfZ: (z) => div(ONE, z),
    closedForm: (z) => abs2(z), // |dZ/dY| = 1/|Y|² = |Z|²
  });
  // 2-port Y of a π network: series branch Z between the ports, 1 pF and 2 pF strays to ground.
  cases.push({
    label: 'impedance fixture, 2-port Y (series branch of a π network)',
    fixture: 'impedance',
    data: network('Y', [50, 50], (z, f) => {
      const w = 2 * Math.PI * f;
      const y = div(ONE, z);
      return [add(c(0, w * 1e-12), y), scale(y, -1), scale(y, -1), add(c(0, w * 2e-12), y)];
    }),
    name: 'Y',
    recordedOfZ: (z) => scale(div(ONE, z), -1), // Y21 = −1/Z
    closedForm: (z) => abs2(z), // Z = −1/Y21: |dZ/dY21| = 1/|Y21|² = |Z|²
  });
  cases.push({
    label: 'impedance fixture, 1-port Z (identity map)',
    fixture: 'impedance',
    data: network('Z', [50], (z) => [z]),
    name: 'Z',
    recordedOfZ: (z) => z,
    closedForm: () => 1,
  });
  return cases;
})();

describe('recorded quantity of every fixture conversion', () => {
  for (const k of CASES) {
    describe(k.label, () => {
      const sweep = networkToImpedance(k.data, k.fixture, 'test');
      const rec = sweep.recorded!;
      const n = FREQ.length;

      it(`records ${k.name} as the independent forward formula gives it (1e-12 relative)`, () => {
        expect(rec.name).toBe(k.name);
        expect(rec.re.length).toBe(n);
        expect(rec.map.length).toBe(8 * n);
        let worst = 0;
        for (let i = 0; i < n; i++)
          worst = Math.max(worst, relErr(c(rec.re[i], rec.im[i]), k.recordedOfZ(Z_DUT[i], FREQ[i])));
        expect(worst).toBeLessThan(1e-12);
      });

      it('the stored map reproduces Z from the recorded M (1e-12 relative), and Z is the device impedance', () => {
        let worstMap = 0;
        let worstDevice = 0;
        for (let i = 0; i < n; i++) {
          const z = apply(mapAt(rec, i), c(rec.re[i], rec.im[i]));
          worstMap = Math.max(worstMap, relErr(z, c(sweep.zRe[i], sweep.zIm[i])));
          worstDevice = Math.max(worstDevice, relErr(z, Z_DUT[i]));
        }
        expect(worstMap).toBeLessThan(1e-12);
        // Round trip Z → M (test formulas) → Z (map): condition number of the map near fa
        // (|Z|/|1 − Γ| ≈ 1e4 for reflection) times double rounding leaves ~1e-12.
        expect(worstDevice).toBeLessThan(1e-10);
      });

      it('recordedFor inverts the map: M at the recorded Z, and the forward formula at the device Z', () => {
        let worstSelf = 0;
        let worstDevice = 0;
        for (let i = 0; i < n; i++) {
          const m = c(rec.re[i], rec.im[i]);
          worstSelf = Math.max(worstSelf, relErr(recordedFor(rec, i, c(sweep.zRe[i], sweep.zIm[i])), m));
          worstDevice = Math.max(worstDevice, relErr(recordedFor(rec, i, Z_DUT[i]), k.recordedOfZ(Z_DUT[i], FREQ[i])));
        }
        expect(worstSelf).toBeLessThan(1e-12);
        expect(worstDevice).toBeLessThan(1e-12);
      });

      it('dZdMAbs equals a central finite difference of the map (1e-6) and the closed form (1e-9)', () => {
        let worstFd = 0;
        let worstClosed = 0;
        for (let i = 0; i < n; i++) {
          const map = mapAt(rec, i);
          const m = c(rec.re[i], rec.im[i]);
          const got = dZdMAbs(rec, i, m.re, m.im);
          const fd = centralDifferenceAbs((x) => apply(map, x), m, safeScale(map, m));
          worstFd = Math.max(worstFd, Math.abs(got - fd) / fd);
          const closed = k.closedForm(c(sweep.zRe[i], sweep.zIm[i]));
          worstClosed = Math.max(worstClosed, Math.abs(got - closed) / closed);
        }
        expect(worstFd).toBeLessThan(1e-6);
        expect(worstClosed).toBeLessThan(1e-9);
      });
    });
  }

  it('the reflection derivative is large where the fit should trust a point least: at fa, |dZ/dΓ| ≈ |Z|²/(2Z0)', () => {
    const k = CASES[0];
    const rec = networkToImpedance(k.data, k.fixture, 'test').recorded!;
    const i = FREQ.indexOf(X1_FP);
    const z = Z_DUT[i];
    // |Z(fa)| ≈ 1/(ωa²C0²R1) ≈ 5.5e5 Ω (first order), so |dZ/dΓ| ≈ 3e9 Ω per unit of Γ.
    expect(abs(z)).toBeGreaterThan(4e5);
    const d = dZdMAbs(rec, i, rec.re[i], rec.im[i]);
    expect(d).toBeGreaterThan(1e9);
    expect(d / (abs2(z) / 100)).toBeCloseTo(1, 3);
  });
});

describe('compose, IDENTITY, impedanceRecord', () => {
  const rnd = gaussian(11);
  const randomMap = (): Bilinear => [c(rnd(), rnd()), c(rnd(), rnd()), c(rnd(), rnd()), c(rnd(), rnd())];

  it('compose(outer, inner) evaluates as outer(inner(M)) (product of the 2×2 matrices, Möbius composition)', () => {
    for (let t = 0; t < 50; t++) {
      const outer = randomMap();
      const inner = randomMap();
      const m = c(rnd(), rnd());
      const both = apply(compose(outer, inner), m);
      const chained = apply(outer, apply(inner, m));
      expect(relErr(both, chained)).toBeLessThan(1e-9);
    }
  });

  it('compose is associative and IDENTITY is neutral on either side', () => {
    const [p, q, r] = [randomMap(), randomMap(), randomMap()];
    const left = compose(compose(p, q), r);
    const right = compose(p, compose(q, r));
    for (let k = 0; k < 4; k++) expect(relErr(left[k], right[k])).toBeLessThan(1e-12);
    expect(compose(IDENTITY, p)).toEqual(p);
    expect(compose(p, IDENTITY)).toEqual(p);
  });

  it('dZdMAbs of a composed map is the product of the two derivatives (chain rule, closed form ad − bc)', () => {
    for (let t = 0; t < 20; t++) {
      const outer = randomMap();
      const inner = randomMap();
      const m = c(rnd(), rnd());
      const rec: RecordedQuantity = {
        name: 'Z',
        re: Float64Array.of(m.re),
        im: Float64Array.of(m.im),
        map: new Float64Array(8),
      };
      setMap(rec.map, 0, compose(outer, inner));
      const dInner = abs(sub(mul(inner[0], inner[3]), mul(inner[1], inner[2]))) / abs2(add(mul(inner[2], m), inner[3]));
      const mid = apply(inner, m);
      const dOuter =
        abs(sub(mul(outer[0], outer[3]), mul(outer[1], outer[2]))) / abs2(add(mul(outer[2], mid), outer[3]));
      expect(dZdMAbs(rec, 0, m.re, m.im) / (dInner * dOuter)).toBeCloseTo(1, 9);
    }
  });

  it('setMap / mapAt round-trip per point; impedanceRecord is the identity map with |dZ/dM| = 1', () => {
    const map = new Float64Array(16);
    const m = randomMap();
    setMap(map, 1, m);
    expect(Array.from(map.slice(0, 8))).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
    expect(mapAt({ name: 'Z', re: new Float64Array(2), im: new Float64Array(2), map }, 1)).toEqual(m);
    const rec = impedanceRecord(Float64Array.of(3, 4), Float64Array.of(-1, 2));
    expect(rec.name).toBe('Z');
    for (let i = 0; i < 2; i++) {
      expect(mapAt(rec, i)).toEqual(IDENTITY);
      expect(dZdMAbs(rec, i, rec.re[i], rec.im[i])).toBe(1);
      expect(recordedFor(rec, i, c(7, -8))).toEqual(c(7, -8));
    }
  });
});

// ---- compensation: a reflection record of X1 through a fixture with series Rs, Ls toward the
// instrument and a stray Cp across the device (the fixture model of compensation.ts), the open,
// short and 50 Ω load standards recorded the same way on the same grid (so interpolation is exact).
describe('compensation composes its map with the fixture map', () => {
  const RS = 0.5;
  const LS = 5e-9;
  const CP = 1e-12;
  const Z0 = 50;
  const LOAD = 50;
  const zsAt = (f: number) => c(RS, 2 * Math.PI * f * LS);
  const yoAt = (f: number) => c(0, 2 * Math.PI * f * CP);
  /** What the instrument sees: Zs + 1/(Yo + 1/Zdut); open: Zs + 1/Yo; short: Zs. */
  const seen = (z: C | 'open', f: number): C =>
    z === 'open' ? add(zsAt(f), div(ONE, yoAt(f))) : add(zsAt(f), div(ONE, add(yoAt(f), div(ONE, z))));
  const record = (z: (f: number, i: number) => C, source: string): ImpedanceSweep => {
    const re = new Float64Array(FREQ.length);
    const im = new Float64Array(FREQ.length);
    FREQ.forEach((f, i) => {
      const s = gamma(Z0)(z(f, i));
      re[i] = s.re;
      im[i] = s.im;
    });
    return networkToImpedance(
      { parameter: 'S', ports: 1, z0Ohm: [Z0], freqHz: FREQ, re: [re], im: [im], source, format: 'test', comments: [] },
      'reflection',
      source,
    );
  };
  const dut = record((f, i) => seen(Z_DUT[i], f), 'dut');
  const open = record((f) => seen('open', f), 'open');
  const short = record((f) => zsAt(f), 'short');
  const load = record((f) => seen(c(LOAD), f), 'load');
  const std = (s: ImpedanceSweep, i: number) => c(s.zRe[i], s.zIm[i]);

  /** Open/short, exact form: Zdut = (Zm − Zsm)/(1 − (Zm − Zsm)·Yo), Yo = 1/(Zom − Zsm). */
  const openShort =
    (i: number) =>
    (zm: C): C => {
      const d = sub(zm, std(short, i));
      const yo = div(ONE, sub(std(open, i), std(short, i)));
      return div(d, sub(ONE, mul(d, yo)));
    };
  /** Open/short/load: Zdut = Zstd·(Zom − Zlm)(Zm − Zsm)/((Zlm − Zsm)(Zom − Zm)). */
  const openShortLoad =
    (i: number) =>
    (zm: C): C => {
      const [zo, zs, zl] = [std(open, i), std(short, i), std(load, i)];
      return div(mul(scale(sub(zo, zl), LOAD), sub(zm, zs)), mul(sub(zl, zs), sub(zo, zm)));
    };

  const variants = [
    { label: 'open/short', run: () => compensateOpenShort(dut, open, short), formula: openShort },
    {
      label: 'open/short/load',
      run: () => compensateOpenShortLoad(dut, open, short, load, LOAD),
      formula: openShortLoad,
    },
  ];
  for (const v of variants) {
    describe(v.label, () => {
      const out = v.run();
      const rec = out.recorded!;
      const fixtureRec = dut.recorded!;

      it('keeps the recorded quantity (S11 and its values) and returns the device impedance', () => {
        expect(rec.name).toBe('S11');
        expect(Array.from(rec.re)).toEqual(Array.from(fixtureRec.re));
        expect(Array.from(rec.im)).toEqual(Array.from(fixtureRec.im));
        let worst = 0;
        for (let i = 0; i < FREQ.length; i++) worst = Math.max(worst, relErr(c(out.zRe[i], out.zIm[i]), Z_DUT[i]));
        // The stray Cp shunts the device near fa (|Zm| ≈ 1e4 Ω against |Zdut| ≈ 5e5 Ω), so undoing
        // it cancels about two digits on top of the reflection's own conditioning.
        expect(worst).toBeLessThan(1e-8);
      });

      it('the composed map reproduces the compensated Z from the recorded S11 (1e-12 relative)', () => {
        let worst = 0;
        for (let i = 0; i < FREQ.length; i++) {
          const z = apply(mapAt(rec, i), c(rec.re[i], rec.im[i]));
          worst = Math.max(worst, relErr(z, c(out.zRe[i], out.zIm[i])));
        }
        expect(worst).toBeLessThan(1e-12);
      });

      it('recordedFor of the composed map returns the recorded S11 from the compensated Z', () => {
        let worst = 0;
        for (let i = 0; i < FREQ.length; i++) {
          worst = Math.max(worst, relErr(recordedFor(rec, i, c(out.zRe[i], out.zIm[i])), c(rec.re[i], rec.im[i])));
        }
        expect(worst).toBeLessThan(1e-10);
      });

      it('dZdMAbs of the composed map equals the chain rule, finite differences through both steps (1e-6)', () => {
        let worstChain = 0;
        let worstWhole = 0;
        for (let i = 0; i < FREQ.length; i++) {
          const m = c(rec.re[i], rec.im[i]);
          const fixtureMap = mapAt(fixtureRec, i);
          const comp = v.formula(i);
          const zm = apply(fixtureMap, m);
          // step 1: S11 → Zm through the fixture conversion's map
          const d1 = centralDifferenceAbs((x) => apply(fixtureMap, x), m, safeScale(fixtureMap, m));
          // step 2: Zm → Zdut through the compensation formula; its pole is Zm = Zom, its zero Zm = Zsm
          const zScale = Math.min(abs(sub(zm, std(open, i))), abs(sub(zm, std(short, i))), abs(zm));
          const d2 = centralDifferenceAbs(comp, zm, zScale);
          const got = dZdMAbs(rec, i, m.re, m.im);
          worstChain = Math.max(worstChain, Math.abs(got - d1 * d2) / (d1 * d2));
          // the whole chain at once: S11 → Zm → Zdut
          const whole = centralDifferenceAbs(
            (x) => comp(apply(fixtureMap, x)),
            m,
            Math.min(safeScale(fixtureMap, m), safeScale(mapAt(rec, i), m)),
          );
          worstWhole = Math.max(worstWhole, Math.abs(got - whole) / whole);
        }
        expect(worstChain).toBeLessThan(1e-6);
        expect(worstWhole).toBeLessThan(1e-6);
      });
    });
  }

  it('open/short: the compensation factor is dZdut/dZm = 1/(1 − (Zm − Zsm)·Yo)² (derivative of the exact form)', () => {
    const out = compensateOpenShort(dut, open, short);
    const rec = out.recorded!;
    for (const i of [0, FREQ.indexOf(X1_FS), FREQ.indexOf(X1_FP), FREQ.length - 1]) {
      const m = c(rec.re[i], rec.im[i]);
      const zm = c(dut.zRe[i], dut.zIm[i]);
      const yo = div(ONE, sub(std(open, i), std(short, i)));
      const factor = 1 / abs2(sub(ONE, mul(sub(zm, std(short, i)), yo)));
      const expected = (abs2(add(zm, c(Z0))) / (2 * Z0)) * factor; // reflection closed form × compensation
      expect(dZdMAbs(rec, i, m.re, m.im) / expected).toBeCloseTo(1, 8);
    }
  });
});
