/**
 * Noise of the recorded quantity (src/lib/extract/measurement-noise.ts): σ_M² = floor² +
 * (trace·|M|)² per real and imaginary component, estimated from second differences before a
 * fit and from residuals after one, and carried to each impedance point as σ_Z = |dZ/dM|·σ_M.
 *
 * Units of the truth. The synthesiser's `floorDb` and `traceNoise` are of the complex noise
 * (E|n|² = 10^(dB/10), E|n|² = (trace·|x|)²), split equally over the two components, so per
 * component floor = 10^(dB/20)/√2 and trace = traceNoise/√2 (src/lib/synth/synth-sweep.ts).
 *
 * Statistical reasoning for the tolerances. A variance estimated from N independent real
 * Gaussian samples has relative standard error √(2/N); here each point gives one χ²₂ value
 * (two components), so √(2/(2N)) = 1/√N for the variance and 1/(2√N) for σ. Normalised second
 * differences d_k = (M_{k+1} − 2M_k + M_{k−1})/√6 (equal steps) overlap: neighbours correlate
 * with ρ₁ = −2/3, ρ₂ = 1/6, so the mean of |d|² has the variance of 1/(1 + 2(ρ₁² + ρ₂²)) = 1/1.94
 * as many independent values. Floor and trace are each fixed mostly by the points where they
 * dominate (N_sub of them), and the two-parameter fit shares the points in between, which
 * inflates the error by a further factor of about 1.5. So the relative standard error of a
 * recovered σ is about 1.5 · ½ · √(1.94/N_sub). The tolerances below are about 4 of those; the
 * spread observed over 40 seeds while writing the test is quoted beside each.
 */
import { describe, expect, it } from 'vitest';
import {
  impedanceSigmaOhm,
  MIN_RELATIVE_NOISE,
  noiseFromDifferences,
  noiseFromResiduals,
  type RecordedNoise,
} from '../../../src/lib/extract/measurement-noise.ts';
import { synthesizeSweep, type SynthSweepSpec } from '../../../src/lib/synth/synth-sweep.ts';
import { networkToImpedance } from '../../../src/lib/fixture/to-impedance.ts';
import { impedanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';
import { recordedOf, type ImpedanceSweep, type NetworkData } from '../../../src/lib/sweep/sweep.ts';
import { gaussian } from '../../support/rng.ts';

// Reference resonator X1 (synthetic, not a real part): L1 = 10 mH, C1 = 10 fF, R1 = 20 Ω,
// C0 = 3 pF, ωs = 1e8 rad/s (fs ≈ 15.9 MHz); Q = 1/(ωs·R1·C1) = 50 000, bandwidth fs/Q ≈ 318 Hz.
const X1_FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: X1_FS, r1Ohm: 20, c1F: 10e-15 }] };
/** A 100 pF capacitor, no resonance: a smooth record whose |S21| spans 0.06 … 0.99 over 1–100 MHz. */
const CAP: BvdModel = { c0F: 100e-12, branches: [] };

/** Per-component truth of the synthesiser's noise (module comment). */
function truth(floorDb: number, traceNoise: number): { floor: number; trace: number } {
  return { floor: 10 ** (floorDb / 20) / Math.SQRT2, trace: traceNoise / Math.SQRT2 };
}

function recordOf(spec: SynthSweepSpec): ImpedanceSweep {
  const s = synthesizeSweep(spec);
  return networkToImpedance(s.network, spec.fixture, 'synthetic');
}

const SEEDS = [1, 2, 3, 4, 5, 6, 7, 8];

