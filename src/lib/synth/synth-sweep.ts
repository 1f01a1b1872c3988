/**
 * Synthetic sweeps from a known BVD model, as an instrument would record them.
 *
 * Chain (each stage noiseless, noise added last to the recorded quantity):
 *   part Z(f) from the model (IEEE Std 177 BVD model, including the model's own rs/ls/cp)
 *   → added capacitor: parallel Z' = 1/(1/Z + jωCa) or series Z' = Z + 1/(jωCa)
 *   → fixture parasitics: Zm = Zs + 1/(1/Z' + jωCp), Zs = Rs + jωLs (series parts
 *     toward the instrument, stray admittance across the device; open/short compensation removes them)
 *   → fixture: S-parameters (conversions derived from the circuit) or Z directly
 *   → seeded complex Gaussian noise on each recorded entry, as a receiver adds it: a floor
 *     independent of the signal (`floorDb`) plus a trace term proportional to it (`traceNoise`);
 *     or the older relative-only form x + |x|·σ·(g1 + j·g2), σ = 10^(dB/20)/√2 (`noiseDb`).
 *
 * Everything generated here is synthetic; the file writer labels it so.
 */
import { impedanceAt, type BvdModel } from '../models/bvd.ts';
import { cAdd, cInv, type Complex } from '../sweep/complex.ts';
import type { ImpedanceSweep, NetworkData } from '../sweep/sweep.ts';
import type { Fixture } from '../schema/part.ts';
import { makeFreqGrid, quantizeGrid, type FreqGridSpec } from './freq-grid.ts';
import { impedanceFromS, sParametersOf, type SMatrix } from './fixture-network.ts';
import { createRng } from './rng.ts';

/** Fixture residuals between the instrument's reference plane and the part. */
export interface FixtureParasitics {
  /** Series resistance toward the instrument, Ω. */
  rsOhm?: number;
  /** Series inductance toward the instrument, H. */
  lsH?: number;
  /** Stray capacitance across the part, F. */
  cpF?: number;
}

/** A known capacitor added during a sweep (load-capacitance shift). */
export interface AddedCapacitor {
  capacitanceF: number;
  /** Across the part, or in series with it. */
  connection: 'parallel' | 'series';
}

/** What to synthesise. */
export interface SynthSweepSpec {
  /** The true part. */
  model: BvdModel;
  grid: FreqGridSpec;
  fixture: Fixture;
  /** Ports of the record: reflection 1 (default) or 2; thru fixtures always 2; impedance 1. */
  ports?: 1 | 2;
  /** Impedance fixture only: record Z (default) or Y as a 1-port network. */
  parameter?: 'Z' | 'Y';
  /** Reference impedance, Ω; default 50. */
  z0Ohm?: number;
  parasitics?: FixtureParasitics;
  added?: AddedCapacitor;
  /**
   * Relative-only noise level, dB (e.g. −70): x + |x|·σ·g on every recorded value. Kept for the
   * tests that document it; a real receiver is better described by `floorDb` + `traceNoise`.
   */
  noiseDb?: number;
  /**
   * Instrument noise floor, dB below the source: an additive complex Gaussian independent of
   * the signal, E|n|² = 10^(dB/10) in units of the recorded quantity (S: the source's 1; an
   * impedance analyser's Z: the range resistance `z0Ohm`; its Y: 1/z0Ohm). Typical −60 … −100 dB.
   */
  floorDb?: number;
  /** Trace noise proportional to the signal, RMS relative (e.g. 1e-4): E|n|² = (trace·|x|)². */
  traceNoise?: number;
  /** Noise seed; default 1. */
  seed?: number;
  /** Name for messages and the records' `source`; default "synthetic". */
  source?: string;
  /**
   * Frequency resolution of the simulated source, Hz: grid frequencies are rounded to
   * multiples of it (a power of ten, e.g. 0.001) before the model is evaluated, so a file
   * written with short frequency numbers holds exactly the frequencies the data belong to.
   */
  freqResolutionHz?: number;
}

/** A synthesised sweep. */
export interface SynthSweepResult {
  /** As recorded (noisy): S for S fixtures, a 1-port Z (or Y) for the impedance fixture. */
  network: NetworkData;
  /** Impedance at the instrument's reference plane implied by `network` (noisy). */
  measured: ImpedanceSweep;
  /** Noiseless impedance at the instrument's reference plane: what the instrument saw. */
  impedance: ImpedanceSweep;
  /** Noiseless impedance of the part alone (no added capacitor, no fixture). */
  part: ImpedanceSweep;
  seed: number;
  noiseDb?: number;
}

/**
 * Synthesise one sweep of a known model.
 * @throws Error on an impossible request (bad grid, 1-port thru fixture, non-finite values)
 */
export function synthesizeSweep(spec: SynthSweepSpec): SynthSweepResult {
  const freqHz = quantizeGrid(makeFreqGrid(spec.grid), spec.freqResolutionHz);
  const source = spec.source ?? 'synthetic';
  const n = freqHz.length;
  const part = emptySweep(freqHz, source);
  const seen = emptySweep(freqHz, source);
  const instrumentZ: Complex[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const f = freqHz[i];
    const [r, x] = impedanceAt(spec.model, f);
    part.zRe[i] = r;
    part.zIm[i] = x;
    const z = atInstrument(withAdded({ re: r, im: x }, f, spec.added), f, spec.parasitics);
    if (z === null) throw new Error(`infinite impedance at ${f} Hz: a part cannot be an open circuit`);
    seen.zRe[i] = z.re;
    seen.zIm[i] = z.im;
    instrumentZ[i] = z;
  }
  const rec = recordImpedances(freqHz, instrumentZ, spec);
  return { ...rec, impedance: seen, part };
}

