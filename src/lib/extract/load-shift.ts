/**
 * Load-capacitance shift method (IEC 60444-11 terms fL, CLeff; forms derived from the BVD model).
 *
 * Lossless, a capacitor CL in series with the part (load resonance) or across it (load
 * anti-resonance) moves the zero-phase frequency to fL = fs·√(1 + C1/(C0 + CL)) — the same fL
 * either way (derived from the BVD model; fL and CLeff per IEC 60444-11). With u = (fL/fs)² − 1:
 *   one load, C0 known:   C1 = u·(C0 + CL)
 *   two or more loads:    1/u = C0/C1 + CL/C1, a line in CL (slope 1/C1, intercept C0/C1),
 *                         so C1 and C0 come without an independent C0
 *   three or more loads:  fL² = fs² + fs²C1/(C0 + CL) also gives fs.
 * With R1 the measured zero phase differs slightly from the lossless fL. Exactly, for one
 * branch at the measured ω the motional reactance is
 *   across (parallel): X = (1 + √(1 − 4ct²R1²))/(2ct), ct = ω(C0 + CL)   (upper zero phase)
 *   in series:         c0(c0 + cl)X² − (cl + 2c0)X + 1 + c0(c0 + cl)R1² = 0, lower root,
 *                      c0 = ωC0, cl = ωCL                                    (lower zero phase)
 * (derived from Im Y = 0, resp. Im Z_part = 1/(ωCL)); both give X = 1/(ω(C0 + CL)) for R1 = 0.
 * Writing κ = ω(C0 + CL)·X (1 when lossless), u = κ·C1/(C0 + CL) and κ/u is the exact line.
 */
import type { AddedConnection } from './part-alone.ts';
import { linearLeastSquares } from './small-linalg.ts';

/** One sweep with a known added capacitor and its measured load frequency. */
export interface LoadPoint {
  /** Added capacitance, F. */
  clF: number;
  connection: AddedConnection;
  /** Measured zero-phase frequency with the capacitor (upper for parallel, lower for series), Hz. */
  fLHz: number;
  /** Source sweep, for notes. */
  source?: string;
}

/** Lossless load frequency fs·√(1 + C1/(C0 + CL)), Hz. */
export function loadFrequency(fsHz: number, c1F: number, c0F: number, clF: number): number {
  return fsHz * Math.sqrt(1 + c1F / (c0F + clF));
}

/**
 * κ = ω(C0 + CL)·X at the zero phase, for R1, C0, CL at the measured frequency (1 when R1 = 0).
 * Undefined when the loaded part has no zero phase at that resistance.
 */
export function lossFactor(
  fLHz: number,
  r1Ohm: number,
  c0F: number,
  clF: number,
  connection: AddedConnection,
): number | undefined {
  if (!(r1Ohm > 0)) return 1;
  const w = 2 * Math.PI * fLHz;
  const ct = w * (c0F + clF);
  let x: number;
  if (connection === 'parallel') {
    const disc = 1 - 4 * ct * ct * r1Ohm * r1Ohm;
    if (!(disc >= 0)) return undefined;
    x = (1 + Math.sqrt(disc)) / (2 * ct);
  } else {
    const c0 = w * c0F;
    const cl = w * clF;
    const a = c0 * (c0 + cl);
    const bq = cl + 2 * c0;
    const c = 1 + a * r1Ohm * r1Ohm;
    const disc = bq * bq - 4 * a * c;
    if (!(disc >= 0)) return undefined;
    x = (2 * c) / (bq + Math.sqrt(disc)); // lower root, cancellation-free
  }
  return ct * x;
}

/** u = (fL/fs)² − 1 without cancellation. */
function uOf(fsHz: number, fLHz: number): number {
  return ((fLHz - fsHz) * (fLHz + fsHz)) / (fsHz * fsHz);
}

/** One load, C0 known: C1 = u·(C0 + CL)/κ, F (exact for one branch). */
export function c1FromLoadShift(p: { fsHz: number; load: LoadPoint; c0F: number; r1Ohm?: number }): number | undefined {
  const kappa = lossFactor(p.load.fLHz, p.r1Ohm ?? 0, p.c0F, p.load.clF, p.load.connection);
  if (kappa === undefined) return undefined;
  const u = uOf(p.fsHz, p.load.fLHz);
  if (!(u > 0)) return undefined;
  return (u * (p.c0F + p.load.clF)) / kappa;
}

/** C1 and C0 from two or more loads (one may be CL = 0, the part's own anti-resonance), fs known. */
export interface TwoLoadResult {
  c1F: number;
  c0F: number;
  /** Standard uncertainties from the line's residuals (present with three or more loads). */
  uncertainty?: { c1F: number; c0F: number };
}

/**
 * Exact multi-load solution with fs known: fits κ/u = C0/C1 + CL/C1 (weighted so that each
 * load counts by its relative precision), iterating κ from R1 and the current C0.
 */