describe('noiseFromDifferences recovers a known floor and trace noise', () => {
  it('smooth series-through record (100 pF, log grid 1–100 MHz, 2001 points): floor and trace within 15 %', () => {
    // floor −70 dB (3.2e-4 rms) equals trace 1e-3 × |S21| at |S21| = 0.32, reached near 10 MHz:
    // about 1000 points each side. SE of σ ≈ 1.5·½·√(1.94/1000) = 3.3 %; observed over 40 seeds
    // 3.5 % (floor) and 2.7 % (trace). 15 % is about 4 SE.
    const t = truth(-70, 1e-3);
    const ratios: Array<[number, number]> = [];
    for (const seed of SEEDS) {
      const n = noiseFromDifferences(
        recordOf({
          model: CAP,
          fixture: 'series-thru',
          grid: { kind: 'log', startHz: 1e6, stopHz: 1e8, points: 2001 },
          floorDb: -70,
          traceNoise: 1e-3,
          seed,
        }),
      );
      expect(n.from).toBe('differences');
      ratios.push([n.floor / t.floor, n.trace / t.trace]);
      expect(Math.abs(n.floor / t.floor - 1)).toBeLessThan(0.15);
      expect(Math.abs(n.trace / t.trace - 1)).toBeLessThan(0.15);
    }
    // No bias: the mean of 8 seeds within 4 SE/√8 ≈ 5 %.
    const mean = (k: 0 | 1) => ratios.reduce((s, r) => s + r[k], 0) / ratios.length;
    expect(Math.abs(mean(0) - 1)).toBeLessThan(0.05);
    expect(Math.abs(mean(1) - 1)).toBeLessThan(0.05);
  });

  it('series-through record across the X1 resonance (fs ± 10 kHz, 4001 points, ~64 per bandwidth): floor and trace within 12 %', () => {
    // |S21| runs from 0.83 at fs down to ~0.03 off resonance: the trace dominates within about
    // ±2.4 kHz (|S21| > 0.32), the floor outside. Observed over 40 seeds: 1.8 % (floor),
    // 2.8 % (trace). The resonance's own bend (for M ∝ 1/(1 + 2jΔf/bw), a second difference of
    // 2|M|·(h/(bw/2))²/√6 ≈ 8e-4·|M| at fs with 5 Hz steps) is as large as the trace noise there,
    // but only over the ~40 points within ±100 Hz of fs: it moves the trace by about 1 %.
    const t = truth(-70, 1e-3);
    const ratios: Array<[number, number]> = [];
    for (const seed of SEEDS) {
      const n = noiseFromDifferences(
        recordOf({
          model: X1,
          fixture: 'series-thru',
          grid: { kind: 'centered', centerHz: X1_FS, spanHz: 20000, points: 4001 },
          floorDb: -70,
          traceNoise: 1e-3,
          seed,
        }),
      );
      ratios.push([n.floor / t.floor, n.trace / t.trace]);
      expect(Math.abs(n.floor / t.floor - 1)).toBeLessThan(0.12);
      expect(Math.abs(n.trace / t.trace - 1)).toBeLessThan(0.12);
    }
    const mean = (k: 0 | 1) => ratios.reduce((s, r) => s + r[k], 0) / ratios.length;
    expect(Math.abs(mean(0) - 1)).toBeLessThan(0.04);
    expect(Math.abs(mean(1) - 1)).toBeLessThan(0.04);
  });

  it('reflection record off resonance (|S11| ≈ 1 throughout): the total σ_M at |M| ≈ 1 within 7 %', () => {
    // With |M| nearly constant only floor² + trace²·|M|² is identifiable, not its split; that
    // sum is what every point's σ_Z uses. N = 2000: SE ≈ ½·√(1.94/2000) = 1.6 %; observed 1.5 %.
    const t = truth(-70, 1e-3);
    for (const seed of SEEDS) {
      const sweep = recordOf({
        model: X1,
        fixture: 'reflection',
        grid: { kind: 'linear', startHz: 10e6, stopHz: 14e6, points: 2001 },
        floorDb: -70,
        traceNoise: 1e-3,
        seed,
      });
      const n = noiseFromDifferences(sweep);
      const rec = sweep.recorded!;
      let worst = 0;
      for (let i = 0; i < rec.re.length; i += 100) {
        const m2 = rec.re[i] ** 2 + rec.im[i] ** 2;
        const got = Math.sqrt(n.floor ** 2 + n.trace ** 2 * m2);
        const want = Math.sqrt(t.floor ** 2 + t.trace ** 2 * m2);
        worst = Math.max(worst, Math.abs(got / want - 1));
      }
      expect(worst).toBeLessThan(0.07);
    }
  });

  it('noiseless data gives the smallest assumed noise, MIN_RELATIVE_NOISE of the largest |M|, not zero', () => {
    // Z = 50 Ω + jω·1 µH recorded as Z itself (identity map): exactly linear in f, so every
    // second difference is rounding only (~1e-13 Ω), below the assumed minimum 1e-12·max|Z|.
    const f = Float64Array.from({ length: 201 }, (_, i) => 1e6 + 1e4 * i);
    const zRe = new Float64Array(f.length).fill(50);
    const zIm = Float64Array.from(f, (x) => 2 * Math.PI * x * 1e-6);
    const n = noiseFromDifferences({ freqHz: f, zRe, zIm, source: 'x' });
    let max = 0;
    for (let i = 0; i < f.length; i++) max = Math.max(max, Math.hypot(zRe[i], zIm[i]));
    expect(n.floor / (MIN_RELATIVE_NOISE * max)).toBeCloseTo(1, 9);
    expect(n.trace).toBe(MIN_RELATIVE_NOISE);
  });
});

