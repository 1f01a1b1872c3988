/**
 * Merging the resonances seen in a sample's sweeps into modes, and naming each mode:
 * fundamental, overtone, or spurious.
 *
 * - The same mode appears in several sweeps (narrow, wide, loaded — loaded sweeps are looked at
 *   with the added capacitor removed, so their series resonance is the part's own). Resonances
 *   closer than about two bandwidths (or 1.5 steps) are one mode; the best-resolved sighting
 *   (most points per bandwidth, not cut by an edge) represents it.
 * - Main or spurious: taken strongest first (lowest R1); a mode within `spuriousWindow`
 *   (relative frequency) of a stronger main mode is spurious (an unwanted mode near a main
 *   mode, weaker: higher R), else it is a main mode.
 * - Overtone order is physical (as `extract --json` reports `overtone`, README: Commands):
 *   thickness-shear plates respond near odd multiples n = 1, 3, 5, … of the fundamental, not
 *   exactly at them (f3/(3f1) ≈ 1.0028 for AT-cut, a piezoelectric stiffening estimate from
 *   memory). The reference is the datasheet frequency and overtone when given (so a
 *   third-overtone part's mode near its datasheet frequency is n = 3 and a mode near a third of
 *   it is n = 1), else the lowest main mode is the fundamental. A main mode not near an odd
 *   multiple, or a second one at the same order, is reclassified as spurious. Tuning forks
 *   have no such series: every mode but the fundamental is spurious.
 * - Spurious strength: resistance ratio Rspur/Rmain and 20·log10 of it, dB (IEC 60444-9
 *   specifies spurious response by resistance ratio).
 */
import type { Diagnostic } from './types.ts';
import type { Resonance } from './find-resonances.ts';
import type { PartKind } from '../schema/part.ts';
import { formatFrequency } from './format-frequency.ts';

/** One resonance seen in one sweep. */
export interface Observation {
  /** Index of the sweep in the caller's list. */
  sweepIndex: number;
  source: string;
  resonance: Resonance;
  /** The sweep had an added capacitor (removed before finding resonances). */
  loaded: boolean;
}

/** A mode of the sample with its classification. */
export interface ModeCandidate {
  fsHz: number;
  r1Ohm: number;
  bandwidthHz: number;
  observations: Observation[];
  /** Best-resolved sighting. */
  best: Observation;
  /** Physical overtone order; for spurious modes the order of the main mode it belongs to. */
  overtone: number;
  spurious: boolean;
  /** For spurious modes: index (in the returned list) of its main mode. */
  mainIndex?: number;
  /** Rspur/Rmain. */
  resistanceRatio?: number;
  /** 20·log10(Rspur/Rmain), dB. */
  strengthDb?: number;
}

/** Options of {@link classifyModes}. */
export interface ClassifyModesOptions {
  kind: PartKind;
  /** Datasheet nominal frequency, Hz. */
  datasheetFrequencyHz?: number;
  /** Datasheet overtone order of the nominal frequency. */
  datasheetOvertone?: number;
  /** Relative distance within which a weaker mode counts as a main mode's spurious. Default 0.25. */
  spuriousWindow?: number;
  /** Relative tolerance around n·f1 for an overtone. Default 0.05. */
  overtoneTolerance?: number;
}

/** Spurious attenuation in a fixture of loop resistance RT: 20·log10((RT + Rspur)/(RT + Rmain)), dB (derived from the circuit). */
export function spuriousAttenuationDb(rSpurOhm: number, rMainOhm: number, rtOhm = 0): number {
  return 20 * Math.log10((rtOhm + rSpurOhm) / (rtOhm + rMainOhm));
}

function better(a: Observation, b: Observation): boolean {
  const score = (o: Observation) => [
    o.resonance.atEdge ? 0 : 1,
    o.resonance.unresolved ? 0 : 1,
    o.resonance.conductance.ok ? 1 : 0,
    o.loaded ? 0 : 1,
  ];
  const sa = score(a);
  const sb = score(b);
  for (let i = 0; i < sa.length; i++) if (sa[i] !== sb[i]) return sa[i] > sb[i];
  return a.resonance.pointsPerBandwidth > b.resonance.pointsPerBandwidth;
}

