/**
 * The plots of a part page, as decimated curves: |Z| and phase around each mode (measured against
 * the model, with residuals), the widest sweep with every mode marked, pulling (ppm against load
 * capacitance) and frequency against temperature. Pure: data in, curves out.
 */
import type { ModeResult, SampleResult } from '../extract/types.ts';
import { impedanceAt, type BvdModel, type MotionalBranch } from '../models/bvd.ts';
import { modeLabel } from '../models/mode-label.ts';
import { loadFrequencyHz } from '../osc/load.ts';
import { decimateCurve, roundSig } from './decimate.ts';
import type { RecordSweep } from './record-input.ts';
import type { Curve, ModePlot, PullingPlot, TemperaturePlot, WidePlot } from './types.ts';
import type { Datasheet } from '../schema/part.ts';

/** At most this many mode plots per sample (main modes first, then spurious by strength). */
export const MAX_MODE_PLOTS_PER_SAMPLE = 4;
/** A mode plot needs at least this many measured points inside its frequency window (per plot). */
const MIN_WINDOW_POINTS = 12;

/** Last component of a path. */
export function baseName(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}

/**
 * Sweeps with nothing added taken at the sample's reference conditions (the extraction's
 * `referenceSweeps`): what the model describes; all sweeps with nothing added when none is.
 */
function plotSweeps(res: SampleResult, sweeps: RecordSweep[]): RecordSweep[] {
  const usable = sweeps.filter(
    (s) => s.impedance && s.impedance.freqHz.length > 1 && s.ref.addedCapacitanceF === undefined,
  );
  const atRef = usable.filter((s) => res.referenceSweeps.includes(s.ref.file));
  return atRef.length ? atRef : usable;
}

export function modePlots(
  res: SampleResult,
  sweeps: RecordSweep[],
  mainIndex: number | undefined,
  detailed: boolean,
): ModePlot[] {
  const refSweeps = plotSweeps(res, sweeps);
  const order = res.modes
    .map((m, i) => ({ m, i }))
    .filter(({ m, i }) => (detailed ? true : i === mainIndex) && !m.flagged)
    .sort((a, b) =>
      a.i === mainIndex
        ? -1
        : b.i === mainIndex
          ? 1
          : Number(a.m.spurious) - Number(b.m.spurious) || a.m.r1Ohm - b.m.r1Ohm,
    );
  const plots: ModePlot[] = [];
  for (const { m, i } of order) {
    if (plots.length >= MAX_MODE_PLOTS_PER_SAMPLE) break;
    const p = modePlot(res.model, m, i, refSweeps);
    if (p) plots.push(p);
  }
  return plots.sort((a, b) => a.fsHz - b.fsHz);
}

/** Frequency window of a mode plot: from half the fs–fp gap below fs to half above fp. */
export function modeWindow(m: { fsHz: number; fpHz: number; q: number }): [number, number] {
  const gap = Math.max(m.fpHz - m.fsHz, (20 * m.fsHz) / Math.max(m.q, 1));
  return [m.fsHz - 0.5 * gap, m.fpHz + 0.5 * gap];
}

function magPhase(re: number, im: number): [number, number] {
  return [Math.hypot(re, im), (Math.atan2(im, re) * 180) / Math.PI];
}

function modePlot(model: BvdModel, m: ModeResult, modeIndex: number, sweeps: RecordSweep[]): ModePlot | undefined {
  const [lo, hi] = modeWindow(m);
  let best: { sweep: RecordSweep; from: number; to: number } | undefined;
  for (const s of sweeps) {
    const f = s.impedance!.freqHz;
    if (!(f[0] <= m.fsHz && f[f.length - 1] >= m.fsHz)) continue;
    let from = 0;
    while (from < f.length && f[from] < lo) from++;
    let to = f.length;
    while (to > from && f[to - 1] > hi) to--;
    if (!best || to - from > best.to - best.from) best = { sweep: s, from, to };
  }
  if (!best || best.to - best.from < MIN_WINDOW_POINTS) return undefined;
  const z = best.sweep.impedance!;
  const n = best.to - best.from;
  const f = new Float64Array(n);
  const mag = new Float64Array(n);
  const ph = new Float64Array(n);
  const res = new Float64Array(n);
  let minIdx = 0;
  for (let k = 0; k < n; k++) {
    const i = best.from + k;
    f[k] = z.freqHz[i];
    [mag[k], ph[k]] = magPhase(z.zRe[i], z.zIm[i]);
    const [mr, mi] = impedanceAt(model, f[k]);
    const d = Math.hypot(z.zRe[i] - mr, z.zIm[i] - mi) / Math.hypot(mr, mi);
    res[k] = 100 * d;
    if (mag[k] < mag[minIdx]) minIdx = k;
  }
  // The model on the measured grid plus a dense set around fs and fp, so its extrema are drawn.
  const fModel = modelGrid(f, m);
  const mMag = new Float64Array(fModel.length);
  const mPh = new Float64Array(fModel.length);
  let mMin = 0;
  let mMax = 0;
  fModel.forEach((fk, k) => {
    const [r, x] = impedanceAt(model, fk);
    [mMag[k], mPh[k]] = magPhase(r, x);
    if (mMag[k] < mMag[mMin]) mMin = k;
    if (mMag[k] > mMag[mMax]) mMax = k;
  });
  let maxIdx = 0;
  for (let k = 0; k < n; k++) if (mag[k] > mag[maxIdx]) maxIdx = k;
  return {
    modeIndex,
    overtone: m.overtone,
    spurious: m.spurious,
    fsHz: m.fsHz,
    fpHz: m.fpHz,
    sweep: baseName(best.sweep.ref.file),
    measuredMag: decimateCurve(f, mag, { keep: [minIdx, maxIdx] }),
    measuredPhase: decimateCurve(f, ph, { keep: [minIdx, maxIdx], yDigits: 4 }),
    modelMag: decimateCurve(fModel, mMag, { keep: [mMin, mMax], maxPoints: 300 }),
    modelPhase: decimateCurve(fModel, mPh, { keep: [mMin, mMax], maxPoints: 300, yDigits: 4 }),
    residualPct: decimateCurve(f, res, { maxPoints: 200, yDigits: 3 }),
  };
}

