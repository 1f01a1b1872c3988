/**
 * Page data of one part: everything the part page, the compare page and the search index show,
 * as plain JSON (see ./types.ts). Pure: it takes the loaded record, the extraction result
 * and the team's circuits and returns data; it reads no file and keeps no state.
 *
 * Plot channels are decimated (≤ {@link MAX_CURVE_POINTS} points a curve, min/max-preserving, so
 * resonance extrema survive) to keep a part page under about 250 KB with its SVG plots.
 */
import type { ModeResult, PartResult, SampleResult } from '../extract/types.ts';
import type { Datasheet, Part, Sample } from '../schema/part.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { loadCapacitanceForHz } from '../osc/load.ts';
import { buildCalculator, buildCompliance, buildLotStats, buildPierce, summariseState } from './advice.ts';
import { baseName, modePlots, pullingPlot, temperaturePlot, widePlot } from './plots.ts';
import type { RecordInput, RecordSweep } from './record-input.ts';
import {
  PART_DATA_VERSION,
  type ComplianceState,
  type DownloadEntry,
  type PartData,
  type PartSummary,
  type SampleData,
  type SampleProvenance,
} from './types.ts';

/** Samples after the first get mode plots only for their main mode (page size). */
export const MAX_DETAILED_SAMPLES = 1;

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
export function makePartData(
  loaded: RecordInput,
  result: PartResult,
  circuits: OscillatorCircuit[],
  options: MakePartDataOptions = {},
): PartData {
  const part = loaded.part;
  if (!part) throw new Error(`makePartData: ${loaded.yamlFile} has no valid record`);
  const datasheet = part.datasheet;
  const samples = part.samples.map((sample, i) => {
    const res = result.samples.find((s) => s.sample === sample.id);
    return sampleData(
      sample,
      res,
      loaded.sweeps.filter((s) => s.sampleId === sample.id),
      part,
      datasheet,
      i < MAX_DETAILED_SAMPLES,
      options,
    );
  });
  const first = result.samples.find((s) => s.modes.length > 0);
  const main = first ? mainOf(first) : undefined;
  const compliance = buildCompliance(part, result);
  const state = summariseState(
    compliance,
    part.samples.map((s) => result.samples.find((r) => r.sample === s.id)),
  );
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
    downloads: (options.downloads ?? []).map((d): DownloadEntry => ({
      name: d.name,
      label: d.label ?? d.name,
      bytes: byteLength(d.content),
    })),
    recordWarnings: loaded.issues
      .filter((i) => i.severity === 'warning')
      .map((i) => `${i.path ? `${i.path}: ` : ''}${i.message}`),
  };
}

/** The main mode of a sample (as the extraction recorded it) with its index in `modes`. */
export function mainOf(sample: SampleResult): { mode: ModeResult; index: number } | undefined {
  const index = sample.mainMode.index;
  return index >= 0 ? { mode: sample.modes[index], index } : undefined;
}

function summaryOf(
  sample: SampleResult,
  main: { mode: ModeResult },
  ds: Datasheet | undefined,
  state: ComplianceState,
): PartSummary {
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
function clForNominal(m: ModeResult, c0F: number, ds: Datasheet | undefined): number | undefined {
  if (!ds?.frequencyHz) return undefined;
  const solved = loadCapacitanceForHz({ fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F }, c0F, ds.frequencyHz);
  return solved.ok ? solved.clF : undefined;
}

function provenanceOf(sample: Sample, sweeps: RecordSweep[], options: MakePartDataOptions): SampleProvenance {
  return {
    lot: sample.lot,
    by: sample.by,
    measured: sample.measured,
    instrument: sample.instrument,
    instrumentMaxFrequencyHz: sample.instrumentMaxFrequencyHz,
    temperatureC: sample.temperatureC,
    compensation: sample.compensation
      ? {
          open: sample.compensation.open,
          short: sample.compensation.short,
          load: sample.compensation.load,
          loadResistanceOhm: sample.compensation.loadResistanceOhm,
          fixture: sample.compensation.fixture,
        }
      : undefined,
    sweeps: sample.sweeps.map((ref, i) => {
      const loaded = sweeps.find((s) => s.index === i);
      const f = loaded?.impedance?.freqHz;
      return {
        file: ref.file,
        fixture: ref.fixture,
        referenceImpedanceOhm: ref.referenceImpedanceOhm ?? loaded?.network?.z0Ohm[0],
        addedCapacitanceF: ref.addedCapacitanceF,
        addedConnection: ref.addedCapacitanceF !== undefined ? (ref.addedConnection ?? 'parallel') : undefined,
        temperatureC: ref.temperatureC ?? sample.temperatureC,
        driveW: ref.driveW,
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

function sampleData(
  sample: Sample,
  res: SampleResult | undefined,
  sweeps: RecordSweep[],
  part: Part,
  ds: Datasheet | undefined,
  detailed: boolean,
  options: MakePartDataOptions,
): SampleData {
  const provenance = provenanceOf(sample, sweeps, options);
  if (!res) {
    return {
      id: sample.id,
      provenance,
      ok: false,
      modes: [],
      warnings: ['no extraction result for this sample'],
      diagnostics: [],
      otherConditions: [],
      plots: { modes: [] },
    };
  }
  const main = mainOf(res);
  // Everything the extraction reports of the sample, as it reports it (the model is written to
  // the downloads instead; the id is the page's own).
  const { sample: _id, model: _model, ...shown } = res;
  return {
    ...shown,
    id: sample.id,
    provenance,
    ok: res.modes.length > 0,
    c0F: res.modes.length > 0 ? res.c0F : undefined,
    plots: {
      modes: modePlots(res, sweeps, main?.index, detailed),
      // Wide sweep and pulling curve for the detailed sample only: others look the same (page size).
      wide: main && detailed ? widePlot(res, sweeps, main.mode) : undefined,
      pulling: main && detailed ? pullingPlot(res, main.mode, ds) : undefined,
      temperature: res.temperature ? temperaturePlot(res) : undefined,
    },
  };
}
