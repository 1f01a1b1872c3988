/**
 * Page data of one part: everything the part page, the compare page and the search index show,
 * as plain JSON (see src/site/types.ts). Pure: it takes the loaded record, the extraction result
 * and the team's circuits and returns data; it reads no file and keeps no state.
 *
 * Plot channels are decimated (≤ {@link MAX_CURVE_POINTS} points a curve, min/max-preserving, so
 * resonance extrema survive) to keep a part page under about 250 KB with its SVG plots.
 */
import type { LoadedPart, LoadedSweep } from './load-part.ts';
import type { ModeResult, PartResult, SampleResult } from '../lib/extract/types.ts';
import { impedanceAt, type BvdModel, type MotionalBranch } from '../lib/models/bvd.ts';
import type { Part, Sample } from '../lib/schema/part.ts';
import type { OscillatorCircuit } from '../lib/schema/oscillators.ts';
import { modeLabel } from '../lib/models/mode-label.ts';
import { loadCapacitanceForHz, loadFrequencyHz } from '../lib/osc/load.ts';
import { excerptMarkdown } from '../site/markdown.ts';
import { decimateCurve, MAX_CURVE_POINTS, roundSig } from '../site/decimate.ts';
import { buildCalculator, buildCompliance, buildLotStats, buildPierce, summariseState } from '../site/part-advice.ts';
import {
  PART_DATA_VERSION,
  type ComplianceState,
  type CompareData,
  type Curve,
  type DatasheetData,
  type DownloadEntry,
  type IndexEntry,
  type ModePlot,
  type PartData,
  type PartSummary,
  type PullingPlot,
  type SampleData,
  type SampleProvenance,
  type TemperaturePlot,
  type WidePlot,
} from '../site/types.ts';

export type { IndexEntry, PartData } from '../site/types.ts';

/** At most this many mode plots per sample (main modes first, then spurious by strength). */
export const MAX_MODE_PLOTS_PER_SAMPLE = 4;
/** Samples after the first get mode plots only for their main mode (page size). */
export const MAX_DETAILED_SAMPLES = 1;
/** A mode plot needs at least this many measured points in its window. */
const MIN_WINDOW_POINTS = 12;

export interface MakePartDataOptions {
  /** Site base path (informational; pages build their own links). */
  basePath?: string;
  /** The downloads of this part (from makeDownloads), for names and sizes. */
  downloads?: Array<{ name: string; label?: string; content: string | Uint8Array }>;
  /** Sizes of raw files in bytes by path, when known. */
  fileBytes?: Record<string, number>;
}

/** Byte length of UTF-8 text or bytes. */
export function byteLength(content: string | Uint8Array): number {
  return typeof content === 'string' ? new TextEncoder().encode(content).length : content.byteLength;
}

/** Build the page data of one part. The record must be valid (`loaded.part` present). */
export function makePartData(loaded: LoadedPart, result: PartResult, circuits: OscillatorCircuit[], options: MakePartDataOptions = {}): PartData {
  const part = loaded.part;
  if (!part) throw new Error(`makePartData: ${loaded.yamlFile} has no valid record`);
  const datasheet = datasheetData(part);
  const samples = part.samples.map((sample, i) => {
    const res = result.samples.find((s) => s.sample === sample.id);
    return sampleData(sample, res, loaded.sweeps.filter((s) => s.sampleId === sample.id), part, datasheet, i < MAX_DETAILED_SAMPLES, options);
  });
  const first = result.samples.find((s) => s.modes.length > 0);
  const main = first ? mainOf(first) : undefined;
  const compliance = buildCompliance(part, result);
  const state = summariseState(compliance, part.samples.map((s) => result.samples.find((r) => r.sample === s.id)));
  const summary: PartSummary = main && first ? summaryOf(first, main, datasheet, state) : { state };
  return {
    version: PART_DATA_VERSION,
    id: part.id,
    title: part.title,
    kind: part.kind,
    package: part.package,
    supplier: part.supplier,
    supplierPart: part.supplierPart,
    notes: part.notes,
    synthetic: part.synthetic === true,
    datasheet,
    summary,
    compliance,
    lotStats: buildLotStats(part, result),
    pierce: main && first ? buildPierce(first, main, part, circuits) : [],
    calculator: main && first ? buildCalculator(first, main, part, circuits) : undefined,
    samples,
    downloads: (options.downloads ?? []).map((d): DownloadEntry => ({ name: d.name, label: d.label ?? d.name, bytes: byteLength(d.content) })),
    recordWarnings: loaded.issues.filter((i) => i.severity === 'warning').map((i) => `${i.path ? `${i.path}: ` : ''}${i.message}`),
  };
}

/** The main mode of a sample (as the extraction recorded it) with its index in `modes`. */
export function mainOf(sample: SampleResult): { mode: ModeResult; index: number } | undefined {
  const index = sample.mainMode.index;
  return index >= 0 ? { mode: sample.modes[index], index } : undefined;
}