/** Merge sightings into modes and classify them; result sorted fundamental, overtones, spurious. */
export function classifyModes(
  observations: Observation[],
  options: ClassifyModesOptions,
): { modes: ModeCandidate[]; diagnostics: Diagnostic[] } {
  const window = options.spuriousWindow ?? 0.25;
  const tol = options.overtoneTolerance ?? 0.05;
  const diagnostics: Diagnostic[] = [];
  const usable = observations
    .filter((o) => !o.resonance.atBoundary)
    .sort((a, b) => a.resonance.fsHz - b.resonance.fsHz);

  // Cluster sightings of the same mode.
  const clusters: Observation[][] = [];
  for (const o of usable) {
    let placed = false;
    for (let c = clusters.length - 1; c >= 0 && !placed; c--) {
      const cl = clusters[c];
      if (cl.some((p) => p.sweepIndex === o.sweepIndex)) continue;
      const near = cl.some((p) => {
        const r = p.resonance;
        const s = o.resonance;
        const gap = Math.abs(r.fsHz - s.fsHz);
        return gap <= Math.max(2 * r.bandwidthHz, 2 * s.bandwidthHz, 1.5 * r.stepHz, 1.5 * s.stepHz);
      });
      if (near) {
        cl.push(o);
        placed = true;
      }
    }
    if (!placed) clusters.push([o]);
  }
  const modes: ModeCandidate[] = clusters.map((cl) => {
    const best = cl.reduce((a, b) => (better(b, a) ? b : a));
    return {
      fsHz: best.resonance.fsHz,
      r1Ohm: best.resonance.r1Ohm,
      bandwidthHz: best.resonance.bandwidthHz,
      observations: cl,
      best,
      overtone: 1,
      spurious: false,
    };
  });
  if (modes.length === 0) return { modes, diagnostics };

  // Main or spurious, strongest first.
  const byStrength = modes.map((_, i) => i).sort((a, b) => modes[a].r1Ohm - modes[b].r1Ohm);
  const mains: number[] = [];
  for (const i of byStrength) {
    const m = modes[i];
    const owner = mains.find((j) => Math.abs(m.fsHz / modes[j].fsHz - 1) < window);
    if (owner !== undefined) {
      m.spurious = true;
      m.mainIndex = owner;
    } else mains.push(i);
  }

  // Overtone orders of the main modes.
  const sortedMains = [...mains].sort((a, b) => modes[a].fsHz - modes[b].fsHz);
  const series = options.kind !== 'quartz-tuning-fork';
  let f1: number;
  if (options.datasheetFrequencyHz && options.datasheetFrequencyHz > 0) {
    f1 = options.datasheetFrequencyHz / (options.datasheetOvertone ?? 1);
    // Anchor on the measured mode nearest the datasheet frequency when it is close.
    const near = sortedMains.reduce((a, b) =>
      Math.abs(modes[b].fsHz / options.datasheetFrequencyHz! - 1) <
      Math.abs(modes[a].fsHz / options.datasheetFrequencyHz! - 1)
        ? b
        : a,
    );
    if (Math.abs(modes[near].fsHz / options.datasheetFrequencyHz - 1) < tol)
      f1 = modes[near].fsHz / (options.datasheetOvertone ?? 1);
  } else {
    f1 = modes[sortedMains[0]].fsHz;
  }
  const taken = new Map<number, number>();
  const demote = (i: number) => {
    const m = modes[i];
    m.spurious = true;
    const others = mains.filter((j) => j !== i && !modes[j].spurious);
    if (others.length)
      m.mainIndex = others.reduce((a, b) =>
        Math.abs(Math.log(modes[b].fsHz / m.fsHz)) < Math.abs(Math.log(modes[a].fsHz / m.fsHz)) ? b : a,
      );
  };
  for (const i of [...mains].sort((a, b) => modes[a].r1Ohm - modes[b].r1Ohm)) {
    const ratio = modes[i].fsHz / f1;
    let n = Math.max(1, 2 * Math.round((ratio - 1) / 2) + 1);
    const offBy = Math.abs(ratio / n - 1);
    if (!series && n > 1) n = -1;
    if (n < 0 || offBy > tol || taken.has(n)) {
      if (mains.length > 1 || n < 0) {
        demote(i);
        continue;
      }
      n = Math.max(1, n);
    }
    modes[i].overtone = n;
    taken.set(n, i);
  }
  // A lone main mode demoted for lack of a series (e.g. only a spur survived) is restored.
  if (!modes.some((m) => !m.spurious)) {
    const strongest = byStrength[0];
    modes[strongest].spurious = false;
    modes[strongest].mainIndex = undefined;
  }
  for (const m of modes) {
    if (!m.spurious) continue;
    if (m.mainIndex === undefined || modes[m.mainIndex].spurious) {
      const candidates = modes.map((_, j) => j).filter((j) => !modes[j].spurious);
      m.mainIndex = candidates.reduce((a, b) =>
        Math.abs(Math.log(modes[b].fsHz / m.fsHz)) < Math.abs(Math.log(modes[a].fsHz / m.fsHz)) ? b : a,
      );
    }
    const main = modes[m.mainIndex];
    m.overtone = main.overtone;
    m.resistanceRatio = m.r1Ohm / main.r1Ohm;
    m.strengthDb = spuriousAttenuationDb(m.r1Ohm, main.r1Ohm);
  }

  // Sort: main modes by overtone, then spurious by frequency; remap mainIndex.
  const order = modes
    .map((_, i) => i)
    .sort((a, b) => {
      const ma = modes[a];
      const mb = modes[b];
      if (ma.spurious !== mb.spurious) return ma.spurious ? 1 : -1;
      if (!ma.spurious && ma.overtone !== mb.overtone) return ma.overtone - mb.overtone;
      return ma.fsHz - mb.fsHz;
    });
  const where = new Map(order.map((old, neu) => [old, neu]));
  const sorted = order.map((i) => modes[i]);
  for (const m of sorted) if (m.mainIndex !== undefined) m.mainIndex = where.get(m.mainIndex);

  if (options.datasheetFrequencyHz && options.datasheetFrequencyHz > 0) {
    const want = options.datasheetOvertone ?? 1;
    const main = sorted.find((m) => !m.spurious && Math.abs(m.fsHz / options.datasheetFrequencyHz! - 1) < tol);
    if (!main) {
      diagnostics.push({
        code: 'other',
        severity: 'warning',
        message: `no main mode found near the datasheet frequency ${formatFrequency(options.datasheetFrequencyHz, 7)} (overtone ${want}); check the sweep spans`,
      });
    }
  }
  return { modes: sorted, diagnostics };
}
