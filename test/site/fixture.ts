/**
 * Synthetic site fixtures: part records, loaded sweeps and "perfect" extraction results built
 * directly from known BVD models (synthetic data, no extraction involved), for testing the page
 * data and the site without depending on the extractor. Invented reference resonators
 * (X1: 10 mH, 10 fF, 20 Ω, 3 pF) and typical parameter ranges (from memory).
 */
import { mainMode } from '../../src/lib/extract/main-mode.ts';
import { impedanceOver, inductanceOf, qualityOf, type BvdModel } from '../../src/lib/models/bvd.ts';
import type { ModeResult, PartResult, SampleResult } from '../../src/lib/extract/types.ts';
import type { Part } from '../../src/lib/schema/part.ts';
import type { LoadedPart, LoadedSweep } from '../../src/pipeline/load-part.ts';
import type { OscillatorCircuit } from '../../src/lib/schema/oscillators.ts';

export interface FixturePartSpec {
  id: string;
  title: string;
  kind: Part['kind'];
  package?: string;
  supplier?: string;
  notes?: string;
  datasheet?: Part['datasheet'];
  /** One model per sample. */
  samples: BvdModel[];
  overtones?: number[];
  spurious?: boolean[];
}

/** Deterministic pseudo-noise in [−1, 1]. */
function noise(i: number, seed: number): number {
  const x = Math.sin(i * 12.9898 + seed * 78.233) * 43758.5453;
  return 2 * (x - Math.floor(x)) - 1;
}

function fpOf(model: BvdModel, k: number): number {
  const b = model.branches[k];
  return b.fsHz * Math.sqrt(1 + b.c1F / model.c0F);
}

/** Sweep around branch k of a model: from fs − w to fp + w, n points, 0.2 % noise. */
export function sweepAround(
  model: BvdModel,
  k: number,
  n = 1601,
  seed = 1,
): { freqHz: Float64Array; zRe: Float64Array; zIm: Float64Array } {
  const fs = model.branches[k].fsHz;
  const fp = fpOf(model, k);
  const w = 0.4 * (fp - fs);
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = fs - w + ((fp - fs + 2 * w) * i) / (n - 1);
  const { zRe, zIm } = impedanceOver(model, f);
  for (let i = 0; i < n; i++) {
    zRe[i] *= 1 + 0.002 * noise(i, seed);
    zIm[i] *= 1 + 0.002 * noise(i + 7, seed);
  }
  return { freqHz: f, zRe, zIm };
}

function modeOf(model: BvdModel, k: number, overtone: number, spurious: boolean): ModeResult {
  const b = model.branches[k];
  const l1H = inductanceOf(b);
  const q = qualityOf(b);
  const r = model.c0F / b.c1F;
  const m = q / r;
  return {
    overtone,
    spurious,
    fsHz: b.fsHz,
    fpHz: fpOf(model, k),
    r1Ohm: b.r1Ohm,
    l1H,
    c1F: b.c1F,
    q,
    m,
    r,
    uncertainty: {
      fsHz: b.fsHz * 2e-9,
      fpHz: b.fsHz * 5e-9,
      r1Ohm: b.r1Ohm * 1e-3,
      l1H: l1H * 2e-4,
      c1F: b.c1F * 2e-4,
      c0F: model.c0F * 1e-3,
      q: q * 1e-3,
    },
    crossCheck: [
      {
        quantity: 'r1Ohm',
        values: [
          { method: 'complex-fit', value: b.r1Ohm, uncertainty: b.r1Ohm * 1e-3 },
          { method: 'conductance-peak', value: b.r1Ohm * 1.002 },
        ],
        verdict: 'agree',
        rule: 'within 3 combined standard uncertainties or 2 %',
      },
    ],
    sweeps: ['narrow.s1p'],
  };
}

/** A record, its loaded sweeps and a perfect result, from a spec. */
export function makeFixturePart(spec: FixturePartSpec): { loaded: LoadedPart; result: PartResult; part: Part } {
  const part: Part = {
    id: spec.id,
    title: spec.title,
    kind: spec.kind,
    package: spec.package,
    supplier: spec.supplier,
    supplierPart: `${spec.id}-SP`,
    notes: spec.notes,
    synthetic: true,
    datasheet: spec.datasheet,
    samples: spec.samples.map((m, i) => ({
      id: `S${i + 1}`,
      by: 'QA',
      measured: '2026-05-02',
      instrument: 'bench analyser',
      temperature: 25,
      sweeps: m.branches.map((_, k) => ({ file: `s${i + 1}-mode${k + 1}.csv`, fixture: 'impedance' as const })),
    })),
  };
  const sweeps: LoadedSweep[] = [];
  const samples: SampleResult[] = spec.samples.map((model, i) => {
    model.branches.forEach((_, k) => {
      const z = sweepAround(model, k, 1601, i * 10 + k);
      sweeps.push({
        sampleId: `S${i + 1}`,
        index: k,
        ref: part.samples[i].sweeps[k],
        file: `/nowhere/${spec.id}/s${i + 1}-mode${k + 1}.csv`,
        impedance: { ...z, source: `s${i + 1}-mode${k + 1}.csv` },
      });
    });
    const modes = model.branches.map((_, k) => modeOf(model, k, spec.overtones?.[k] ?? 1, spec.spurious?.[k] ?? false));
    const allF = sweeps
      .filter((s) => s.sampleId === `S${i + 1}`)
      .flatMap((s) => [s.impedance!.freqHz[0], s.impedance!.freqHz[s.impedance!.freqHz.length - 1]]);
    return {
      sample: `S${i + 1}`,
      c0F: model.c0F,
      modes,
      mainMode: mainMode(modes, { frequencyHz: spec.datasheet?.frequencyHz, overtone: spec.datasheet?.overtone }),
      referenceSweeps: part.samples[i].sweeps.map((s) => s.file),
      warnings: [],
      model,
      temperatureC: 25,
      c0CrossCheck: {
        quantity: 'c0F',
        values: [{ method: 'capacitive-region', value: model.c0F }],
        verdict: 'single',
        rule: 'one method',
      },
      fit: { converged: true, reason: 'small step', iterations: 12, rmsResidual: 0.002, points: 1601 },
      diagnostics: [],
      otherConditions: [],
      spanHz: { min: Math.min(...allF), max: Math.max(...allF) },
    };
  });
  const loaded: LoadedPart = {
    yamlFile: `/nowhere/${spec.id}/part.yaml`,
    folder: `/nowhere/${spec.id}`,
    part,
    issues: [],
    sweeps,
    id: spec.id,
    locate: () => ({}),
  };
  return { loaded, result: { part: spec.id, samples }, part };
}