/** Options shared by everything that records impedances as a network. */
export type RecordOptions = Pick<
  SynthSweepSpec,
  'fixture' | 'ports' | 'parameter' | 'z0Ohm' | 'noiseDb' | 'floorDb' | 'traceNoise' | 'seed' | 'source'
>;

/**
 * Record impedances at the instrument plane as a network, with seeded noise.
 * @param instrumentZ impedance per frequency, ohm; `null` = open circuit
 */
export function recordImpedances(
  freqHz: Float64Array,
  instrumentZ: Array<Complex | null>,
  opts: RecordOptions,
): { network: NetworkData; measured: ImpedanceSweep; seed: number; noiseDb?: number } {
  const z0Ohm = opts.z0Ohm ?? 50;
  const seed = opts.seed ?? 1;
  const source = opts.source ?? 'synthetic';
  const rng = createRng(seed);
  const sigma = opts.noiseDb === undefined ? 0 : 10 ** (opts.noiseDb / 20) / Math.SQRT2;
  const fixture = opts.fixture;
  const parameter = fixture === 'impedance' ? (opts.parameter ?? 'Z') : 'S';
  const floorUnit = parameter === 'Z' ? z0Ohm : parameter === 'Y' ? 1 / z0Ohm : 1;
  const floor = opts.floorDb === undefined ? 0 : (10 ** (opts.floorDb / 20) * floorUnit) / Math.SQRT2;
  const trace = (opts.traceNoise ?? 0) / Math.SQRT2;
  if (!(floor >= 0 && Number.isFinite(floor)) || !(trace >= 0 && Number.isFinite(trace))) {
    throw new Error(
      `noise floor ${opts.floorDb} dB and trace noise ${opts.traceNoise}: expected finite values, trace ≥ 0`,
    );
  }
  // Per component: the relative and trace terms scale with |x|, the floor does not.
  const noisy = (x: Complex): Complex => {
    const mag = Math.hypot(x.re, x.im);
    const spread = Math.sqrt((sigma * mag) ** 2 + floor * floor + (trace * mag) ** 2);
    if (spread === 0) return x;
    return { re: x.re + spread * rng.gaussian(), im: x.im + spread * rng.gaussian() };
  };
  const n = freqHz.length;
  const ports: 1 | 2 = fixture === 'impedance' ? 1 : fixture === 'reflection' ? (opts.ports ?? 1) : 2;
  if (fixture !== 'impedance' && fixture !== 'reflection' && opts.ports === 1) {
    throw new Error(`a ${fixture} fixture records 2 ports, got 1`);
  }
  const entries = ports * ports;
  const re = Array.from({ length: entries }, () => new Float64Array(n));
  const im = Array.from({ length: entries }, () => new Float64Array(n));
  const measured = emptySweep(freqHz, source);
  for (let i = 0; i < n; i++) {
    const z = instrumentZ[i];
    let m: SMatrix;
    let zm: Complex;
    if (fixture === 'impedance') {
      if (z === null)
        throw new Error(
          `an impedance record cannot hold an open circuit (at ${freqHz[i]} Hz); give the fixture a stray capacitance`,
        );
      const v = noisy(parameter === 'Z' ? z : cInv(z));
      m = [v];
      zm = parameter === 'Z' ? v : cInv(v);
    } else {
      // Noise is drawn in a fixed order (entry by entry) so a seed always gives the same file.
      m = sParametersOf(z, fixture, z0Ohm, ports).map(noisy);
      zm = impedanceFromS(m, fixture, z0Ohm);
    }
    for (let k = 0; k < entries; k++) {
      re[k][i] = m[k].re;
      im[k][i] = m[k].im;
    }
    measured.zRe[i] = zm.re;
    measured.zIm[i] = zm.im;
  }
  const network: NetworkData = {
    parameter,
    ports,
    z0Ohm: new Array(ports).fill(z0Ohm),
    freqHz: Float64Array.from(freqHz),
    re,
    im,
    source,
    format: 'synthetic',
    comments: [],
  };
  return { network, measured, seed, noiseDb: opts.noiseDb };
}

/** Device impedance with the added capacitor, ohm. */
export function withAdded(z: Complex, freqHz: number, added: AddedCapacitor | undefined): Complex {
  if (!added) return z;
  const wc = 2 * Math.PI * freqHz * added.capacitanceF;
  if (added.connection === 'series') return { re: z.re, im: z.im - 1 / wc };
  return cInv(cAdd(cInv(z), { re: 0, im: wc }));
}

/**
 * Impedance at the instrument plane: Zs + 1/(1/Z + jωCp), ohm (derived from the circuit).
 * @param z device impedance; `null` = open circuit (then only the strays remain)
 * @returns `null` when the result is an open circuit (open device, no stray capacitance)
 */
export function atInstrument(
  z: Complex | null,
  freqHz: number,
  parasitics: FixtureParasitics | undefined,
): Complex | null {
  const w = 2 * Math.PI * freqHz;
  const cp = parasitics?.cpF ?? 0;
  const zs: Complex = { re: parasitics?.rsOhm ?? 0, im: w * (parasitics?.lsH ?? 0) };
  let inner: Complex | null;
  if (z === null) inner = cp > 0 ? { re: 0, im: -1 / (w * cp) } : null;
  else if (z.re === 0 && z.im === 0)
    inner = z; // a short shunts the stray capacitance
  else inner = cp > 0 ? cInv(cAdd(cInv(z), { re: 0, im: w * cp })) : z;
  if (inner === null) return null;
  return cAdd(zs, inner);
}

function emptySweep(freqHz: Float64Array, source: string): ImpedanceSweep {
  return {
    freqHz: Float64Array.from(freqHz),
    zRe: new Float64Array(freqHz.length),
    zIm: new Float64Array(freqHz.length),
    source,
  };
}
