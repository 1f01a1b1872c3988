/**
 * Frequency against temperature.
 *
 * - quartz-at: cubic Δf/f = a1(T−T0) + a2(T−T0)² + a3(T−T0)³ with T0 = 25 °C; turning points
 *   solve a1 + 2a2t + 3a3t² = 0 (coefficients of Gerber & Ballato (eds.), Precision Frequency
 *   Control, Academic Press 1985, as quoted in M. Haney's 2001 thesis). Needs four
 *   temperatures; with three the quadratic is used instead.
 * - quartz-tuning-fork: parabola Δf/f = β(T − T0)² with the turnover T0 free (β ≈ −0.034
 *   ppm/°C², from memory): fitted as a quadratic in T, T0 = vertex.
 * - anything else: quadratic about 25 °C.
 * The span is the peak-to-peak of the fitted curve over the datasheet operating range, else
 * over the measured range (turning points inside the range included).
 */
import type { PartKind } from '../schema/part.ts';
import type { TemperatureFit } from './types.ts';
import { linearLeastSquares } from './small-linalg.ts';

/** One temperature with its series resonance. */
export interface TemperaturePoint {
  temperatureC: number;
  fsHz: number;
}

/** Reference temperature of the cubic and quadratic forms, °C. */
export const REFERENCE_TEMPERATURE_C = 25;

/** Δf/f (dimensionless) of a fit at T, °C. */
export function relativeOffsetAt(fit: Pick<TemperatureFit, 't0C' | 'coeffs'>, temperatureC: number): number {
  const t = temperatureC - fit.t0C;
  let s = 0;
  let p = 1;
  for (const c of fit.coeffs) {
    p *= t;
    s += c * p;
  }
  return s;
}

/** Real roots of a + b·t + c·t² = 0 (t relative to t0), sorted. */
function quadraticRoots(a: number, b: number, c: number): number[] {
  if (c === 0) return b !== 0 ? [-a / b] : [];
  const d = b * b - 4 * a * c;
  if (d < 0) return [];
  const s = Math.sqrt(d);
  const q = -0.5 * (b + (b >= 0 ? s : -s));
  const roots = q !== 0 ? [q / c, a / q] : [0, 0];
  return roots.sort((x, y) => x - y);
}

/** Turning points (°C) of a fit: zeros of d(Δf/f)/dT. */
export function turningPointsOf(fit: Pick<TemperatureFit, 't0C' | 'coeffs'>): number[] {
  const [a1 = 0, a2 = 0, a3 = 0] = fit.coeffs;
  return quadraticRoots(a1, 2 * a2, 3 * a3).map((t) => t + fit.t0C);
}

/** Peak-to-peak of Δf/f over [min, max] °C, ppm. */
export function spanPpmOver(fit: Pick<TemperatureFit, 't0C' | 'coeffs'>, minC: number, maxC: number): number {
  const ts = [minC, maxC, ...turningPointsOf(fit).filter((t) => t > minC && t < maxC)];
  const v = ts.map((t) => relativeOffsetAt(fit, t));
  return (Math.max(...v) - Math.min(...v)) * 1e6;
}

/** Outcome of {@link fitTemperature}. */
export type TemperatureFitOutcome = { ok: true; fit: TemperatureFit; note?: string } | { ok: false; reason: string };

/**
 * Fit fs against temperature for the part kind (see module doc).
 * @param operatingRange datasheet range for the span, °C; default the measured range
 */
export function fitTemperature(
  points: TemperaturePoint[],
  kind: PartKind,
  operatingRange?: { min: number; max: number },
): TemperatureFitOutcome {
  const temps = [...new Set(points.map((p) => p.temperatureC))];
  if (temps.length < 3)
    return {
      ok: false,
      reason: `fs known at ${temps.length} temperature${temps.length === 1 ? '' : 's'}; a temperature fit needs at least 3`,
    };
  let form: TemperatureFit['form'] =
    kind === 'quartz-at' ? 'cubic' : kind === 'quartz-tuning-fork' ? 'parabola' : 'quadratic';
  let note: string | undefined;
  if (form === 'cubic' && temps.length < 4) {
    form = 'quadratic';
    note = 'only 3 temperatures: quadratic instead of the cubic of an AT cut';
  }
  const degree = form === 'cubic' ? 3 : 2;
  const fRef = points.reduce((a, p) => a + p.fsHz, 0) / points.length;
  const tScale = 50; // °C, conditions the normal equations
  const t0 = REFERENCE_TEMPERATURE_C;
  const rows = points.map((p) => {
    const x = (p.temperatureC - t0) / tScale;
    return Array.from({ length: degree + 1 }, (_, k) => x ** k);
  });
  const y = points.map((p) => (p.fsHz - fRef) / fRef);
  const ls = linearLeastSquares(rows, y);
  if (!ls) return { ok: false, reason: 'temperature fit is singular' };
  const b = ls.beta.map((v, k) => v / tScale ** k); // y = Σ b_k (T − 25)^k
  let fit: TemperatureFit;
  if (form === 'parabola') {
    if (!(b[2] !== 0)) return { ok: false, reason: 'no curvature in fs against temperature: no turnover' };
    const tv = -b[1] / (2 * b[2]);
    const yv = b[0] + b[1] * tv + b[2] * tv * tv;
    const f0 = fRef * (1 + yv);
    fit = {
      form,
      t0C: t0 + tv,
      f0Hz: f0,
      coeffs: [0, b[2] / (1 + yv)],
      turnoverC: [t0 + tv],
      spanPpm: 0,
      spanRangeC: { min: 0, max: 0 },
      points: [],
      rmsResidualPpm: 0,
    };
  } else {
    const f0 = fRef * (1 + b[0]);
    const coeffs = b.slice(1).map((v) => v / (1 + b[0]));
    fit = {
      form,
      t0C: t0,
      f0Hz: f0,
      coeffs,
      turnoverC: [],
      spanPpm: 0,
      spanRangeC: { min: 0, max: 0 },
      points: [],
      rmsResidualPpm: 0,
    };
  }
  const tMin = Math.min(...temps);
  const tMax = Math.max(...temps);
  const range = operatingRange ?? { min: tMin, max: tMax };
  if (form !== 'parabola') {
    const margin = Math.max(30, range.max - range.min);
    fit.turnoverC = turningPointsOf(fit).filter(
      (t) => t >= Math.min(range.min, tMin) - margin && t <= Math.max(range.max, tMax) + margin,
    );
  }
  fit.spanRangeC = { min: range.min, max: range.max };
  fit.spanPpm = spanPpmOver(fit, range.min, range.max);
  fit.points = points.map((p) => ({
    temperatureC: p.temperatureC,
    fsHz: p.fsHz,
    offsetPpm: ((p.fsHz - fit.f0Hz) / fit.f0Hz) * 1e6,
  }));
  let ss = 0;
  for (const p of points) ss += ((p.fsHz - fit.f0Hz) / fit.f0Hz - relativeOffsetAt(fit, p.temperatureC)) ** 2;
  fit.rmsResidualPpm = Math.sqrt(ss / points.length) * 1e6;
  if (![fit.f0Hz, fit.t0C, fit.spanPpm, fit.rmsResidualPpm, ...fit.coeffs, ...fit.turnoverC].every(Number.isFinite)) {
    return { ok: false, reason: 'temperature fit gave non-finite values' };
  }
  return note ? { ok: true, fit, note } : { ok: true, fit };
}
