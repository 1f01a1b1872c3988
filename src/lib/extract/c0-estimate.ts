/**
 * C0 from the capacitive region, away from every resonance.
 *
 * Lossless, Ceff(f) = Im Y/ω = C0 + Σk Ck/(1 − (f/fk)²) (derived from the BVD model; IEC 60444-5
 * has a dedicated C0 clause). A plain low-frequency reading gives C0 + ΣCk, and readings near
 * a mode are biased, so the mode terms are kept: each Ck is fitted when the kept points lie
 * on both sides of its mode (the terms are then well separated from the constant), else it is
 * held at the given estimate. Points closer to a mode than `exclusion`/Q (relative) are dropped:
 * there |X| < 2·exclusion·R1. Beyond, the mode term is corrected for R1 when it is known
 * (Im Yk/ω = Ck/(1 − (f/fk)²)·X²/(X² + R1²), exact for the branch), and the weights follow the
 * noise, which grows with |Y| toward the resonance, so C0 rests on the capacitive points.
 * Input sweeps are of the part alone (added capacitors already removed, see part-alone.ts);
 * a remaining fixture stray capacitance cannot be told from C0 here (C0 and a parallel stray are
 * inseparable in one sweep).
 */
import { invertSmall } from './small-linalg.ts';

/** A mode as known before C0: frequency, quality, and (if known) motional capacitance. */
export interface C0ModeHint {
  fsHz: number;
  q: number;
  /** Motional capacitance estimate, F; used when the data cannot fit it. */
  c1F?: number;
  /** Motional resistance estimate, Ω; with c1F it corrects the mode term for loss. */
  r1Ohm?: number;
}

/** One sweep's admittance data (part alone). */
export interface C0SweepInput {
  freqHz: ArrayLike<number>;
  gS: ArrayLike<number>;
  bS: ArrayLike<number>;
  source: string;
  /** Frequencies at and above this are not used (untrusted instrument range), Hz. */
  maxTrustedHz?: number;
}

/** Result of {@link estimateC0}; values finite when `ok`. */
export interface C0Estimate {
  ok: boolean;
  reason: string;
  c0F: number;
  /** Standard uncertainty, F. */
  uncertaintyF: number;
  /** Points used. */
  points: number;
  /** Motional capacitance per mode hint as used (fitted or held), F. */
  branchCF: number[];
  /** Which branch capacitances were fitted rather than held. */
  fitted: boolean[];
  sweeps: string[];
  /** When not `ok` because the fit gave C0 ≤ 0: that value, F (e.g. an added capacitor larger than the shunt capacitance). */
  nonPhysicalC0F?: number;
}

/** Options of {@link estimateC0}. */
export interface C0EstimateOptions {
  /** Keep points with |f/fk − 1| ≥ exclusion/Qk for every mode (|X| ≥ 2·exclusion·R1). Default 10. */
  exclusion?: number;
  /** Minimum number of usable points. Default 5. */
  minPoints?: number;
}

