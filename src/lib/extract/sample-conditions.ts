/**
 * Step 7 of a sample's extraction (extract-sample.ts): the main mode at the other conditions —
 * fs and R1 of the sweeps at other temperatures and drive levels (other-conditions.ts), the
 * temperature fit (temperature.ts) and the drive-level dependence (drive-level.ts).
 */
import type { Part } from '../schema/part.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { SampleResult } from './types.ts';
import type { ModeCandidate } from './classify-modes.ts';
import type { ResonancesBySweep } from './sample-resonances.ts';
import { SAME_TEMPERATURE_C, type ReferenceSplit } from './reference-conditions.ts';
import { mainModeAtConditions, type ConditionPoint } from './other-conditions.ts';
import { fitTemperature } from './temperature.ts';
import { analyseDriveLevel, DRIVE_RATIO_WARNING } from './drive-level.ts';

/**
 * Add the other conditions, the temperature fit and the drive-level analysis of the main mode
 * (result.modes[k], seen best as `cand`) to `result`, with their diagnostics.
 */
export function addOtherConditions(
  result: SampleResult,
  split: ReferenceSplit,
  found: ResonancesBySweep,
  model: BvdModel,
  k: number,
  part: Part,
  cand: ModeCandidate,
): void {
  const main = result.modes[k];
  const others = mainModeAtConditions(split.others, found, model, k);
  result.otherConditions = others.map((p) => ({
    sweep: p.sweep,
    temperatureC: p.temperatureC,
    driveW: p.driveW,
    fsHz: p.fsHz,
    r1Ohm: p.r1Ohm,
  }));
  const refPoint: ConditionPoint = {
    sweep: cand.best.source,
    temperatureC: split.temperatureC,
    driveW: split.driveW,
    fsHz: main.fsHz,
    r1Ohm: main.r1Ohm,
    pointsPerBandwidth: Infinity,
  };
  const all = [refPoint, ...others];

  // Temperature: one point per temperature, at its lowest drive, best resolved.
  const byTemp: ConditionPoint[] = [];
  for (const p of all) {
    if (p.temperatureC === undefined) continue;
    const i = byTemp.findIndex((q) => Math.abs(q.temperatureC! - p.temperatureC!) < SAME_TEMPERATURE_C);
    if (i < 0) {
      byTemp.push(p);
      continue;
    }
    const q = byTemp[i];
    const lower = (p.driveW ?? 0) < (q.driveW ?? 0);
    const same = (p.driveW ?? 0) === (q.driveW ?? 0);
    if (lower || (same && p.pointsPerBandwidth > q.pointsPerBandwidth)) byTemp[i] = p;
  }
  if (byTemp.length >= 3) {
    const t = fitTemperature(
      byTemp.map((p) => ({ temperatureC: p.temperatureC!, fsHz: p.fsHz })),
      part.kind,
      part.datasheet?.operatingRangeC,
    );
    if (t.ok) {
      result.temperature = t.fit;
      if (t.note) result.diagnostics.push({ code: 'other', severity: 'info', message: `temperature fit: ${t.note}` });
    } else result.diagnostics.push({ code: 'other', severity: 'warning', message: `temperature fit: ${t.reason}` });
  } else if (byTemp.length === 2) {
    result.diagnostics.push({
      code: 'other',
      severity: 'info',
      message: 'fs known at 2 temperatures; a temperature fit needs at least 3',
    });
  }

  // Drive level at the reference temperature.
  const atRefTemp = all.filter(
    (p) =>
      p.driveW !== undefined &&
      (split.temperatureC === undefined ||
        p.temperatureC === undefined ||
        Math.abs(p.temperatureC - split.temperatureC) < SAME_TEMPERATURE_C),
  );
  const drive = analyseDriveLevel(
    atRefTemp.map((p) => ({ driveW: p.driveW!, r1Ohm: p.r1Ohm, fsHz: p.fsHz, sweep: p.sweep })),
  );
  if (drive) {
    result.drive = drive;
    if (drive.resistanceRatio > DRIVE_RATIO_WARNING) {
      result.diagnostics.push({
        code: 'drive-dependence',
        severity: 'warning',
        message: `R1 changes by a factor ${drive.resistanceRatio.toFixed(2)} over the drive levels measured (limit used ${DRIVE_RATIO_WARNING}); frequency moves ${drive.frequencyShiftPpm.toFixed(2)} ppm`,
      });
    }
  }
}
