/**
 * Which extracted mode is the part's main (wanted) mode.
 *
 * Rules, first that applies:
 *  1. datasheet frequency given: the non-spurious mode whose fs is nearest to it, if within
 *     {@link NEAR_NOMINAL} (relative) — the physical answer, used by the overtone compliance check;
 *  2. datasheet overtone given: the strongest (lowest R1) non-spurious mode of that order;
 *  3. the strongest non-spurious mode;
 *  4. the strongest mode of all (every mode spurious).
 */

/** The mode fields the rule needs (ModeResult satisfies it). */
export interface ModeLike {
  overtone: number;
  spurious: boolean;
  fsHz: number;
  r1Ohm: number;
}

/** What the datasheet says, in SI (Datasheet satisfies it). */
export interface MainModeHints {
  /** Nominal frequency, Hz. */
  frequencyHz?: number;
  /** Intended overtone order. */
  overtone?: number;
}

/** The rule of the mode nearest the datasheet frequency (the overtone check relies on it). */
export const NEAREST_NOMINAL_RULE = 'mode nearest the datasheet frequency';

/** A mode counts as "at the nominal frequency" within this relative distance (5 %). */
export const NEAR_NOMINAL = 0.05;

export interface MainModeResult {
  /** Index into the modes array, or −1 when there are no modes. */
  index: number;
  /** Which rule picked it, for display. */
  rule: string;
}

function strongest<T extends ModeLike>(modes: T[], keep: (m: T) => boolean): number {
  let best = -1;
  modes.forEach((m, i) => {
    if (keep(m) && (best < 0 || m.r1Ohm < modes[best].r1Ohm)) best = i;
  });
  return best;
}

/** Pick the main mode of a sample (see module doc for the rules). */
export function mainMode<T extends ModeLike>(modes: T[], hints: MainModeHints = {}): MainModeResult {
  if (modes.length === 0) return { index: -1, rule: 'no modes' };
  if (hints.frequencyHz !== undefined && hints.frequencyHz > 0) {
    let best = -1;
    let bestDist = Infinity;
    modes.forEach((m, i) => {
      const dist = Math.abs(m.fsHz / hints.frequencyHz! - 1);
      if (!m.spurious && dist < bestDist) {
        bestDist = dist;
        best = i;
      }
    });
    if (best >= 0 && bestDist <= NEAR_NOMINAL) return { index: best, rule: NEAREST_NOMINAL_RULE };
  }
  if (hints.overtone !== undefined) {
    const i = strongest(modes, (m) => !m.spurious && m.overtone === hints.overtone);
    if (i >= 0) return { index: i, rule: `strongest mode of the datasheet overtone ${hints.overtone}` };
  }
  const i = strongest(modes, (m) => !m.spurious);
  if (i >= 0) return { index: i, rule: 'strongest non-spurious mode (lowest R1)' };
  return { index: strongest(modes, () => true), rule: 'strongest mode (all modes spurious)' };
}
