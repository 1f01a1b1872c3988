import { describe, expect, it } from 'vitest';
import {
  fitTemperature,
  relativeOffsetAt,
  spanPpmOver,
  turningPointsOf,
  type TemperaturePoint,
} from '../../../src/lib/extract/temperature.ts';

// AT-cut cubic, a1 = −0.0847 ppm/°C per arc-minute of Δθ, a2 = −0.45e-9/°C²,
// a3 = +108.6e-12/°C³, T0 = 25 °C (Gerber & Ballato 1985 as quoted in Haney 2001).
const A2 = -0.45e-9;
const A3 = 108.6e-12;
const a1For = (arcmin: number) => (-5.08e-6 * arcmin) / 60;
const F0 = 16e6;

function atPoints(arcmin: number): TemperaturePoint[] {
  const pts: TemperaturePoint[] = [];
  for (let t = -40; t <= 85; t += 5) {
    const x = t - 25;
    pts.push({ temperatureC: t, fsHz: F0 * (1 + a1For(arcmin) * x + A2 * x * x + A3 * x ** 3) });
  }
  return pts;
}

describe('fitTemperature, AT cut (cubic)', () => {
  const rows: Array<[number, number[], number[], number]> = [
    // check table (mpmath): Δθ, ppm at −40/0/50/85 °C, turning points, p-p −40…85 °C
    [0, [-31.7255, -1.9781, 1.4156, 21.8376], [25.0, 27.76], 53.5631],
    [2, [-20.7189, 2.2552, -2.8177, 11.6776], [3.541, 49.221], 32.3965],
    [5, [-4.2089, 8.6052, -9.1677, -3.5624], [-9.692, 62.454], 20.3912],
  ];
  for (const [arcmin, ppm, turning, pp] of rows) {
    it(`reproduces the Δθ = +${arcmin}′ row: offsets, turning points and peak-to-peak`, () => {
      const r = fitTemperature(atPoints(arcmin), 'quartz-at', { min: -40, max: 85 });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const fit = r.fit;
      expect(fit.form).toBe('cubic');
      expect(fit.t0C).toBe(25);
      [-40, 0, 50, 85].forEach((t, i) => expect(relativeOffsetAt(fit, t) * 1e6).toBeCloseTo(ppm[i], 3));
      const tp = turningPointsOf(fit);
      expect(tp[0]).toBeCloseTo(turning[0], 1);
      expect(tp[1]).toBeCloseTo(turning[1], 1);
      expect(fit.spanPpm).toBeCloseTo(pp, 3);
      expect(fit.rmsResidualPpm).toBeLessThan(1e-6);
    });
  }

  it('gives 16.5432 ppm peak-to-peak at +4′ and the inflection at 26.381 °C', () => {
    // +4′ smallest p-p (mpmath) over −40…85 °C among whole minutes; Ti = T0 − a2/(3a3)
    const r = fitTemperature(atPoints(4), 'quartz-at', { min: -40, max: 85 });
    if (!r.ok) throw new Error(r.reason);
    expect(spanPpmOver(r.fit, -40, 85)).toBeCloseTo(16.5432, 3);
    const [, a2, a3] = r.fit.coeffs;
    expect(r.fit.t0C - a2 / (3 * a3)).toBeCloseTo(26.381, 2);
  });

  it('falls back to a quadratic with a note when only three temperatures were measured', () => {
    const pts = atPoints(2).filter((p) => [-20, 25, 70].includes(p.temperatureC));
    const r = fitTemperature(pts, 'quartz-at');
    expect(r.ok && r.fit.form).toBe('quadratic');
    expect(r.ok && r.note).toBe('only 3 temperatures: quadratic instead of the cubic of an AT cut');
  });
});

describe('fitTemperature, tuning fork (parabola with free turnover)', () => {
  it('recovers β = −0.034 ppm/°C² and the turnover, and the tabulated offsets', () => {
    // β = −0.034 ppm/°C² (from memory), T0 = 25 °C: −40 °C −143.65 ppm, 0 °C −21.25, 60 °C −41.65, 85 °C −122.40
    const pts = [-40, -10, 10, 25, 40, 60, 85].map((t) => ({
      temperatureC: t,
      fsHz: 32768 * (1 - 0.034e-6 * (t - 25) ** 2),
    }));
    const r = fitTemperature(pts, 'quartz-tuning-fork', { min: -40, max: 85 });
    if (!r.ok) throw new Error(r.reason);
    expect(r.fit.form).toBe('parabola');
    expect(r.fit.t0C).toBeCloseTo(25, 6);
    expect(r.fit.coeffs[1] * 1e6).toBeCloseTo(-0.034, 9);
    expect(r.fit.f0Hz).toBeCloseTo(32768, 6);
    const at = (t: number) => relativeOffsetAt(r.fit, t) * 1e6;
    expect(at(-40)).toBeCloseTo(-143.65, 2);
    expect(at(0)).toBeCloseTo(-21.25, 2);
    expect(at(60)).toBeCloseTo(-41.65, 2);
    expect(at(85)).toBeCloseTo(-122.4, 2);
    expect(r.fit.turnoverC).toEqual([r.fit.t0C]);
    expect(r.fit.spanPpm).toBeCloseTo(143.65, 2);
  });

  it('finds a turnover away from 25 °C', () => {
    const pts = [-20, 0, 20, 40, 60].map((t) => ({ temperatureC: t, fsHz: 32768 * (1 - 0.03e-6 * (t - 19.5) ** 2) }));
    const r = fitTemperature(pts, 'quartz-tuning-fork');
    expect(r.ok && r.fit.t0C).toBeCloseTo(19.5, 6);
    // span over the measured range −20…60 °C: β·(60 − 19.5)²
    expect(r.ok && r.fit.spanPpm).toBeCloseTo(0.03 * 40.5 ** 2, 6);
    expect(r.ok && r.fit.spanRangeC).toEqual({ min: -20, max: 60 });
  });
});

describe('fitTemperature, other kinds', () => {
  it('fits a quadratic about 25 °C for a ceramic resonator', () => {
    // common practice: no physical form assumed; tens of ppm/°C (from memory)
    const pts = [-20, 0, 25, 50, 80].map((t) => ({
      temperatureC: t,
      fsHz: 4e6 * (1 + 3e-6 * (t - 25) - 0.05e-6 * (t - 25) ** 2),
    }));
    const r = fitTemperature(pts, 'ceramic');
    if (!r.ok) throw new Error(r.reason);
    expect(r.fit.form).toBe('quadratic');
    expect(r.fit.coeffs[0] * 1e6).toBeCloseTo(3, 6);
    expect(r.fit.coeffs[1] * 1e6).toBeCloseTo(-0.05, 8);
    expect(r.fit.turnoverC).toHaveLength(1);
    expect(r.fit.turnoverC[0]).toBeCloseTo(25 + 3 / (2 * 0.05), 4);
  });

  it('needs three temperatures', () => {
    const r = fitTemperature(
      [
        { temperatureC: 25, fsHz: 1e7 },
        { temperatureC: 85, fsHz: 1e7 + 10 },
      ],
      'quartz-at',
    );
    expect(r).toEqual({ ok: false, reason: 'fs known at 2 temperatures; a temperature fit needs at least 3' });
  });
});
