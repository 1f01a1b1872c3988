/**
 * R1 against drive level (drive-level dependence, DLD): the max/min resistance ratio γ over
 * the levels measured and the frequency change from the lowest to the highest level
 * (IEC 60444-6 computes γ over levels from well below to the rated level).
 */
import type { DriveLevelResult } from './types.ts';

/** One sweep's drive level and what was extracted from it. */
export interface DrivePoint {
  driveW: number;
  r1Ohm: number;
  fsHz: number;
  sweep: string;
}

/**
 * Resistance ratio above which the drive dependence is reported as a warning. Our default:
 * the limit proper belongs to the part's specification (IEC 60444-6 leaves it there).
 */
export const DRIVE_RATIO_WARNING = 1.3;

/** γ and the frequency shift over drive; undefined with fewer than two distinct levels. */
export function analyseDriveLevel(points: DrivePoint[]): DriveLevelResult | undefined {
  const usable = points.filter((p) => p.driveW > 0 && p.r1Ohm > 0 && p.fsHz > 0);
  const levels = new Set(usable.map((p) => p.driveW));
  if (levels.size < 2) return undefined;
  const sorted = [...usable].sort((a, b) => a.driveW - b.driveW);
  const rs = sorted.map((p) => p.r1Ohm);
  const lowest = sorted.filter((p) => p.driveW === sorted[0].driveW);
  const highest = sorted.filter((p) => p.driveW === sorted[sorted.length - 1].driveW);
  const mean = (ps: DrivePoint[]) => ps.reduce((a, p) => a + p.fsHz, 0) / ps.length;
  const fLow = mean(lowest);
  return {
    points: sorted.map((p) => ({ driveW: p.driveW, r1Ohm: p.r1Ohm, fsHz: p.fsHz, sweep: p.sweep })),
    resistanceRatio: Math.max(...rs) / Math.min(...rs),
    frequencyShiftPpm: ((mean(highest) - fLow) / fLow) * 1e6,
  };
}