// ---- residuals: a series-through record (equal 50 Ω ports) whose recorded S21 is the model's
// plus δM drawn here with a known floor and trace; the residuals handed over are exactly the
// impedance difference that δM makes (leverage factor 1, as for a model not fitted to the noise).
const Z0 = 50;
/** S21 of a series element, equal ports: 2Z0/(Z + 2Z0) (ABCD of a series impedance). */
function s21Of(zRe: number, zIm: number): { re: number; im: number } {
  const dr = zRe + 2 * Z0;
  const d2 = dr * dr + zIm * zIm;
  return { re: (2 * Z0 * dr) / d2, im: (-2 * Z0 * zIm) / d2 };
}

function residualCase(model: BvdModel, freqHz: Float64Array, noise: { floor: number; trace: number }, seed: number) {
  const n = freqHz.length;
  const g = gaussian(seed);
  const zMod = { re: new Float64Array(n), im: new Float64Array(n) };
  const s21 = { re: new Float64Array(n), im: new Float64Array(n) };
  const mMod2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [r, x] = impedanceAt(model, freqHz[i]);
    zMod.re[i] = r;
    zMod.im[i] = x;
    const m = s21Of(r, x);
    mMod2[i] = m.re * m.re + m.im * m.im;
    const sd = Math.sqrt(noise.floor ** 2 + noise.trace ** 2 * mMod2[i]); // per component
    s21.re[i] = m.re + sd * g();
    s21.im[i] = m.im + sd * g();
  }
  const zero = () => new Float64Array(n);
  const data: NetworkData = {
    parameter: 'S',
    ports: 2,
    z0Ohm: [Z0, Z0],
    freqHz,
    re: [zero(), s21.re, s21.re, zero()],
    im: [zero(), s21.im, s21.im, zero()],
    source: 'test',
    format: 'test',
    comments: [],
  };
  const sweep = networkToImpedance(data, 'series-thru', 'test');
  const residuals = { re: new Float64Array(n), im: new Float64Array(n), leverageFactor: new Float64Array(n).fill(1) };
  for (let i = 0; i < n; i++) {
    residuals.re[i] = sweep.zRe[i] - zMod.re[i];
    residuals.im[i] = sweep.zIm[i] - zMod.im[i];
  }
  return { sweep, residuals, zMod, mMod2 };
}

