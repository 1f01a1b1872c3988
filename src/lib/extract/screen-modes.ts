/**
 * Which modes of a sample are reportable, after each was refined by its own fit.
 *
 * - Duplicates: two candidates whose refined fs lie closer than {@link DUPLICATE_BANDWIDTHS}
 *   of the wider one's half-power bandwidth are one resonance (a second maximum, or a noise
 *   peak whose fit slid onto the mode). The stronger (lower R1) is kept; the other is dropped
 *   and its main/overtone role, if any, passes to the one kept.
 * - Spurious modes: reported only when (a) the mode's own least-squares fit converged with a
 *   finite, positive R1, and (b) it is at most {@link MAX_SPURIOUS_DB} dB weaker than its main
 *   mode by the resistance ratio 20·log10(Rspur/Rmain) (IEC 60444-9 states
 *   spurious response as a resistance ratio). A response 40 dB down (R ratio 100) has no
 *   practical effect on an oscillator, and at that level a "mode" found in a sweep is far more
 *   likely noise or fixture ripple than a resonance, so it is not published.
 * Main modes are never dropped here except as duplicates: their absence would hide a failure.
 * Duplicates and spurious sightings without a converged fit are also kept out of the joint fit
 * (`excluded`); a fitted spurious mode too weak to report stays in it.
 */
import type { ModeCandidate } from './classify-modes.ts';

/** Modes whose fs differ by less than this many bandwidths (of the wider) are one. */
export const DUPLICATE_BANDWIDTHS = 0.5;

/** Weakest reportable spurious mode: 20·log10(Rspur/Rmain) at most this, dB. */
export const MAX_SPURIOUS_DB = 40;

/** Refined values of one mode. */
export interface ModeEstimate {
  fsHz: number;
  r1Ohm: number;
  /** Half-power bandwidth fs/Q, Hz. */
  bandwidthHz: number;
  /** True when these values come from a converged least-squares fit of this mode. */
  fitted: boolean;
}

/** Verdict on every mode, by index. */
export interface ScreenModesResult {
  /** Index of the mode kept in this one's place, −1 when not a duplicate. */
  duplicateOf: number[];
  /** Why the mode is not reported (lower-case sentence fragment), undefined when it is. */
  dropped: Array<string | undefined>;
  /**
   * The mode is no resonance the model should hold (a duplicate, or a spurious sighting without
   * a converged fit): left out of the joint fit. A spurious mode that is real but too weak to
   * report stays in the fitted model, since the data show it.
   */
  excluded: boolean[];
}

/** 20·log10(Rspur/Rmain), dB; Infinity when not finite and positive. */
export function spuriousStrengthDb(rSpurOhm: number, rMainOhm: number): number {
  const ratio = rSpurOhm / rMainOhm;
  return Number.isFinite(ratio) && ratio > 0 ? 20 * Math.log10(ratio) : Infinity;
}

/**
 * Why spurious mode with R1 `rOhm` is not reportable next to a main mode of `mainROhm`, or
 * undefined when it is (rules in the module comment).
 */
export function spuriousRejection(rOhm: number, mainROhm: number | undefined, fitted: boolean): string | undefined {
  if (!fitted) return 'its least-squares fit did not converge';
  if (!(Number.isFinite(rOhm) && rOhm > 0)) return `its fitted r1 ${rOhm} Ω is not a finite positive value`;
  if (mainROhm === undefined || !(mainROhm > 0)) return undefined;
  const db = spuriousStrengthDb(rOhm, mainROhm);
  if (db > MAX_SPURIOUS_DB)
    return `${db.toFixed(1)} dB below the main mode (r1 ${rOhm.toPrecision(3)} Ω against ${mainROhm.toPrecision(3)} Ω; reported down to ${MAX_SPURIOUS_DB} dB)`;
  return undefined;
}

/**
 * Screen the classified modes with their refined values (`estimates[k]` for mode k;
 * undefined when none is usable). Mutates nothing; see {@link ScreenModesResult}.
 */
export function screenModes(modes: ModeCandidate[], estimates: Array<ModeEstimate | undefined>): ScreenModesResult {
  const n = modes.length;
  const duplicateOf = new Array<number>(n).fill(-1);
  const dropped = new Array<string | undefined>(n).fill(undefined);
  const excluded = new Array<boolean>(n).fill(false);
  const order = modes
    .map((_, k) => k)
    .filter((k) => estimates[k] !== undefined)
    .sort((a, b) => estimates[a]!.fsHz - estimates[b]!.fsHz);
  // Strongest first, so a chain of near-equal frequencies collapses onto one survivor.
  const byStrength = [...order].sort((a, b) => estimates[a]!.r1Ohm - estimates[b]!.r1Ohm);
  for (const k of byStrength) {
    if (duplicateOf[k] >= 0) continue;
    const e = estimates[k]!;
    for (const j of order) {
      if (j === k || duplicateOf[j] >= 0) continue;
      const o = estimates[j]!;
      if (!(o.r1Ohm >= e.r1Ohm)) continue;
      if (Math.abs(o.fsHz - e.fsHz) < DUPLICATE_BANDWIDTHS * Math.max(o.bandwidthHz, e.bandwidthHz)) duplicateOf[j] = k;
    }
  }
  // The main mode a spurious one is compared with (following duplicates to the one kept).
  const survivor = (k: number): number => {
    let s = k;
    for (let guard = 0; duplicateOf[s] >= 0 && guard < n; guard++) s = duplicateOf[s];
    return s;
  };
  for (let k = 0; k < n; k++) {
    if (duplicateOf[k] >= 0) {
      dropped[k] = `same resonance as the stronger mode near ${estimates[survivor(k)]!.fsHz.toPrecision(10)} Hz`;
      excluded[k] = true;
      continue;
    }
    const m = modes[k];
    if (!m.spurious) continue;
    const e = estimates[k];
    const main = m.mainIndex !== undefined ? estimates[survivor(m.mainIndex)] : undefined;
    const why = spuriousRejection(e?.r1Ohm ?? NaN, main?.r1Ohm, e?.fitted ?? false);
    if (why) dropped[k] = why;
    excluded[k] = !(e?.fitted ?? false);
  }
  return { duplicateOf, dropped, excluded };
}
