/**
 * Step 2 of a sample's extraction (extract-sample.ts): the resonances of every sweep, then the
 * modes they make at the reference conditions, merged across sweeps and classified
 * (find-resonances.ts, classify-modes.ts).
 */
import type { Part } from '../schema/part.ts';
import type { Diagnostic } from './types.ts';
import { findResonances, type Resonance } from './find-resonances.ts';
import { classifyModes, type ModeCandidate, type Observation } from './classify-modes.ts';
import type { PreparedSweep, ReferenceSplit } from './reference-conditions.ts';

/** Resonances of each sweep, by its index in the prepared sweeps. */
export type ResonancesBySweep = Map<number, Resonance[]>;

/** The resonances of every sweep; their diagnostics go to `diagnostics`. */
export function findSweepResonances(prepared: PreparedSweep[], diagnostics: Diagnostic[]): ResonancesBySweep {
  const found: ResonancesBySweep = new Map();
  for (const s of prepared) {
    // A loaded sweep is centred on the load frequency: the part's own peak may sit at its
    // edge by design, and a series capacitor taken out of Z leaves noise not proportional to |Y|.
    const r = findResonances(s.part, { shapeCheck: !(s.loaded && s.connection === 'series') });
    found.set(s.index, r.resonances);
    diagnostics.push(
      ...r.diagnostics.filter((d) => !(s.loaded && (d.code === 'resonance-at-edge' || d.code === 'no-resonance'))),
    );
  }
  return found;
}

/** The modes seen in the reference sweeps, labelled fundamental / overtone / spurious. */
export function classifyReferenceModes(
  part: Part,
  split: ReferenceSplit,
  found: ResonancesBySweep,
  diagnostics: Diagnostic[],
): ModeCandidate[] {
  const observations: Observation[] = split.reference.flatMap((s) =>
    (found.get(s.index) ?? []).map((resonance) => ({
      sweepIndex: s.index,
      source: s.source,
      resonance,
      loaded: s.loaded,
    })),
  );
  const classified = classifyModes(observations, {
    kind: part.kind,
    datasheetFrequencyHz: part.datasheet?.frequencyHz,
    datasheetOvertone: part.datasheet?.overtone,
  });
  diagnostics.push(...classified.diagnostics);
  return classified.modes;
}
