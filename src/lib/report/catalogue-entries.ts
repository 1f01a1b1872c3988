/**
 * What the catalogue shows of a part besides its page: its search-index row and the small data
 * the compare page fetches. Both are made from the part's page data.
 */
import { decimateCurve, roundSig } from './decimate.ts';
import { excerptMarkdown } from './notes-excerpt.ts';
import type { CompareData, Curve, IndexEntry, PartData } from './types.ts';
import { indexFits } from './fits.ts';
import { negativeResistanceCurves } from './design-curves.ts';

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
    fits: data.calculator ? indexFits(data.pierce, data.calculator.circuits, s.fsHz) : undefined,
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
      ? {
          ...mode,
          measuredMag: thin(mode.measuredMag, 250),
          modelMag: thin(mode.modelMag, 200),
          measuredPhase: thin(mode.measuredPhase, 200),
          modelPhase: thin(mode.modelPhase, 150),
          residualPct: { x: [], y: [] },
        }
      : undefined,
    pulling: first?.plots.pulling,
    negativeResistance: negativeResistanceCurves(data),
  };
}