describe('noiseFromResiduals', () => {
  it('recovers floor and trace across the X1 resonance (2001 points, fs ± 10 kHz) within 10 %', () => {
    // floor 2.2e-4 per component (−70 dB), trace 7.1e-4 (1e-3 rms): they cross at |S21| = 0.32.
    // Residuals are independent (no overlap): SE of σ ≈ 1.5·½/√1000 ≈ 2.4 %; 10 % is ~4 SE.
    const t = truth(-70, 1e-3);
    const f = Float64Array.from({ length: 2001 }, (_, i) => X1_FS - 10000 + 10 * i);
    for (const seed of [1, 2, 3, 4, 5]) {
      const { sweep, residuals, zMod } = residualCase(X1, f, t, seed);
      const out = noiseFromResiduals(sweep.recorded!, sweep, residuals);
      expect(out.noise.from).toBe('residuals');
      expect(Math.abs(out.noise.floor / t.floor - 1)).toBeLessThan(0.1);
      expect(Math.abs(out.noise.trace / t.trace - 1)).toBeLessThan(0.1);
      // modelZ is Zmeas − residual = the model; modelM is the model's S21 (the map's inverse)
      for (const i of [0, 1000, 2000]) {
        expect(out.modelZ.re[i]).toBeCloseTo(zMod.re[i], 6);
        const m = s21Of(zMod.re[i], zMod.im[i]);
        expect(Math.hypot(out.modelM.re[i] - m.re, out.modelM.im[i] - m.im) / Math.hypot(m.re, m.im)).toBeLessThan(
          1e-9,
        );
      }
    }
  });

  it('a through record whose signal sits in the floor: the noise goes to the floor, not the trace', () => {
    // A 0.01 pF capacitor at 5–15 MHz: |Z| ≈ 1–3 MΩ, model |S21| = 2Z0/|Z| ≈ 3e-5 … 1e-4, far below a
    // −60 dB floor (7.1e-4 per component). The measured |S21| is then noise itself (≈ 1e-3): fitted
    // against it, the variance would grow with |M|² and pass for trace noise (trace ≈ 0.7,
    // floor ≈ 0). Against the model's |M| it is constant: all floor. 2001 points: SE of the floor
    // ≈ ½/√2001 ≈ 1.1 %, so 5 % is about 4 SE.
    // The trace itself is not identifiable here (model |M| ≤ 1e-4): its variance term b·|M|² has a
    // standard error of about (max|M|²/sd(|M|²))/√N = 3.9/√2001 ≈ 9 % of floor² at the largest
    // model |M| (|M|² ∝ f² over 5–15 MHz). The bound on its share is 4 of those, 35 %.
    const t = truth(-60, 1e-3);
    const tiny: BvdModel = { c0F: 0.01e-12, branches: [] };
    const f = Float64Array.from({ length: 2001 }, (_, i) => 5e6 + 5e3 * i);
    for (const seed of [1, 2, 3, 4, 5]) {
      const { sweep, residuals, mMod2 } = residualCase(tiny, f, t, seed);
      const rec = sweep.recorded!;
      // the premise: the measured |S21| is mostly noise, ≥ 3× the model's on average
      let measured = 0;
      let model = 0;
      for (let i = 0; i < f.length; i++) {
        measured += Math.hypot(rec.re[i], rec.im[i]);
        model += Math.sqrt(mMod2[i]);
      }
      expect(measured / model).toBeGreaterThan(3);
      const out = noiseFromResiduals(rec, sweep, residuals);
      expect(Math.abs(out.noise.floor / t.floor - 1)).toBeLessThan(0.05);
      // whatever trace is reported stays within its statistical reach at every model |M|
      for (let i = 0; i < f.length; i++)
        expect(out.noise.trace ** 2 * mMod2[i]).toBeLessThan(0.35 * out.noise.floor ** 2);
      // and σ_Z at the model's M is the floor's: |dZ/dS21|·floor, |dZ/dS21| = |Z + 2Z0|²/(2Z0)
      const sigma = impedanceSigmaOhm(rec, out.noise, out.modelM);
      for (const i of [0, 1000, 2000]) {
        const dz = ((out.modelZ.re[i] + 2 * Z0) ** 2 + out.modelZ.im[i] ** 2) / (2 * Z0);
        expect(sigma[i] / (dz * t.floor)).toBeGreaterThan(0.95);
        expect(sigma[i] / (dz * t.floor)).toBeLessThan(1.2);
      }
    }
  });

  it('a record spanning fs (trace dominates) and fa (signal in the floor) recovers both within 10 %', () => {
    // −60 dB floor (7.1e-4 per component), trace 3e-3 rms (2.1e-3): they cross at |S21| = 0.33,
    // reached within ~±2 kHz of fs; near fa (+26.5 kHz) |S21| falls to ~2e-4, inside the floor.
    // 4001 points at 10 Hz: ~400 trace-dominated, so SE of the trace ≈ 1.5·½/√400 ≈ 4 %; floor
    // ≈ 1.5·½/√3600 ≈ 1.3 %. 10 % is 2.5 SE for the trace; seeds 1–5 give at worst 3.4 % (trace), 1.3 % (floor).
    const t = { floor: 10 ** (-60 / 20) / Math.SQRT2, trace: 3e-3 / Math.SQRT2 };
    const f = Float64Array.from({ length: 4001 }, (_, i) => X1_FS - 5000 + 10 * i);
    for (const seed of [1, 2, 3, 4, 5]) {
      const { sweep, residuals } = residualCase(X1, f, t, seed);
      const out = noiseFromResiduals(sweep.recorded!, sweep, residuals);
      expect(Math.abs(out.noise.floor / t.floor - 1)).toBeLessThan(0.05);
      expect(Math.abs(out.noise.trace / t.trace - 1)).toBeLessThan(0.1);
    }
  });

  it('the leverage factor scales each squared deviation: factor 4 reads as twice the σ', () => {
    const t = truth(-70, 1e-3);
    const f = Float64Array.from({ length: 2001 }, (_, i) => X1_FS - 10000 + 10 * i);
    const { sweep, residuals } = residualCase(X1, f, t, 3);
    const base = noiseFromResiduals(sweep.recorded!, sweep, residuals).noise;
    const scaled = noiseFromResiduals(sweep.recorded!, sweep, {
      ...residuals,
      leverageFactor: new Float64Array(f.length).fill(4),
    }).noise;
    // σ² model fitted to e·4: both variances ×4 (maximum likelihood is equivariant in scale)
    expect(scaled.floor / base.floor).toBeCloseTo(2, 3);
    expect(scaled.trace / base.trace).toBeCloseTo(2, 3);
  });
});

