import { describe, expect, it } from 'vitest';
import {
  screenModes,
  spuriousRejection,
  spuriousStrengthDb,
  MAX_SPURIOUS_DB,
  type ModeEstimate,
} from '../../../src/lib/extract/screen-modes.ts';
import type { ModeCandidate, Observation } from '../../../src/lib/extract/classify-modes.ts';
import { findResonances } from '../../../src/lib/extract/find-resonances.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { linGrid, synthSweep } from './synthetic.ts';

// Reference resonator X1 (invented; IEEE Std 177 model): fs = 10⁸/2π Hz, R1 20 Ω, bandwidth 318.31 Hz (fs/Q).
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
const SIGHTING: Observation = {
  sweepIndex: 0,
  source: 'n.s1p',
  loaded: false,
  resonance: findResonances(partAlone(synthSweep(X1, linGrid(FS - 1600, FS + 1600, 801)))).resonances[0],
};

/** A classified mode; only `spurious` and `mainIndex` matter to the screening. */
function candidate(fsHz: number, r1Ohm: number, spurious = false, mainIndex?: number): ModeCandidate {
  return {
    fsHz,
    r1Ohm,
    bandwidthHz: 318.31,
    observations: [SIGHTING],
    best: SIGHTING,
    overtone: 1,
    spurious,
    mainIndex,
  };
}

const fitted = (fsHz: number, r1Ohm: number, bandwidthHz = 318.31): ModeEstimate => ({
  fsHz,
  r1Ohm,
  bandwidthHz,
  fitted: true,
});

describe('spuriousStrengthDb', () => {
  it('is 20·log10 of the resistance ratio (150 Ω against 20 Ω is 17.5012 dB)', () => {
    expect(spuriousStrengthDb(150, 20)).toBeCloseTo(17.5012, 4);
    expect(spuriousStrengthDb(2000, 20)).toBeCloseTo(40, 10);
    expect(spuriousStrengthDb(NaN, 20)).toBe(Infinity);
  });
});

describe('spuriousRejection', () => {
  it('reports a fitted spurious mode down to 40 dB below its main mode and not beyond', () => {
    // the rule of screen-modes.ts: 20·log10(Rspur/Rmain) ≤ 40 dB (R ratio 100)
    expect(MAX_SPURIOUS_DB).toBe(40);
    expect(spuriousRejection(150, 20, true)).toBeUndefined();
    expect(spuriousRejection(2000, 20, true)).toBeUndefined();
    expect(spuriousRejection(3000, 20, true)).toBe(
      '43.5 dB below the main mode (r1 3.00e+3 Ω against 20.0 Ω; reported down to 40 dB)',
    );
  });

  it('needs a converged fit with a finite, positive R1', () => {
    expect(spuriousRejection(150, 20, false)).toBe('its least-squares fit did not converge');
    expect(spuriousRejection(-5, 20, true)).toBe('its fitted r1 -5 Ω is not a finite positive value');
    expect(spuriousRejection(Infinity, 20, true)).toBe('its fitted r1 Infinity Ω is not a finite positive value');
  });
});

describe('screenModes', () => {
  it('drops the weaker of two modes closer than half a bandwidth and keeps the stronger', () => {
    const modes = [candidate(FS, 20), candidate(FS + 50, 400, true, 0), candidate(FS + 100e3, 150, true, 0)];
    const r = screenModes(modes, [fitted(FS, 20), fitted(FS + 50, 400), fitted(FS + 100e3, 150, 1800)]);
    expect(r.duplicateOf).toEqual([-1, 0, -1]);
    expect(r.dropped[0]).toBeUndefined();
    expect(r.dropped[1]).toBe(`same resonance as the stronger mode near ${FS.toPrecision(10)} Hz`);
    expect(r.dropped[2]).toBeUndefined();
    expect(r.excluded).toEqual([false, true, false]);
  });

  it('keeps the stronger sighting even when it is the later one, and collapses chains onto it', () => {
    // a noise sighting refined next to a real mode is weaker; three sightings within half a bandwidth are one
    const modes = [candidate(FS - 60, 5e4, true, 1), candidate(FS, 20), candidate(FS + 60, 9e4, true, 1)];
    const r = screenModes(modes, [fitted(FS - 60, 5e4), fitted(FS, 20), fitted(FS + 60, 9e4)]);
    expect(r.duplicateOf).toEqual([1, -1, 1]);
    expect(r.dropped[1]).toBeUndefined();
  });

  it('does not merge modes a bandwidth apart', () => {
    const modes = [candidate(FS, 20), candidate(FS + 320, 25, true, 0)];
    const r = screenModes(modes, [fitted(FS, 20), fitted(FS + 320, 25)]);
    expect(r.duplicateOf).toEqual([-1, -1]);
  });

  it('drops a spurious mode more than 40 dB down but keeps it in the fitted model, and one without a fit from both', () => {
    const modes = [candidate(FS, 20), candidate(FS + 100e3, 3000, true, 0), candidate(FS + 60e3, 500, true, 0)];
    const r = screenModes(modes, [
      fitted(FS, 20),
      fitted(FS + 100e3, 3000),
      { fsHz: FS + 60e3, r1Ohm: 500, bandwidthHz: 400, fitted: false },
    ]);
    expect(r.dropped[1]).toMatch(/^43\.5 dB below the main mode/);
    expect(r.dropped[2]).toBe('its least-squares fit did not converge');
    expect(r.excluded).toEqual([false, false, true]);
  });

  it('never drops a main mode for want of a fit', () => {
    const modes = [candidate(FS, 20), candidate(3 * FS, 60)];
    const r = screenModes(modes, [{ fsHz: FS, r1Ohm: 20, bandwidthHz: 318.31, fitted: false }, undefined]);
    expect(r.dropped).toEqual([undefined, undefined]);
    expect(r.excluded).toEqual([false, false]);
  });
});
