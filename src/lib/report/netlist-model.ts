/**
 * The model a netlist or model download is written from: a sample's part-alone model with its
 * branch labels (the main mode as the extraction recorded it), or the lot's median part.
 */
import type { SampleResult } from '../extract/types.ts';
import { mainMode, type MainModeHints, type MainModeResult, type ModeLike } from '../extract/main-mode.ts';
import { sampleModel } from '../osc/sample-model.ts';
import { median } from '../osc/lot-stats.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { BranchLabel } from '../models/netlist-spice.ts';

export interface ModelFromResultOptions {
  /** Keep only the main mode. */
  mainModeOnly?: boolean;
  /** Keep spurious modes (default true). */
  includeSpurious?: boolean;
}

export interface ModelWithLabels {
  model: BvdModel;
  labels: BranchLabel[];
  /** Index of the main branch in `model.branches`, −1 when none. */
  mainIndex: number;
  mainRule: string;
}

/**
 * The part-alone model of a sample with its branch labels, after selection. The main mode is the
 * one the extraction recorded (`mainMode`, picked by extract/main-mode.ts).
 */
export function modelFromResult(
  sample: { c0F: number; modes: Array<ModeLike & { c1F: number }>; mainMode: MainModeResult },
  options: ModelFromResultOptions = {},
): ModelWithLabels {
  const main = sample.mainMode;
  const full = sampleModel(sample);
  let keep = sample.modes.map((_, i) => i);
  if (options.includeSpurious === false) keep = keep.filter((i) => !sample.modes[i].spurious || i === main.index);
  if (options.mainModeOnly) keep = main.index >= 0 ? [main.index] : [];
  return {
    model: { c0F: full.c0F, branches: keep.map((i) => full.branches[i]) },
    labels: keep.map((i) => ({
      overtone: sample.modes[i].overtone,
      spurious: sample.modes[i].spurious,
      main: i === main.index,
    })),
    mainIndex: keep.indexOf(main.index),
    mainRule: main.rule,
  };
}

/** A lot-median model and how it was built. */
export interface MedianModel extends ModelWithLabels {
  /** Samples with at least one mode. */
  n: number;
  /** Per kept branch: how many samples had that mode. */
  counts: number[];
}

/**
 * The lot's median part: per mode, the median over samples of fs, R1 and C1 (L1 follows from
 * fs and C1, so it is not exactly the median L1); C0 is the median C0. Modes are matched across
 * samples by (spurious, overtone, rank by frequency within that group); a mode enters the median
 * model only when more than half of the samples have it. Even counts take the mean of the middle two.
 * With no sample holding a mode the model is empty (n = 0, C0 = 0, no branches).
 */
export function medianModel(
  samples: Array<Pick<SampleResult, 'c0F' | 'modes'>>,
  hints: MainModeHints = {},
): MedianModel {
  const withModes = samples.filter((s) => s.modes.length > 0);
  const groups = new Map<string, { overtone: number; spurious: boolean; fs: number[]; r1: number[]; c1: number[] }>();
  for (const s of withModes) {
    const rank = new Map<string, number>();
    const order = s.modes.map((m, i) => i).sort((a, b) => s.modes[a].fsHz - s.modes[b].fsHz);
    for (const i of order) {
      const m = s.modes[i];
      const base = `${m.spurious ? 's' : 'm'}${m.overtone}`;
      const r = rank.get(base) ?? 0;
      rank.set(base, r + 1);
      const key = `${base}#${r}`;
      if (!groups.has(key)) groups.set(key, { overtone: m.overtone, spurious: m.spurious, fs: [], r1: [], c1: [] });
      const grp = groups.get(key)!;
      grp.fs.push(m.fsHz);
      grp.r1.push(m.r1Ohm);
      grp.c1.push(m.c1F);
    }
  }
  const kept = [...groups.values()].filter((grp) => grp.fs.length * 2 > withModes.length);
  const modes = kept
    .map((grp) => ({
      overtone: grp.overtone,
      spurious: grp.spurious,
      fsHz: median(grp.fs),
      r1Ohm: median(grp.r1),
      c1F: median(grp.c1),
      count: grp.fs.length,
    }))
    .sort((a, b) => Number(a.spurious) - Number(b.spurious) || a.overtone - b.overtone || a.fsHz - b.fsHz);
  const c0F = withModes.length ? median(withModes.map((s) => s.c0F)) : 0;
  const main = mainMode(modes, hints);
  return {
    model: { c0F, branches: modes.map((m) => ({ fsHz: m.fsHz, r1Ohm: m.r1Ohm, c1F: m.c1F })) },
    labels: modes.map((m, i) => ({ overtone: m.overtone, spurious: m.spurious, main: i === main.index })),
    mainIndex: main.index,
    mainRule: main.rule,
    n: withModes.length,
    counts: modes.map((m) => m.count),
  };
}