export function solveTwoLoad(fsHz: number, loads: LoadPoint[], r1Ohm = 0): TwoLoadResult | undefined {
  if (loads.length < 2) return undefined;
  const cls = loads.map((l) => l.clF);
  if (Math.max(...cls) - Math.min(...cls) <= 0) return undefined;
  const us = loads.map((l) => uOf(fsHz, l.fLHz));
  if (!us.every((u) => u > 0)) return undefined;
  let kappas = loads.map(() => 1);
  let out: TwoLoadResult | undefined;
  for (let iter = 0; iter < 6; iter++) {
    const rows = loads.map((l) => [1, l.clF]);
    const y = us.map((u, i) => kappas[i] / u);
    const ls = linearLeastSquares(rows, y);
    if (!ls) return undefined;
    const [a, b] = ls.beta; // a = C0/C1, b = 1/C1
    const c1F = 1 / b;
    const c0F = a * c1F;
    if (!(c1F > 0) || !(c0F > 0)) return undefined;
    out = { c1F, c0F };
    if (ls.dof > 0) {
      const cov = ls.covariance;
      out.uncertainty = {
        c1F: c1F * c1F * Math.sqrt(Math.max(0, cov[1][1])),
        c0F: Math.sqrt(
          Math.max(0, c1F * c1F * cov[0][0] + (a * c1F * c1F) ** 2 * cov[1][1] - 2 * a * c1F ** 3 * cov[0][1]),
        ),
      };
    }
    if (!(r1Ohm > 0)) break;
    const next = loads.map((l) => lossFactor(l.fLHz, r1Ohm, c0F, l.clF, l.connection));
    if (next.some((k) => k === undefined)) break;
    kappas = next as number[];
  }
  return out;
}

/** fs, C1, C0 from three or more loads (no independent fs or C0). */
export interface ThreeLoadResult {
  fsHz: number;
  c1F: number;
  c0F: number;
}

/**
 * Three or more loads: fL² = fs² + fs²·C1·κ/(C0 + CL). For a trial C0 the model is linear in
 * (fs², fs²C1); C0 minimises the relative residual (golden-section search on ln C0 around the
 * exact three-point solution), then κ is refreshed from R1 and the loop repeats.
 */
export function solveThreeLoad(loads: LoadPoint[], r1Ohm = 0): ThreeLoadResult | undefined {
  if (loads.length < 3) return undefined;
  const sorted = [...loads].sort((p, q) => p.clF - q.clF);
  if (sorted[0].clF === sorted[sorted.length - 1].clF) return undefined;
  const f2 = sorted.map((l) => l.fLHz * l.fLHz);
  const ref = f2[f2.length - 1];
  const g = f2.map((v) => v / ref - 1); // relative, keeps the differences exact-ish
  let kappas = sorted.map(() => 1);

  const fitFor = (c0: number) => {
    const rows = sorted.map((l, i) => [1, kappas[i] / (c0 + l.clF)]);
    const ls = linearLeastSquares(rows, g);
    return ls;
  };
  const sse = (c0: number) => {
    const ls = fitFor(c0);
    if (!ls) return Infinity;
    return ls.rms;
  };
  let result: ThreeLoadResult | undefined;
  for (let iter = 0; iter < 4; iter++) {
    // Exact three-point C0 from the lowest, a middle and the highest load as the search centre.
    const i1 = 0;
    const i2 = sorted.length >> 1;
    const i3 = sorted.length - 1;
    const [c1, c2, c3] = [sorted[i1].clF, sorted[i2].clF, sorted[i3].clF];
    const rho = (g[i1] / kappas[i1] - g[i2] / kappas[i2]) / (g[i2] / kappas[i2] - g[i3] / kappas[i3]);
    let c0 = ((c2 - c1) * c3 - rho * (c3 - c2) * c1) / (rho * (c3 - c2) - (c2 - c1));
    if (!(c0 > 0)) c0 = 0.1 * (c3 - c1) + 1e-15;
    if (sorted.length > 3 || iter > 0) {
      let lo = Math.log(c0 / 4);
      let hi = Math.log(c0 * 4);
      const phi = (Math.sqrt(5) - 1) / 2;
      let x1 = hi - phi * (hi - lo);
      let x2 = lo + phi * (hi - lo);
      let s1 = sse(Math.exp(x1));
      let s2 = sse(Math.exp(x2));
      for (let k = 0; k < 120 && hi - lo > 1e-13; k++) {
        if (s1 < s2) {
          hi = x2;
          x2 = x1;
          s2 = s1;
          x1 = hi - phi * (hi - lo);
          s1 = sse(Math.exp(x1));
        } else {
          lo = x1;
          x1 = x2;
          s1 = s2;
          x2 = lo + phi * (hi - lo);
          s2 = sse(Math.exp(x2));
        }
      }
      c0 = Math.exp(0.5 * (lo + hi));
    }
    const ls = fitFor(c0);
    if (!ls) return undefined;
    const [a, b] = ls.beta; // g = a + b·κ/(C0+CL) with g = fL²/ref − 1
    const fs2 = ref * (1 + a);
    const fsHz = Math.sqrt(fs2);
    const c1F = (b * ref) / fs2;
    if (!(fsHz > 0) || !(c1F > 0) || !(c0 > 0)) return undefined;
    result = { fsHz, c1F, c0F: c0 };
    if (!(r1Ohm > 0)) break;
    const next = sorted.map((l) => lossFactor(l.fLHz, r1Ohm, c0, l.clF, l.connection));
    if (next.some((k) => k === undefined)) break;
    kappas = next as number[];
  }
  return result;
}