/** Dense points around fs and fp (±3 bandwidths) merged into the measured grid. */
function modelGrid(f: Float64Array, m: ModeResult): Float64Array {
  const bw = m.fsHz / Math.max(m.q, 1);
  const extra: number[] = [];
  for (const c of [m.fsHz, m.fpHz]) for (let k = -30; k <= 30; k++) extra.push(c + (k / 10) * bw);
  const lo = f[0];
  const hi = f[f.length - 1];
  const all = Array.from(f).concat(extra.filter((x) => x > lo && x < hi));
  return Float64Array.from(all.sort((a, b) => a - b));
}

export function widePlot(res: SampleResult, sweeps: RecordSweep[], main: ModeResult): WidePlot | undefined {
  let best: RecordSweep | undefined;
  let bestSpan = 0;
  for (const s of sweeps) {
    const f = s.impedance?.freqHz;
    if (!f || f.length < 2) continue;
    const span = f[f.length - 1] - f[0];
    if (span > bestSpan) {
      bestSpan = span;
      best = s;
    }
  }
  if (!best) return undefined;
  // Only worth a plot when it shows more than the main mode's own frequency window (below).
  const [lo, hi] = modeWindow(main);
  if (bestSpan < 3 * (hi - lo) && res.modes.length < 2) return undefined;
  const z = best.impedance!;
  const n = z.freqHz.length;
  const mag = new Float64Array(n);
  const ph = new Float64Array(n);
  for (let i = 0; i < n; i++) [mag[i], ph[i]] = magPhase(z.zRe[i], z.zIm[i]);
  const keep = res.modes.map((m) => nearestIndex(z.freqHz, m.fsHz));
  return {
    sweep: baseName(best.ref.file),
    mag: decimateCurve(z.freqHz, mag, { keep }),
    phase: decimateCurve(z.freqHz, ph, { keep, maxPoints: 300, yDigits: 4 }),
    modes: res.modes.map((m) => ({ fsHz: m.fsHz, spurious: m.spurious, overtone: m.overtone, label: modeLabel(m) })),
  };
}

function nearestIndex(f: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = f.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (f[mid] < x) lo = mid;
    else hi = mid;
  }
  return Math.abs(f[lo] - x) <= Math.abs(f[hi] - x) ? lo : hi;
}

/** Range of load capacitance on the pulling plot, F. */
export function pullingRange(clF: number | undefined): [number, number] {
  if (clF === undefined) return [4e-12, 32e-12];
  return [Math.max(1e-12, clF / 3), Math.min(100e-12, clF * 3)];
}

export function pullingPlot(res: SampleResult, m: ModeResult, ds: Datasheet | undefined): PullingPlot | undefined {
  const branch: MotionalBranch = { fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F };
  const clDs = typeof ds?.loadCapacitanceF === 'number' ? ds.loadCapacitanceF : undefined;
  const [lo, hi] = pullingRange(clDs);
  const nominal =
    ds?.frequencyHz !== undefined && Math.abs(ds.frequencyHz / m.fsHz - 1) < 0.05 ? ds.frequencyHz : undefined;
  const refHz = nominal ?? m.fsHz;
  const ppm = (cl: number) => (loadFrequencyHz(branch, res.c0F, cl) / refHz - 1) * 1e6;
  const x: number[] = [];
  const y: number[] = [];
  const N = 120;
  for (let k = 0; k <= N; k++) {
    const cl = lo + ((hi - lo) * k) / N;
    x.push(roundSig(cl, 6));
    y.push(roundSig(ppm(cl), 6));
  }
  if (!y.every(Number.isFinite)) return undefined;
  return {
    curve: { x, y },
    reference: nominal ? 'nominal' : 'fs',
    referenceHz: refHz,
    datasheetClF: clDs,
    datasheetClPpm: clDs !== undefined ? roundSig(ppm(clDs), 6) : undefined,
  };
}

export function temperaturePlot(res: SampleResult): TemperaturePlot | undefined {
  const t = res.temperature!;
  if (!t.points.length) return undefined;
  const temps = t.points.map((p) => p.temperatureC);
  const lo = Math.min(t.spanRangeC.min, ...temps);
  const hi = Math.max(t.spanRangeC.max, ...temps);
  const fit: Curve = { x: [], y: [] };
  const N = 100;
  for (let k = 0; k <= N; k++) {
    const T = lo + ((hi - lo) * k) / N;
    const dt = T - t.t0C;
    const rel = t.coeffs.reduce((s, c, i) => s + c * Math.pow(dt, i + 1), 0);
    fit.x.push(roundSig(T, 5));
    fit.y.push(roundSig(rel * 1e6, 5));
  }
  // Points relative to the fit's own f0, so points and curve share one reference.
  return {
    points: { x: temps, y: t.points.map((p) => roundSig((p.fsHz / t.f0Hz - 1) * 1e6, 6)) },
    fit,
    form: t.form,
    f0Hz: t.f0Hz,
    t0C: t.t0C,
  };
}
