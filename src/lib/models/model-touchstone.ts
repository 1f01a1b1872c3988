/**
 * The fitted model as a one-port Touchstone v1 file (`.s1p`, option line `# Hz S RI R 50`):
 * S11 = (Z − Z0)/(Z + Z0) of the part alone (Touchstone v1.1, IBIS Open Forum), frequencies and
 * values with 17 significant digits (a double round-trips exactly), `!` comments for part, sample,
 * conditions and the caution that it is a model of measured data. Returns a string.
 */
import { impedanceAt, type BvdModel } from './bvd.ts';
import { sanitizeCommentText, type NetlistInfo } from './netlist-spice.ts';

export interface ModelTouchstoneOptions {
  /** First and last frequency, Hz; default the info's validSpanHz. */
  startHz?: number;
  stopHz?: number;
  /** Number of points (≥ 2), linear spacing; default {@link DEFAULT_POINTS}. */
  points?: number;
  /** Reference impedance, Ω; default 50. */
  z0Ohm?: number;
}

/** Default point count of a model file. */
export const DEFAULT_POINTS = 2001;
/** Most points written (a model file is a convenience, not a data dump). */
export const MAX_POINTS = 1_000_000;

export type ModelTouchstoneResult = { ok: true; text: string } | { ok: false; reason: string };

function num(x: number): string {
  return x.toExponential(16);
}

/** Write the model as a `.s1p` (see module doc); fails with a reason on a bad span. */
export function formatModelTouchstone(
  model: BvdModel,
  info: NetlistInfo,
  options: ModelTouchstoneOptions = {},
): ModelTouchstoneResult {
  const startHz = options.startHz ?? info.validSpanHz?.min;
  const stopHz = options.stopHz ?? info.validSpanHz?.max;
  const points = options.points ?? DEFAULT_POINTS;
  const z0 = options.z0Ohm ?? 50;
  if (startHz === undefined || stopHz === undefined)
    return { ok: false, reason: 'no frequency span: give start and stop' };
  if (!(startHz > 0) || !(stopHz > startHz))
    return { ok: false, reason: `expected 0 < start < stop, got ${startHz} Hz to ${stopHz} Hz` };
  if (!Number.isInteger(points) || points < 2 || points > MAX_POINTS)
    return { ok: false, reason: `expected 2 to ${MAX_POINTS} points, got ${points}` };
  if (!(z0 > 0)) return { ok: false, reason: `expected a positive reference impedance, got ${z0}` };

  const part: BvdModel = { c0F: model.c0F, branches: model.branches };
  const c = (t: string) => `! ${sanitizeCommentText(t)}`;
  const lines = [
    c(`Motional BVD model of ${info.partId}${info.title ? ` - ${info.title}` : ''}`),
    c(info.lotMedianOf ? `lot median part over ${info.lotMedianOf} samples` : `sample: ${info.sample ?? 'not named'}`),
    c(
      `measured: ${info.date ?? 'date not recorded'}${info.temperatureC !== undefined ? `; temperature ${info.temperatureC} C` : ''}${info.driveW !== undefined ? `; drive ${Number((info.driveW * 1e6).toPrecision(4))} uW` : ''}`,
    ),
    c('computed from the fitted model (C0 and one R-L-C branch per mode), not the raw measurement;'),
    c('narrow-band linear model of one sample: not a specification.'),
    c(
      `${part.branches.length} branch${part.branches.length === 1 ? '' : 'es'}, C0 = ${part.c0F} F; reference ${z0} ohm`,
    ),
    `# Hz S RI R ${z0}`,
  ];
  const step = (stopHz - startHz) / (points - 1);
  for (let i = 0; i < points; i++) {
    const f = i === points - 1 ? stopHz : startHz + i * step;
    const [r, x] = impedanceAt(part, f);
    // S11 = (Z − Z0)/(Z + Z0)
    const nr = r - z0;
    const dr = r + z0;
    const den = dr * dr + x * x;
    lines.push(`${num(f)} ${num((nr * dr + x * x) / den)} ${num((x * dr - nr * x) / den)}`);
  }
  return { ok: true, text: `${lines.join('\n')}\n` };
}