/** Estimate C0 from the capacitive region of the given sweeps. */
export function estimateC0(sweeps: C0SweepInput[], modes: C0ModeHint[], options: C0EstimateOptions = {}): C0Estimate {
  const exclusion = options.exclusion ?? 10;
  const minPoints = options.minPoints ?? 5;
  const fail = (reason: string, points = 0): C0Estimate => ({
    ok: false,
    reason,
    c0F: 0,
    uncertaintyF: 0,
    points,
    branchCF: [],
    fitted: [],
    sweeps: [],
  });
  let total = 0;
  for (const s of sweeps) total += s.freqHz.length;
  const fsAll = new Float64Array(total);
  const ceffAll = new Float64Array(total);
  const yAll = new Float64Array(total);
  const excl = modes.map((m) => exclusion / Math.max(m.q, 1));
  const used = new Set<string>();
  let count = 0;
  for (const s of sweeps) {
    const maxF = s.maxTrustedHz ?? Infinity;
    for (let i = 0; i < s.freqHz.length; i++) {
      const f = s.freqHz[i];
      if (f >= maxF) continue;
      let near = false;
      for (let k = 0; k < modes.length; k++)
        if (Math.abs(f / modes[k].fsHz - 1) < excl[k]) {
          near = true;
          break;
        }
      if (near) continue;
      const w = 2 * Math.PI * f;
      const c = s.bS[i] / w;
      if (!Number.isFinite(c)) continue;
      fsAll[count] = f;
      ceffAll[count] = c;
      yAll[count] = Math.hypot(s.gS[i], s.bS[i]) / w;
      count++;
      used.add(s.source);
    }
  }
  const fs = fsAll.subarray(0, count);
  const ceff = ceffAll.subarray(0, count);
  const yOverW = yAll.subarray(0, count);
  if (fs.length < minPoints)
    return fail(
      `only ${fs.length} points lie away from the resonances (need ${minPoints}); sweep a wider span for C0`,
      fs.length,
    );

  // Fit Ck only when kept points lie on both sides of fk, with some above-lossless leverage.
  const fitted = modes.map((m) => {
    let below = 0;
    let above = 0;
    for (let i = 0; i < count; i++) {
      if (fs[i] < m.fsHz) below++;
      else above++;
    }
    return (below >= 2 && above >= 2) || m.c1F === undefined;
  });
  // Lossy branch: Im Yk/ω = Ck/(1 − (f/fk)²)·X²/(X² + R²); the factor is ≈ 1 away from fk.
  const term = (f: number, m: C0ModeHint) => {
    const lossless = 1 / (1 - (f / m.fsHz) ** 2);
    if (!(m.r1Ohm! > 0) || !(m.c1F! > 0)) return lossless;
    const x = -1 / (2 * Math.PI * f * m.c1F! * lossless);
    return (lossless * x * x) / (x * x + m.r1Ohm! * m.r1Ohm!);
  };
  // Noise on Ceff is proportional to |Y|/ω; cap the weight where |Y| → 0 (anti-resonance).
  let scale = 0;
  for (let i = 0; i < count; i++) scale += Math.abs(ceff[i]);
  scale /= count;
  // Normal equations accumulated directly (thousands of points, a handful of unknowns).
  const fitIdx = modes.map((_, k) => k).filter((k) => fitted[k]);
  const p = 1 + fitIdx.length;
  const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const aty = new Array<number>(p).fill(0);
  const row = new Array<number>(p).fill(0);
  const yv = new Float64Array(fs.length);
  const wv = new Float64Array(fs.length);
  const rowsFlat = new Float64Array(fs.length * p);
  for (let i = 0; i < fs.length; i++) {
    row[0] = 1;
    let held = 0;
    let c = 1;
    for (let k = 0; k < modes.length; k++) {
      const t = term(fs[i], modes[k]);
      if (fitted[k]) row[c++] = t;
      else held += (modes[k].c1F ?? 0) * t;
    }
    const y = ceff[i] - held;
    const w = 1 / (yOverW[i] + 0.1 * scale) ** 2;
    yv[i] = y;
    wv[i] = w;
    for (let a = 0; a < p; a++) {
      rowsFlat[i * p + a] = row[a];
      aty[a] += w * row[a] * y;
      for (let b = a; b < p; b++) ata[a][b] += w * row[a] * row[b];
    }
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) ata[a][b] = ata[b][a];
  const inv = invertSmall(ata);
  if (!inv) return fail('capacitive-region fit is singular (mode terms cannot be separated from C0)', fs.length);
  const beta = inv.map((r) => r.reduce((s, v, j) => s + v * aty[j], 0));
  let ss = 0;
  for (let i = 0; i < fs.length; i++) {
    let fit = 0;
    for (let a = 0; a < p; a++) fit += rowsFlat[i * p + a] * beta[a];
    ss += wv[i] * (yv[i] - fit) ** 2;
  }
  const dof = fs.length - p;
  const s2 = dof > 0 ? ss / dof : 1;
  const ls = { beta, covariance: inv.map((r) => r.map((v) => v * s2)) };
  const c0F = ls.beta[0];
  let col = 1;
  const branchCF = modes.map((m, k) => (fitted[k] ? ls.beta[col++] : (m.c1F ?? 0)));
  let u = Math.sqrt(Math.max(0, ls.covariance[0][0]));
  // Held capacitances carry their own uncertainty (taken as 1 % of Ck, common practice),
  // which moves C0 by the mean of the term.
  modes.forEach((m, k) => {
    if (fitted[k] || m.c1F === undefined) return;
    let mean = 0;
    for (let i = 0; i < count; i++) mean += term(fs[i], m);
    mean /= count;
    u = Math.hypot(u, 0.01 * m.c1F * mean);
  });
  if (!(c0F > 0) || !Number.isFinite(u)) {
    const failed = fail(`capacitive-region fit gave a non-physical C0 (${c0F})`, fs.length);
    return Number.isFinite(c0F) ? { ...failed, nonPhysicalC0F: c0F } : failed;
  }
  return { ok: true, reason: 'ok', c0F, uncertaintyF: u, points: fs.length, branchCF, fitted, sweeps: [...used] };
}