/** Index of the model branch that belongs to a mode (nearest fs). */
export function branchIndexOf(model: BvdModel, fsHz: number): number {
  let best = 0;
  model.branches.forEach((b, i) => {
    if (Math.abs(b.fsHz - fsHz) < Math.abs(model.branches[best].fsHz - fsHz)) best = i;
  });
  return best;
}

function summaryOf(sample: SampleResult, main: { mode: ModeResult }, ds: DatasheetData | undefined, state: ComplianceState): PartSummary {
  const m = main.mode;
  return {
    fsHz: m.fsHz,
    fpHz: m.fpHz,
    r1Ohm: m.r1Ohm,
    l1H: m.l1H,
    c1F: m.c1F,
    c0F: sample.c0F,
    q: m.q,
    overtone: m.overtone,
    clForNominalF: clForNominal(m, sample.c0F, ds),
    state,
  };
}

/** Load capacitance that brings the main mode to the datasheet frequency (lossless form), F. */
function clForNominal(m: ModeResult, c0F: number, ds: DatasheetData | undefined): number | undefined {
  if (!ds?.frequencyHz) return undefined;
  const solved = loadCapacitanceForHz({ fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F }, c0F, ds.frequencyHz);
  return solved.ok ? solved.clF : undefined;
}

function datasheetData(part: Part): DatasheetData | undefined {
  const d = part.datasheet;
  if (!d) return undefined;
  return {
    frequencyHz: d.frequency,
    tolerancePpm: d.tolerance,
    stabilityPpm: d.stability,
    loadCapacitanceF: d.loadCapacitance,
    esrMaxOhm: d.esrMax,
    c0MaxF: d.c0Max,
    driveMaxW: d.driveMax,
    overtone: d.overtone,
    operatingRangeC: d.operatingRange,
  };
}

function baseName(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}

function provenanceOf(sample: Sample, sweeps: LoadedSweep[], options: MakePartDataOptions): SampleProvenance {
  return {
    lot: sample.lot,
    by: sample.by,
    measured: sample.measured,
    instrument: sample.instrument,
    instrumentMaxFrequencyHz: sample.instrumentMaxFrequency,
    temperatureC: sample.temperature,
    compensation: sample.compensation
      ? { open: sample.compensation.open, short: sample.compensation.short, load: sample.compensation.load, loadResistanceOhm: sample.compensation.loadResistance, fixture: sample.compensation.fixture }
      : undefined,
    sweeps: sample.sweeps.map((ref, i) => {
      const loaded = sweeps.find((s) => s.index === i);
      const f = loaded?.impedance?.freqHz;
      return {
        file: ref.file,
        fixture: ref.fixture,
        referenceImpedanceOhm: ref.referenceImpedance ?? loaded?.network?.z0Ohm[0],
        addedCapacitanceF: ref.addedCapacitance,
        addedConnection: ref.addedCapacitance !== undefined ? (ref.addedConnection ?? 'parallel') : undefined,
        temperatureC: ref.temperature ?? sample.temperature,
        driveW: ref.drive,
        points: f?.length,
        startHz: f && f.length ? f[0] : undefined,
        stopHz: f && f.length ? f[f.length - 1] : undefined,
        bytes: (loaded && options.fileBytes?.[loaded.file]) ?? downloadBytes(options, ref.file),
      };
    }),
  };
}

function downloadBytes(options: MakePartDataOptions, file: string): number {
  const d = options.downloads?.find((x) => x.name === `raw/${file}` || x.name === `raw/${baseName(file)}`);
  return d ? byteLength(d.content) : 0;
}

function sampleData(sample: Sample, res: SampleResult | undefined, sweeps: LoadedSweep[], part: Part, ds: DatasheetData | undefined, detailed: boolean, options: MakePartDataOptions): SampleData {
  const provenance = provenanceOf(sample, sweeps, options);
  if (!res) {
    return { id: sample.id, provenance, ok: false, modes: [], warnings: ['no extraction result for this sample'], diagnostics: [], otherConditions: [], plots: { modes: [] } };
  }
  const main = mainOf(res);
  return {
    id: sample.id,
    provenance,
    ok: res.modes.length > 0,
    c0F: res.modes.length > 0 ? res.c0F : undefined,
    modes: res.modes,
    c0CrossCheck: res.c0CrossCheck,
    fit: res.fit,
    warnings: res.warnings,
    diagnostics: res.diagnostics,
    temperatureC: res.temperatureC,
    driveW: res.driveW,
    temperature: res.temperature,
    drive: res.drive,
    otherConditions: res.otherConditions,
    mainMode: res.mainMode,
    plots: {
      modes: modePlots(res, sweeps, main?.index, detailed),
      // Wide sweep and pulling curve for the detailed sample only: others look the same (page size).
      wide: main && detailed ? widePlot(res, sweeps, main.mode) : undefined,
      pulling: main && detailed ? pullingPlot(res, main.mode, ds, part) : undefined,
      temperature: res.temperature ? temperaturePlot(res) : undefined,
    },
  };
}

