/**
 * Quick facts of one impedance sweep for a draft record (README: Commands, `motional new`): is
 * there a resonance, where is the main one, and the BVD values near it (IEEE Std 177 model).
 *
 * Near a resonance the admittance Y = Ym + jωC traces a circle (the motional branch
 * Ym = 1/(R1 + jX) is a circle of diameter 1/R1 through the origin, shifted by jωC, C the shunt
 * capacitance seen: C0, strays and any added parallel capacitor). A least-squares circle
 * (Kåsa's algebraic fit) through the points above a tenth of the conductance peak gives C and R1;
 * Zm = 1/(Y − jωC) then gives fs (X = 0) and L1 from dX/dω = 2·L1 at fs.
 * These are starting values for a draft, not the extraction's results.
 */
import type { ImpedanceSweep } from '../sweep/sweep.ts';

export interface SweepFeatures {
  startHz: number;
  stopHz: number;
  points: number;
  /** A resonance is seen: the reactance changes sign inside the sweep. */
  resonant: boolean;
  /** Main resonance (largest conductance), Hz; with fit values when enough points lie on it. */
  fsHz?: number;
  r1Ohm?: number;
  l1H?: number;
  c1F?: number;
  q?: number;
  /** Shunt capacitance seen at the resonance, F (C0, strays and added parallel capacitors). */
  shuntF?: number;
  /** Frequency of the largest |Z| above fs, when inside the sweep, Hz. */
  faHz?: number;
}

/** Facts of one sweep. */
export function sweepFeatures(sweep: ImpedanceSweep): SweepFeatures {
  const n = sweep.freqHz.length;
  const out: SweepFeatures = { startHz: sweep.freqHz[0], stopHz: sweep.freqHz[n - 1], points: n, resonant: false };
  if (n < 3) return out;
  const g = new Float64Array(n);
  const b = new Float64Array(n);
  let signChanges = 0;
  for (let i = 0; i < n; i++) {
    const r = sweep.zRe[i];
    const x = sweep.zIm[i];
    const d = r * r + x * x;
    g[i] = d > 0 ? r / d : 0;
    b[i] = d > 0 ? -x / d : 0;
    if (i > 0 && Math.sign(sweep.zIm[i]) !== Math.sign(sweep.zIm[i - 1]) && sweep.zIm[i] !== 0) signChanges++;
  }
  out.resonant = signChanges > 0;
  if (!out.resonant) return out;
  let imax = 0;
  for (let i = 1; i < n; i++) if (g[i] > g[imax]) imax = i;
  out.fsHz = sweep.freqHz[imax];
  // The contiguous run of points above a tenth of the peak.
  let lo = imax;
  let hi = imax;
  while (lo > 0 && g[lo - 1] > 0.1 * g[imax]) lo--;
  while (hi < n - 1 && g[hi + 1] > 0.1 * g[imax]) hi++;
  if (hi - lo + 1 >= 5) {
    const circle = fitCircle(g, b, lo, hi);
    if (circle) {
      const w0 = 2 * Math.PI * sweep.freqHz[imax];
      const shunt = circle.cy / w0;
      out.shuntF = shunt;
      out.r1Ohm = 1 / (2 * circle.radius);
      // Motional reactance per point, then its zero and slope.
      const xs: number[] = [];
      const ws: number[] = [];
      for (let i = lo; i <= hi; i++) {
        const w = 2 * Math.PI * sweep.freqHz[i];
        const gm = g[i];
        const bm = b[i] - w * shunt;
        const d = gm * gm + bm * bm;
        if (d > 0) {
          xs.push(-bm / d);
          ws.push(w);
        }
      }
      const zero = zeroCrossing(ws, xs);
      if (zero !== undefined) {
        out.fsHz = zero / (2 * Math.PI);
        const near = ws.map((w, k) => ({ w, x: xs[k] })).filter((p) => Math.abs(p.x) < 2 * out.r1Ohm!);
        if (near.length >= 3) {
          const slope = regressionSlope(
            near.map((p) => p.w),
            near.map((p) => p.x),
          );
          if (slope > 0) {
            out.l1H = slope / 2;
            out.c1F = 1 / (zero * zero * out.l1H);
            out.q = (zero * out.l1H) / out.r1Ohm;
          }
        }
      }
    }
  }
  // Anti-resonance: the largest |Z| above the main resonance, when not at the sweep's end.
  let ifa = -1;
  let best = -1;
  for (let i = imax + 1; i < n; i++) {
    const m = Math.hypot(sweep.zRe[i], sweep.zIm[i]);
    if (m > best) {
      best = m;
      ifa = i;
    }
  }
  if (ifa > imax && ifa < n - 1) out.faHz = sweep.freqHz[ifa];
  return out;
}

/** Kåsa circle fit of the points (x, y) from lo to hi: centre and radius. */
function fitCircle(
  x: Float64Array,
  y: Float64Array,
  lo: number,
  hi: number,
): { cx: number; cy: number; radius: number } | undefined {
  // Scale to the data to keep the normal equations well conditioned.
  let scale = 0;
  for (let i = lo; i <= hi; i++) scale = Math.max(scale, Math.abs(x[i]), Math.abs(y[i]));
  if (!(scale > 0)) return undefined;
  // Minimise Σ (u² + v² + D·u + E·v + F)² over D, E, F.
  const m = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const r = [0, 0, 0];
  for (let i = lo; i <= hi; i++) {
    const u = x[i] / scale;
    const v = y[i] / scale;
    const row = [u, v, 1];
    const t = -(u * u + v * v);
    for (let a = 0; a < 3; a++) {
      r[a] += row[a] * t;
      for (let c = 0; c < 3; c++) m[a][c] += row[a] * row[c];
    }
  }
  const sol = solve3(m, r);
  if (!sol) return undefined;
  const [d, e, f] = sol;
  const cx = -d / 2;
  const cy = -e / 2;
  const rr = cx * cx + cy * cy - f;
  if (!(rr > 0)) return undefined;
  return { cx: cx * scale, cy: cy * scale, radius: Math.sqrt(rr) * scale };
}

function solve3(m: number[][], r: number[]): number[] | undefined {
  const a = m.map((row, i) => [...row, r[i]]);
  for (let c = 0; c < 3; c++) {
    let p = c;
    for (let i = c + 1; i < 3; i++) if (Math.abs(a[i][c]) > Math.abs(a[p][c])) p = i;
    if (!(Math.abs(a[p][c]) > 1e-300)) return undefined;
    [a[c], a[p]] = [a[p], a[c]];
    for (let i = 0; i < 3; i++) {
      if (i === c) continue;
      const k = a[i][c] / a[c][c];
      for (let j = c; j < 4; j++) a[i][j] -= k * a[c][j];
    }
  }
  return [a[0][3] / a[0][0], a[1][3] / a[1][1], a[2][3] / a[2][2]];
}

/** Where y crosses zero going up (linear between the two points around it), in units of x. */
function zeroCrossing(x: number[], y: number[]): number | undefined {
  for (let i = 1; i < x.length; i++) {
    if (y[i - 1] <= 0 && y[i] > 0) return x[i - 1] + ((x[i] - x[i - 1]) * -y[i - 1]) / (y[i] - y[i - 1]);
  }
  return undefined;
}

function regressionSlope(x: number[], y: number[]): number {
  const n = x.length;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
  }
  return sxx > 0 ? sxy / sxx : 0;
}
