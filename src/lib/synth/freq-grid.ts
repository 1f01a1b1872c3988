/**
 * Frequency grids for synthetic sweeps, Hz: linear (start/stop or centre/span), logarithmic,
 * explicit, and segmented (several grids merged, as a bench analyser's segment sweep records
 * them: one strictly rising list).
 */

/** How to lay out the frequencies of a sweep. */
export type FreqGridSpec =
  | { kind: 'linear'; startHz: number; stopHz: number; points: number }
  | { kind: 'centered'; centerHz: number; spanHz: number; points: number }
  | { kind: 'log'; startHz: number; stopHz: number; points: number }
  | { kind: 'explicit'; freqHz: ArrayLike<number> }
  | { kind: 'segments'; segments: FreqGridSpec[] };

/**
 * Frequencies of a grid, strictly rising, Hz.
 * Segments are merged; points of later segments closer than 1e-9 relative to an earlier one are dropped.
 * @throws Error on a grid that cannot be laid out (fewer than 2 points, stop not above start,
 *   non-positive log bounds, explicit frequencies that do not rise)
 */
export function makeFreqGrid(spec: FreqGridSpec): Float64Array {
  switch (spec.kind) {
    case 'linear':
      return linear(spec.startHz, spec.stopHz, spec.points);
    case 'centered':
      return linear(spec.centerHz - spec.spanHz / 2, spec.centerHz + spec.spanHz / 2, spec.points);
    case 'log': {
      checkPoints(spec.points);
      if (!(spec.startHz > 0 && spec.stopHz > spec.startHz)) {
        throw new Error(`log grid needs 0 < start < stop, got ${spec.startHz}…${spec.stopHz} Hz`);
      }
      const out = new Float64Array(spec.points);
      const ratio = Math.log(spec.stopHz / spec.startHz);
      for (let i = 0; i < spec.points; i++) out[i] = spec.startHz * Math.exp((ratio * i) / (spec.points - 1));
      out[spec.points - 1] = spec.stopHz;
      return out;
    }
    case 'explicit': {
      const out = Float64Array.from(spec.freqHz);
      for (let i = 1; i < out.length; i++) {
        if (!(out[i] > out[i - 1]))
          throw new Error(`explicit grid must rise strictly, index ${i}: ${out[i]} Hz after ${out[i - 1]} Hz`);
      }
      return out;
    }
    case 'segments': {
      const all = spec.segments.flatMap((s) => Array.from(makeFreqGrid(s))).sort((a, b) => a - b);
      const out: number[] = [];
      for (const f of all) {
        if (out.length === 0 || f - out[out.length - 1] > 1e-9 * f) out.push(f);
      }
      return Float64Array.from(out);
    }
  }
}

function checkPoints(points: number): void {
  if (!(Number.isInteger(points) && points >= 2)) throw new Error(`a grid needs at least 2 points, got ${points}`);
}

function linear(startHz: number, stopHz: number, points: number): Float64Array {
  checkPoints(points);
  if (!(stopHz > startHz && startHz >= 0))
    throw new Error(`linear grid needs 0 ≤ start < stop, got ${startHz}…${stopHz} Hz`);
  const out = new Float64Array(points);
  const step = (stopHz - startHz) / (points - 1);
  for (let i = 0; i < points; i++) out[i] = startHz + step * i;
  out[points - 1] = stopHz;
  return out;
}

/**
 * Round grid frequencies to multiples of a resolution (a power of ten, Hz), keeping the
 * shortest decimal form and dropping points that collapse onto their predecessor.
 * @param resolutionHz e.g. 0.001; absent = the grid unchanged
 */
export function quantizeGrid(freqHz: Float64Array, resolutionHz?: number): Float64Array {
  if (resolutionHz === undefined) return freqHz;
  const decimals = Math.round(-Math.log10(resolutionHz));
  if (!(resolutionHz > 0) || Math.abs(10 ** -decimals - resolutionHz) > 1e-12 * resolutionHz) {
    throw new Error(`frequency resolution must be a power of ten, got ${resolutionHz} Hz`);
  }
  const out: number[] = [];
  for (const f of freqHz) {
    const q = decimals >= 0 ? Number(f.toFixed(decimals)) : Math.round(f / resolutionHz) * resolutionHz;
    if (out.length === 0 || q > out[out.length - 1]) out.push(q);
  }
  return Float64Array.from(out);
}