describe('impedanceSigmaOhm', () => {
  const noise: RecordedNoise = { floor: 3e-4, trace: 2e-3, from: 'differences' };
  const f = Float64Array.from({ length: 11 }, (_, i) => X1_FS - 5000 + 4000 * i);

  it('reflection: |Z + Z0|²/(2Z0)·√(floor² + trace²|Γ|²), by hand, at the measured Γ', () => {
    const s = synthesizeSweep({ model: X1, fixture: 'reflection', grid: { kind: 'explicit', freqHz: f }, z0Ohm: 50 });
    const sweep = networkToImpedance(s.network, 'reflection', 'x');
    const sigma = impedanceSigmaOhm(sweep.recorded!, noise);
    for (let i = 0; i < f.length; i++) {
      const g2 = s.network.re[0][i] ** 2 + s.network.im[0][i] ** 2;
      const dz = ((sweep.zRe[i] + 50) ** 2 + sweep.zIm[i] ** 2) / 100; // |dZ/dΓ| (reflection, derived in recorded.test.ts)
      const want = dz * Math.sqrt(noise.floor ** 2 + noise.trace ** 2 * g2);
      expect(sigma[i] / want).toBeCloseTo(1, 10);
    }
  });

  it("evaluates at the M it is given (the model's after a fit), not the measured one", () => {
    const s = synthesizeSweep({ model: X1, fixture: 'series-thru', grid: { kind: 'explicit', freqHz: f }, z0Ohm: 50 });
    const sweep = networkToImpedance(s.network, 'series-thru', 'x');
    const at = { re: new Float64Array(f.length).fill(0.3), im: new Float64Array(f.length).fill(-0.4) }; // |M| = 0.5
    const sigma = impedanceSigmaOhm(sweep.recorded!, noise, at);
    // series-through Z = 2Z0(1 − S)/S ⇒ |dZ/dS| = 2Z0/|S|² = 100/0.25 = 400 Ω per unit S21
    const want = 400 * Math.sqrt(noise.floor ** 2 + noise.trace ** 2 * 0.25);
    for (let i = 0; i < f.length; i++) expect(sigma[i] / want).toBeCloseTo(1, 12);
  });

  it('an impedance record (identity map): σ_Z = √(floor² + trace²|Z|²) in ohm', () => {
    const sweep: ImpedanceSweep = {
      freqHz: Float64Array.of(1, 2),
      zRe: Float64Array.of(30, 0),
      zIm: Float64Array.of(40, -1e4),
      source: 'x',
    };
    const sigma = impedanceSigmaOhm(recordedOf(sweep), { floor: 0.01, trace: 1e-3, from: 'residuals' });
    expect(sigma[0]).toBeCloseTo(Math.sqrt(1e-4 + 1e-6 * 2500), 14);
    expect(sigma[1]).toBeCloseTo(Math.sqrt(1e-4 + 1e-6 * 1e8), 12);
  });
});
