/**
 * Synthetic open and short compensation sweeps of a fixture with frequency-independent
 * residuals (derived from the circuit): with the part removed the instrument sees Zom = Zs + 1/(jωCp)
 * (the strays, behind the series parts); with the part replaced by a short it sees Zsm = Zs
 * (the series parts only), Zs = Rs + jωLs. The exact open/short correction
 * Zdut = (Zm − Zsm)/(1 − (Zm − Zsm)/(Zom − Zsm)) then returns the part's impedance.
 */
import type { ImpedanceSweep } from '../sweep/sweep.ts';
import type { Complex } from '../sweep/complex.ts';
import { makeFreqGrid, quantizeGrid, type FreqGridSpec } from './freq-grid.ts';
import {
  atInstrument,
  recordImpedances,
  type FixtureParasitics,
  type RecordOptions,
  type SynthSweepResult,
  type SynthSweepSpec,
} from './synth-sweep.ts';

/** What to synthesise: the fixture, its residuals, the grid and the recording options. */
export interface SynthCompensationSpec extends RecordOptions {
  parasitics: FixtureParasitics;
  grid: FreqGridSpec;
  /** Frequency resolution, Hz (see {@link SynthSweepSpec.freqResolutionHz}). */
  freqResolutionHz?: number;
}

/** The two standards as recorded. `part` is absent: there is no part in the fixture. */
export interface SynthCompensationResult {
  open: Omit<SynthSweepResult, 'part'>;
  short: Omit<SynthSweepResult, 'part'>;
}

/**
 * Synthesise the open and short sweeps of a fixture. The short uses `seed + 1` so that its
 * noise is independent of the open's.
 * @throws Error when the open cannot be recorded (impedance record of a fixture without stray capacitance)
 */
export function synthesizeCompensation(spec: SynthCompensationSpec): SynthCompensationResult {
  const freqHz = quantizeGrid(makeFreqGrid(spec.grid), spec.freqResolutionHz);
  const seed = spec.seed ?? 1;
  const openZ = Array.from(freqHz, (f) => atInstrument(null, f, spec.parasitics));
  const shortZ = Array.from(freqHz, (f) => atInstrument({ re: 0, im: 0 }, f, spec.parasitics));
  const open = recordImpedances(freqHz, openZ, { ...spec, seed, source: `${spec.source ?? 'synthetic'}-open` });
  const short = recordImpedances(freqHz, shortZ, {
    ...spec,
    seed: seed + 1,
    source: `${spec.source ?? 'synthetic'}-short`,
  });
  return {
    open: { ...open, impedance: toSweep(freqHz, openZ, open.network.source) },
    short: { ...short, impedance: toSweep(freqHz, shortZ, short.network.source) },
  };
}

/** Impedances as a sweep; an open circuit becomes +∞ resistance. */
function toSweep(freqHz: Float64Array, z: Array<Complex | null>, source: string): ImpedanceSweep {
  return {
    freqHz: Float64Array.from(freqHz),
    zRe: Float64Array.from(z, (v) => (v === null ? Infinity : v.re)),
    zIm: Float64Array.from(z, (v) => (v === null ? 0 : v.im)),
    source,
  };
}