/**
 * Sweeps with nothing added taken at the sample's reference conditions (the extraction's
 * `referenceSweeps`): what the model describes; all sweeps with nothing added when none is.
 */
function plotSweeps(res: SampleResult, sweeps: LoadedSweep[]): LoadedSweep[] {
  const usable = sweeps.filter((s) => s.impedance && s.impedance.freqHz.length > 1 && s.ref.addedCapacitance === undefined);
  const atRef = usable.filter((s) => res.referenceSweeps.includes(s.ref.file));
  return atRef.length ? atRef : usable;
}

function modePlots(res: SampleResult, sweeps: LoadedSweep[], mainIndex: number | undefined, detailed: boolean): ModePlot[] {
  const refSweeps = plotSweeps(res, sweeps);
  const order = res.modes
    .map((m, i) => ({ m, i }))
    .filter(({ m, i }) => (detailed ? true : i === mainIndex) && !m.flagged)
    .sort((a, b) => (a.i === mainIndex ? -1 : b.i === mainIndex ? 1 : Number(a.m.spurious) - Number(b.m.spurious) || a.m.r1Ohm - b.m.r1Ohm));
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

function modePlot(model: BvdModel, m: ModeResult, modeIndex: number, sweeps: LoadedSweep[]): ModePlot | undefined {
  const [lo, hi] = modeWindow(m);
  let best: { sweep: LoadedSweep; from: number; to: number } | undefined;
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

function widePlot(res: SampleResult, sweeps: LoadedSweep[], main: ModeResult): WidePlot | undefined {
  let best: LoadedSweep | undefined;
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
  // Only worth a plot when it shows more than the main mode's own window.
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

function pullingPlot(res: SampleResult, m: ModeResult, ds: DatasheetData | undefined, part: Part): PullingPlot | undefined {
  void part;
  const branch: MotionalBranch = { fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F };
  const clDs = typeof ds?.loadCapacitanceF === 'number' ? ds.loadCapacitanceF : undefined;
  const [lo, hi] = pullingRange(clDs);
  const nominal = ds?.frequencyHz !== undefined && Math.abs(ds.frequencyHz / m.fsHz - 1) < 0.05 ? ds.frequencyHz : undefined;
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

function temperaturePlot(res: SampleResult): TemperaturePlot | undefined {
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
  return { points: { x: temps, y: t.points.map((p) => roundSig((p.fsHz / t.f0Hz - 1) * 1e6, 6)) }, fit, form: t.form, f0Hz: t.f0Hz, t0C: t.t0C };
}

/** Search-index row of a part. */
export function makeIndexEntry(data: PartData): IndexEntry {
  const s = data.summary;
  return {
    id: data.id,
    title: data.title,
    supplier: data.supplier,
    supplierPart: data.supplierPart,
    package: data.package,
    kind: data.kind,
    notes: data.notes ? excerptMarkdown(data.notes, 140) : undefined,
    fsHz: s.fsHz,
    r1Ohm: s.r1Ohm !== undefined ? roundSig(s.r1Ohm, 6) : undefined,
    c0F: s.c0F !== undefined ? roundSig(s.c0F, 6) : undefined,
    c1F: s.c1F !== undefined ? roundSig(s.c1F, 6) : undefined,
    q: s.q !== undefined ? roundSig(s.q, 6) : undefined,
    clForNominalF: s.clForNominalF !== undefined ? roundSig(s.clForNominalF, 6) : undefined,
    samples: data.samples.length,
    overtone: s.overtone ?? data.datasheet?.overtone,
    state: s.state,
    synthetic: data.synthetic || undefined,
  };
}

/** The compare page's data of a part: summary and the first sample's main-mode plot. */
export function makeCompareData(data: PartData): CompareData {
  const first = data.samples.find((s) => s.ok);
  const mode = first?.plots.modes.find((p) => p.modeIndex === first.mainMode?.index) ?? first?.plots.modes[0];
  const thin = (c: Curve, n: number): Curve => decimateCurve(c.x, c.y, { maxPoints: n });
  return {
    id: data.id,
    title: data.title,
    kind: data.kind,
    summary: data.summary,
    datasheet: data.datasheet,
    mode: mode
      ? { ...mode, measuredMag: thin(mode.measuredMag, 250), modelMag: thin(mode.modelMag, 200), measuredPhase: thin(mode.measuredPhase, 200), modelPhase: thin(mode.modelPhase, 150), residualPct: { x: [], y: [] } }
      : undefined,
    pulling: first?.plots.pulling,
  };
}

export { MAX_CURVE_POINTS };
