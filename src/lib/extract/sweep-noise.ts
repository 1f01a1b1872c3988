/**
 * Noise of a sweep's admittance, estimated from the data: over the whole sweep and in a window
 * around any point.
 *
 * Estimates come from second differences d²[k] = y[k+1] − 2y[k] + y[k−1]: for white noise of
 * spread σ they have spread √6·σ, while a smooth curve contributes only its curvature times
 * the step squared. Medians make the estimates robust against the few points where a
 * resonance's own curvature dominates.
 * - Relative noise of Y (noise of Z proportional to |Z| is noise of Y proportional to |Y|):
 *   the smaller of |d²G| and |d²B| over |Y|; for two independent normal values of spread s the
 *   median of the smaller magnitude is 0.3755·s.
 * - Absolute noise of G: median |d²G|; the median of |N(0, s)| is 0.6745·s.
 * The local estimates matter where the fixture converts its own noise into Z with a large
 * sensitivity |dZ/dS| (reflection or shunt-through far from Z0; derived from the fixture
 * conversions): there the noise of Y is many times the sweep's typical relative noise, and a
 * sweep-wide estimate both hides it locally and, when most of the sweep is such a region,
 * overstates it at the resonance.
 */

/** The local window reaches this many points beyond the block of the point asked about. */
export const LOCAL_NOISE_HALF_WIDTH = 20;

/** Points per block sharing one local window (so a window holds 2·20 + 8 = 48 points). */
export const LOCAL_NOISE_BLOCK = 8;

/** Noise floor assumed for perfect (synthetic, noiseless) data: −140 dB. */
export const NOISE_FLOOR = 1e-7;

/** Median of min(|N(0,s)|, |N(0,s)|) over s, for two independent values (common practice; order statistics). */
const MEDIAN_MIN_ABS_NORMAL = 0.3755;
/** Median |N(0, 1)| (common practice: MAD to standard deviation). */
const MEDIAN_ABS_NORMAL = 0.6744897501960817;
const SQRT6 = Math.sqrt(6);

/** Noise estimates of one sweep (see the module comment). */
export interface SweepNoise {
  /** Relative noise of Y over the whole sweep, dimensionless (at least NOISE_FLOOR). */
  relative: number;
  /** Relative noise of Y in the window around point i (at least NOISE_FLOOR). */
  relativeAt(i: number): number;
  /** Absolute noise of G in the window around point i, S. */
  conductanceAt(i: number): number;
  /** Median G in the window around point i, S: the background a peak stands on. */
  backgroundAt(i: number): number;
}

/** k-th smallest value (0-based) by quickselect; reorders `a`. */
export function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

/** Median (upper median for an even count), without sorting; `values` is not changed. */
export function median(values: Float64Array): number {
  if (values.length === 0) return 0;
  return select(values.slice(), values.length >> 1);
}

/**
 * Noise estimates of the admittance G + jB (|Y| = `yAbs`) of a sweep.
 * @param g conductance, S
 * @param b susceptance, S
 * @param yAbs |Y|, S
 */
export function sweepNoise(g: Float64Array, b: Float64Array, yAbs: Float64Array): SweepNoise {
  const n = g.length;
  const rel = new Float64Array(n);
  const absG = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) {
    const d2g = Math.abs(g[i + 1] - 2 * g[i] + g[i - 1]);
    const d2b = Math.abs(b[i + 1] - 2 * b[i] + b[i - 1]);
    rel[i] = Math.min(d2g, d2b) / yAbs[i];
    absG[i] = d2g;
  }
  const relative =
    n < 5 ? NOISE_FLOOR : Math.max(NOISE_FLOOR, median(rel.subarray(1, n - 1)) / MEDIAN_MIN_ABS_NORMAL / SQRT6);
  // Windows are shared by blocks of LOCAL_NOISE_BLOCK points (each block's window reaches
  // LOCAL_NOISE_HALF_WIDTH beyond it) and computed when first asked for.
  const blocks = Math.ceil(n / LOCAL_NOISE_BLOCK);
  const buf = new Float64Array(2 * LOCAL_NOISE_HALF_WIDTH + LOCAL_NOISE_BLOCK);
  const cached = (a: Float64Array, inner: boolean, scale: number, floor: number) => {
    const memo = new Float64Array(blocks).fill(NaN);
    return (i: number): number => {
      if (n < 5) return floor;
      const c = Math.min(blocks - 1, Math.max(0, Math.floor(i / LOCAL_NOISE_BLOCK)));
      let v = memo[c];
      if (Number.isNaN(v)) {
        const lo = Math.max(inner ? 1 : 0, c * LOCAL_NOISE_BLOCK - LOCAL_NOISE_HALF_WIDTH);
        const hi = Math.min(inner ? n - 2 : n - 1, (c + 1) * LOCAL_NOISE_BLOCK - 1 + LOCAL_NOISE_HALF_WIDTH);
        const m = hi - lo + 1;
        for (let k = 0; k < m; k++) buf[k] = a[lo + k];
        v = Math.max(floor, select(buf.subarray(0, m), m >> 1) * scale);
        memo[c] = v;
      }
      return v;
    };
  };
  return {
    relative,
    relativeAt: cached(rel, true, 1 / MEDIAN_MIN_ABS_NORMAL / SQRT6, NOISE_FLOOR),
    conductanceAt: cached(absG, true, 1 / MEDIAN_ABS_NORMAL / SQRT6, 0),
    backgroundAt: cached(g, false, 1, -Infinity),
  };
}
