/**
 * Seeded synthetic sweeps for the extraction tests: impedance of a known BVD model
 * (src/lib/models/bvd.ts, IEEE Std 177 model), optionally with a known capacitor across or in
 * series with the part, plus complex Gaussian noise relative to |Z|:
 * Z + |Z|·σ·(g1 + j·g2), σ = 10^(dB/20)/√2 (so the noise power is dB below the signal).
 */
import { impedanceOver, type BvdModel } from '../../../src/lib/models/bvd.ts';
import type { ImpedanceSweep } from '../../../src/lib/sweep/sweep.ts';
import type { Part, PartKind, SweepRef } from '../../../src/lib/schema/part.ts';
import type { ExtractSweepInput } from '../../../src/lib/extract/extract-part.ts';
import { gaussian } from '../../support/rng.ts';

/** n equally spaced frequencies from a to b, Hz. */
export function linGrid(aHz: number, bHz: number, n: number): Float64Array {
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = aHz + ((bHz - aHz) * i) / (n - 1);
  return f;
}

export interface SynthOptions {
  noiseDb?: number;
  seed?: number;
  addedCF?: number;
  connection?: 'parallel' | 'series';
  source?: string;
}

/** Measured impedance of the model (plus any added capacitor) with seeded noise. */
export function synthSweep(model: BvdModel, freqHz: Float64Array, o: SynthOptions = {}): ImpedanceSweep {
  const z = impedanceOver(model, freqHz);
  const g = gaussian(o.seed ?? 1);
  const sigma = o.noiseDb === undefined ? 0 : 10 ** (o.noiseDb / 20) / Math.SQRT2;
  for (let i = 0; i < freqHz.length; i++) {
    let r = z.zRe[i];
    let x = z.zIm[i];
    const w = 2 * Math.PI * freqHz[i];
    if (o.addedCF && o.connection === 'series') x -= 1 / (w * o.addedCF);
    if (o.addedCF && o.connection !== 'series') {
      const d = r * r + x * x;
      const gg = r / d;
      const b = -x / d + w * o.addedCF;
      const d2 = gg * gg + b * b;
      r = gg / d2;
      x = -b / d2;
    }
    const m = Math.hypot(r, x);
    z.zRe[i] = r + (sigma ? sigma * m * g() : 0);
    z.zIm[i] = x + (sigma ? sigma * m * g() : 0);
  }
  return { freqHz, zRe: z.zRe, zIm: z.zIm, source: o.source ?? 'synthetic' };
}

/** One sweep of a synthetic sample. */
export interface SweepPlan {
  file: string;
  freqHz: Float64Array;
  addedCF?: number;
  connection?: 'parallel' | 'series';
  temperatureC?: number;
  driveW?: number;
  /** Model for this sweep when it differs from the sample's (other temperature or drive). */
  model?: BvdModel;
}

/** A part with one sample measured by the planned sweeps, and the sweeps as the pipeline hands them over. */
export function syntheticPart(
  model: BvdModel,
  plans: SweepPlan[],
  o: {
    kind?: PartKind;
    noiseDb?: number;
    seed?: number;
    datasheet?: Part['datasheet'];
    instrumentMaxHz?: number;
    sampleTemperatureC?: number;
  } = {},
): { part: Part; inputs: ExtractSweepInput[] } {
  const refs: SweepRef[] = plans.map((p) => ({
    file: p.file,
    fixture: 'impedance',
    addedCapacitanceF: p.addedCF,
    addedConnection: p.addedCF ? (p.connection ?? 'parallel') : undefined,
    temperatureC: p.temperatureC,
    driveW: p.driveW,
  }));
  const part: Part = {
    id: 'SYN-1',
    title: 'synthetic test part',
    kind: o.kind ?? 'quartz-at',
    datasheet: o.datasheet,
    samples: [
      { id: 'A', sweeps: refs, instrumentMaxFrequencyHz: o.instrumentMaxHz, temperatureC: o.sampleTemperatureC },
    ],
  };
  const inputs: ExtractSweepInput[] = plans.map((p, i) => ({
    sampleId: 'A',
    ref: refs[i],
    file: p.file,
    impedance: synthSweep(p.model ?? model, p.freqHz, {
      noiseDb: o.noiseDb,
      seed: (o.seed ?? 1) * 7919 + i,
      addedCF: p.addedCF,
      connection: p.connection,
      source: p.file,
    }),
  }));
  return { part, inputs };
}

/** fs of a branch-style (L1, C1) pair, Hz. */
export function fsOf(l1H: number, c1F: number): number {
  return 1 / (2 * Math.PI * Math.sqrt(l1H * c1F));
}