/** Reference resonator X1 (invented): 10 mH, 10 fF, 20 Ω, 3 pF → fs = 15 915 494.309 Hz. */
export const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };

/** A demo Pierce circuit (invented values, common practice ranges). */
export const DEMO_CIRCUIT: OscillatorCircuit = {
  name: 'bench-pierce',
  description: 'test circuit',
  gmS: 8e-3,
  inputCapacitanceF: 3e-12,
  outputCapacitanceF: 4e-12,
  boardStrayF: 1.5e-12,
  boardStrayUncertaintyF: 0.5e-12,
  pinToPinStrayF: 0.3e-12,
  pinToPinStrayUncertaintyF: 0.1e-12,
  supplyV: 3.3,
  capacitorToleranceFraction: 0.05,
  series: 'E12',
};

/** A small varied catalogue of synthetic parts. */
export function fixtureCatalogue(): FixturePartSpec[] {
  const at = (fs: number, c1: number, r1: number, c0: number): BvdModel => ({
    c0F: c0,
    branches: [{ fsHz: fs, r1Ohm: r1, c1F: c1 }],
  });
  return [
    {
      id: 'XT-0001',
      title: '16 MHz reference resonator',
      kind: 'quartz-at',
      package: '3225',
      supplier: 'Example Crystals',
      notes: 'Reference part **X1**. See [the guide](https://example.invalid/guide).',
      datasheet: {
        frequencyHz: 15.92e6,
        tolerancePpm: 20,
        loadCapacitanceF: 8e-12,
        esrMaxOhm: 60,
        c0MaxF: 5e-12,
        overtone: 1,
      },
      samples: [X1, { ...X1, branches: [{ ...X1.branches[0], r1Ohm: 22, fsHz: X1.branches[0].fsHz * (1 + 3e-6) }] }],
    },
    {
      id: 'XT-0002',
      title: '12 MHz crystal, HC-49/S',
      kind: 'quartz-at',
      package: 'HC-49/S',
      supplier: 'Sample Quartz Works',
      datasheet: { frequencyHz: 12e6, tolerancePpm: 30, loadCapacitanceF: 18e-12, esrMaxOhm: 50 },
      samples: [at(11.9985e6, 14e-15, 28, 4.2e-12)],
    },
    {
      id: 'XT-0003',
      title: '12 MHz crystal, 2520 SMD <b>bold</b>',
      kind: 'quartz-at',
      package: '2520',
      supplier: 'Example Crystals',
      notes: '<script>alert(1)</script> second source',
      datasheet: { frequencyHz: 12e6, tolerancePpm: 10, loadCapacitanceF: 8e-12, esrMaxOhm: 60 },
      samples: [at(11.9982e6, 6e-15, 45, 1.8e-12)],
    },
    {
      id: 'XT-0004',
      title: '25 MHz crystal, 2016 SMD',
      kind: 'quartz-at',
      package: '2016',
      supplier: 'Sample Quartz Works',
      datasheet: { frequencyHz: 25e6, tolerancePpm: 10, loadCapacitanceF: 10e-12, esrMaxOhm: 40 },
      samples: [at(24.9975e6, 4e-15, 55, 1.5e-12)],
    },
    {
      id: 'XT-0005',
      title: '32.768 kHz tuning fork',
      kind: 'quartz-tuning-fork',
      package: '3215',
      supplier: 'Example Crystals',
      datasheet: { frequencyHz: 32768, tolerancePpm: 20, loadCapacitanceF: 12.5e-12, esrMaxOhm: 70e3 },
      samples: [{ c0F: 1.2e-12, branches: [{ fsHz: 32764.4, r1Ohm: 35e3, c1F: 3e-15 }] }],
    },
    {
      id: 'XT-0006',
      title: '4 MHz ceramic resonator',
      kind: 'ceramic',
      package: '3-pin',
      supplier: 'Sample Ceramics',
      datasheet: { frequencyHz: 4e6 },
      samples: [{ c0F: 20.6e-12, branches: [{ fsHz: 4.005879e6, r1Ohm: 8, c1F: 4.1e-12 }] }],
    },
  ];
}
