import { describe, expect, it } from 'vitest';
import {
  classifyModes,
  spuriousAttenuationDb,
  type ClassifyModesOptions,
  type Observation,
} from '../../../src/lib/extract/classify-modes.ts';
import { findResonances } from '../../../src/lib/extract/find-resonances.ts';
import { partAlone } from '../../../src/lib/extract/part-alone.ts';
import type { BvdModel } from '../../../src/lib/models/bvd.ts';
import { linGrid, synthSweep } from './synthetic.ts';

const FS = 1e8 / (2 * Math.PI);

/** Observations of the model in the given sweeps (seeded −70 dB noise). */
function observe(model: BvdModel, grids: Float64Array[], loaded: Array<number | undefined> = []): Observation[] {
  return grids.flatMap((f, i) => {
    const s = partAlone(synthSweep(model, f, { noiseDb: -70, seed: i + 1, addedCF: loaded[i] }), loaded[i]);
    return findResonances(s).resonances.map((resonance) => ({
      sweepIndex: i,
      source: `s${i}`,
      resonance,
      loaded: loaded[i] !== undefined,
    }));
  });
}

const AT: ClassifyModesOptions = { kind: 'quartz-at' };

describe('spuriousAttenuationDb', () => {
  it("reproduces the fixture attenuation values of a fixture's loop resistance", () => {
    // check values (mpmath): R1 = 20 Ω, Rspur = 150 Ω: 6.37518 dB with RT = 100 Ω, 11.7965 dB with RT = 25 Ω
    expect(spuriousAttenuationDb(150, 20, 100)).toBeCloseTo(6.37518, 5);
    expect(spuriousAttenuationDb(150, 20, 25)).toBeCloseTo(11.7965, 4);
    // and the resistance ratio itself in dB (RT = 0): 20·log10(7.5)
    expect(spuriousAttenuationDb(150, 20)).toBeCloseTo(17.5012, 4);
  });
});

describe('classifyModes', () => {
  it('merges the same mode seen in a narrow, a loaded and a wide sweep into one', () => {
    const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
    const obs = observe(
      X1,
      [linGrid(FS - 1600, FS + 1600, 801), linGrid(FS - 1600, FS + 1600, 401), linGrid(0.995 * FS, 1.005 * FS, 2001)],
      [undefined, 10e-12, undefined],
    );
    expect(obs).toHaveLength(3);
    const { modes } = classifyModes(obs, AT);
    expect(modes).toHaveLength(1);
    expect(modes[0].observations).toHaveLength(3);
    // best sighting: unloaded, most points per bandwidth
    expect(modes[0].best.source).toBe('s0');
  });

  it('names the weaker mode 100 kHz above X1 spurious, with its resistance ratio and dB', () => {
    // two-branch reference part: X1 plus L2 = 40 mH, R2 = 150 Ω, C2 = 2.468878 fF; strength 20·log10(R ratio)
    const two: BvdModel = {
      c0F: 3e-12,
      branches: [
        { fsHz: FS, r1Ohm: 20, c1F: 10e-15 },
        { fsHz: FS + 100e3, r1Ohm: 150, c1F: 2.468878e-15 },
      ],
    };
    const { modes } = classifyModes(observe(two, [linGrid(FS - 50e3, FS + 150e3, 8001)]), AT);
    expect(modes.map((m) => [m.overtone, m.spurious])).toEqual([
      [1, false],
      [1, true],
    ]);
    expect(modes[1].resistanceRatio).toBeCloseTo(7.5, 2);
    expect(modes[1].strengthDb).toBeCloseTo(17.5, 1);
    expect(modes[1].mainIndex).toBe(0);
  });

  it('gives a third-overtone part its fundamental as overtone 1 and its main mode as 3', () => {
    // 10 MHz plate (C1n ≈ C1/n², QCM review, Sensors 21(10):3490, 2021), n = 1 C1 20 fF, n = 3 C1 2.222222 fF;
    // f3/(3f1) ≈ 1.0028 (stiffening estimate, from memory)
    const f1 = 10e6;
    const f3 = 3.0084 * f1;
    const plate: BvdModel = {
      c0F: 4e-12,
      branches: [
        { fsHz: f1, r1Ohm: 10, c1F: 20e-15 },
        { fsHz: f3, r1Ohm: 40, c1F: 2.222222e-15 },
      ],
    };
    const grids = [linGrid(f1 - 2000, f1 + 2000, 801), linGrid(f3 - 8000, f3 + 8000, 801)];
    for (const hints of [{}, { datasheetFrequencyHz: 30.084e6, datasheetOvertone: 3 }]) {
      const { modes, diagnostics } = classifyModes(observe(plate, grids), { ...AT, ...hints });
      expect(modes.map((m) => [m.overtone, m.spurious])).toEqual([
        [1, false],
        [3, false],
      ]);
      expect(diagnostics).toEqual([]);
    }
    // Only the overtone swept: the datasheet says which order it is.
    const only3 = classifyModes(observe(plate, [grids[1]]), {
      ...AT,
      datasheetFrequencyHz: 30e6,
      datasheetOvertone: 3,
    });
    expect(only3.modes.map((m) => m.overtone)).toEqual([3]);
  });

  it('calls a strong mode far from any odd multiple of a tuning fork spurious', () => {
    // forks have no odd-overtone series; extra modes are unwanted (from memory)
    const fork: BvdModel = {
      c0F: 1.2e-12,
      branches: [
        { fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 },
        { fsHz: 6.3 * 32768, r1Ohm: 80e3, c1F: 0.2e-15 },
      ],
    };
    const grids = [linGrid(32_700, 32_850, 3001), linGrid(6.3 * 32768 - 300, 6.3 * 32768 + 300, 3001)];
    const { modes } = classifyModes(observe(fork, grids), { kind: 'quartz-tuning-fork', datasheetFrequencyHz: 32768 });
    expect(modes.map((m) => [m.overtone, m.spurious])).toEqual([
      [1, false],
      [1, true],
    ]);
  });

  it('warns when no main mode lies near the datasheet frequency', () => {
    const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };
    const { diagnostics } = classifyModes(observe(X1, [linGrid(FS - 1600, FS + 1600, 801)]), {
      ...AT,
      datasheetFrequencyHz: 20e6,
      datasheetOvertone: 1,
    });
    expect(diagnostics.map((d) => d.message)).toEqual([
      'no main mode found near the datasheet frequency 20.00000 MHz (overtone 1); check the sweep spans',
    ]);
  });
});
