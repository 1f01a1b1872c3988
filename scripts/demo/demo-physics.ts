/**
 * Small physics and sweep-planning helpers for the demo catalogue (BVD model of IEEE Std 177,
 * load resonance, sweep planning, AT-cut temperature cubic).
 * Exported so the demo recovery test evaluates the documented values the same way.
 */
import { motionalReactance, type BvdModel, type MotionalBranch } from '../../src/lib/models/bvd.ts';
import type { FreqGridSpec } from '../../src/lib/synth/freq-grid.ts';

/** Half-power bandwidth fs/Q = 2π·fs²·R1·C1, Hz (derived from the BVD model). */
export function bandwidthHz(b: MotionalBranch): number {
  return 2 * Math.PI * b.fsHz * b.fsHz * b.r1Ohm * b.c1F;
}

/** Lossless load frequency fL = fs·√(1 + C1/(C0 + CL)), Hz (IEC 60444-11 term fL; form derived from the BVD model). */
export function loadFrequencyHz(b: MotionalBranch, c0F: number, clF: number): number {
  return b.fsHz * Math.sqrt(1 + b.c1F / (c0F + clF));
}

/**
 * The fs that puts a part `offsetPpm` from its nominal frequency at the datasheet load
 * (or at series resonance when `clF` is 'series').
 */
export function fsForNominal(
  nominalHz: number,
  offsetPpm: number,
  c1F: number,
  c0F: number,
  clF: number | 'series',
): number {
  const target = nominalHz * (1 + offsetPpm * 1e-6);
  return clF === 'series' ? target : target / Math.sqrt(1 + c1F / (c0F + clF));
}

/**
 * Lossless anti-resonance just above branch k's fs, Hz: the zero of the susceptance
 * B(f) = ωC0 − Σj 1/Xj(f) with every resistance set to zero (the `fpHz` of `extract --json`;
 * for one branch fs·√(1 + C1/C0), IEEE Std 177's fp). B rises between its poles (the branch fs
 * values), so bisection between fs_k and the next pole finds it.
 */
export function antiResonanceHz(model: BvdModel, k: number): number {
  const fk = model.branches[k].fsHz;
  const c0F = model.c0F + (model.cpF ?? 0);
  const b = (f: number) => {
    let s = 2 * Math.PI * f * c0F;
    for (const br of model.branches) s -= 1 / motionalReactance(br, f);
    return s;
  };
  const above = model.branches.map((br) => br.fsHz).filter((f) => f > fk);
  let lo = fk * (1 + 1e-13);
  let hi: number;
  if (above.length) hi = Math.min(...above) * (1 - 1e-13);
  else {
    let width = fk * (Math.sqrt(1 + model.branches[k].c1F / c0F) - 1);
    while (b(fk + width) < 0) width *= 2;
    hi = fk + width;
  }
  for (let i = 0; i < 200 && hi - lo > 1e-9 * Math.abs(lo) * 1e-6; i++) {
    const mid = (lo + hi) / 2;
    if (b(mid) < 0) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

const NICE = [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10];

/** Smallest "nice" number (1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8 × 10^k) not below x. */
export function niceCeil(x: number): number {
  const e = 10 ** Math.floor(Math.log10(x));
  return NICE.find((m) => m * e >= x * (1 - 1e-12))! * e;
}

/** Round to a "round" number a user would type as the centre, with a step of about span/40. */
export function roundCenter(f: number, spanHz: number): number {
  const step = 10 ** Math.floor(Math.log10(spanHz / 40));
  return Math.round(f / step) * step;
}

/** Instrument point counts a user picks. */
const POINT_CHOICES = [201, 401, 801, 1601, 3201];

/**
 * A narrow sweep around a resonance as a practitioner sets it up (common practice, not from a
 * standard): span at least
 * ±halfWidthBw bandwidths rounded up to a nice number, centre rounded, and the smallest usual
 * point count giving at least `perBw` points per bandwidth.
 */
export function narrowGrid(
  centerHz: number,
  bwHz: number,
  opts: { halfWidthBw?: number; perBw?: number } = {},
): FreqGridSpec {
  const spanHz = niceCeil(2 * (opts.halfWidthBw ?? 6) * bwHz);
  const perBw = opts.perBw ?? 16;
  const points =
    POINT_CHOICES.find((p) => ((p - 1) * bwHz) / spanHz >= perBw) ?? POINT_CHOICES[POINT_CHOICES.length - 1];
  return { kind: 'centered', centerHz: roundCenter(centerHz, spanHz), spanHz, points };
}

/**
 * A sweep from `startHz` to `stopHz` (ends rounded outward to a nice step) with the smallest
 * usual point count giving at least `perBw` points per bandwidth.
 */
export function spanGrid(startHz: number, stopHz: number, bwHz: number, perBw = 16): FreqGridSpec {
  const step = 10 ** Math.floor(Math.log10((stopHz - startHz) / 20));
  const lo = Math.floor(startHz / step) * step;
  const hi = Math.ceil(stopHz / step) * step;
  const points =
    POINT_CHOICES.find((p) => ((p - 1) * bwHz) / (hi - lo) >= perBw) ?? POINT_CHOICES[POINT_CHOICES.length - 1];
  return { kind: 'linear', startHz: lo, stopHz: hi, points };
}

/**
 * A wide sweep for C0 and the anti-resonance: from `below`·(fp − fs) under fs to `above`·(fp − fs)
 * over fp, ends rounded outward to nice steps.
 */
export function wideGrid(
  model: BvdModel,
  k = 0,
  opts: { below?: number; above?: number; points?: number } = {},
): FreqGridSpec {
  const fs = model.branches[k].fsHz;
  const fp = antiResonanceHz(model, k);
  const gap = fp - fs;
  const step = 10 ** Math.floor(Math.log10(gap / 4));
  return {
    kind: 'linear',
    startHz: Math.floor((fs - (opts.below ?? 1) * gap) / step) * step,
    stopHz: Math.ceil((fp + (opts.above ?? 1) * gap) / step) * step,
    points: opts.points ?? 2001,
  };
}

/**
 * AT-cut frequency offset Δf/f = a1·t + a2·t² + a3·t³, t = T − 25 °C (Gerber & Ballato (eds.),
 * Precision Frequency Control, Academic Press 1985, as quoted in M. Haney's 2001 thesis).
 */
export function atCutOffset(tempC: number, a: readonly [number, number, number]): number {
  const t = tempC - 25;
  return a[0] * t + a[1] * t * t + a[2] * t * t * t;
}
