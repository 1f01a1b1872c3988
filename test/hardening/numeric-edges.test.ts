/**
 * Numerical edge cases through the extraction (src/lib/extract/extract-part.ts, `extract --json`):
 * a sweep with no resonance, two modes closer than the sweep resolves, a resonance at the sweep
 * edge, data that would give a negative or zero parameter (a passive part cannot have negative
 * resistance; an added capacitor larger than the whole shunt capacitance), fits that cannot
 * converge (noise only, pure noise at resonance, three points), zero impedance and 0 Hz points.
 * Each gives a warning or error that says what to do, and never a published NaN, Infinity or
 * non-positive physical parameter: every number of the result is scanned.
 *
 * Sweeps: reference resonator X1 (L1 10 mH, C1 10 fF, R1 20 Ω, C0 3 pF; invented), its
 * impedance from src/lib/models/bvd.ts (IEEE Std 177 BVD model), with seeded noise where stated.
 */
import { describe, expect, it } from 'vitest';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import type { PartResult, SampleResult } from '../../src/lib/extract/types.ts';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import type { Part, SweepRef } from '../../src/lib/schema/part.ts';
import type { ImpedanceSweep } from '../../src/lib/sweep/sweep.ts';
import { linGrid, synthSweep } from '../lib/extract/synthetic.ts';
import { createRng } from '../../src/lib/synth/rng.ts';
import { firstNonFinite } from './fuzz-support.ts';

const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };
const FS = X1.branches[0].fsHz; // 15.915494 MHz
const FP = FS * Math.sqrt(1 + 10e-15 / 3e-12);
const BW = FS / 50_000; // fs/Q, Q = 1/(ω R1 C1) = 50,000

/** Words that tell the user what to do next. */
const ADVICE =
  /\b(use|widen|re-?measure|check|add|average|reduce|increase|remove|move|repeat|try|sweep (across|around|a wider|wider|finer))\b/i;

function run(sweeps: Array<{ z: ImpedanceSweep; ref?: Partial<SweepRef> }>, part: Partial<Part> = {}): SampleResult {
  const refs: SweepRef[] = sweeps.map((s, i) => ({ file: `s${i}.csv`, fixture: 'impedance', ...s.ref }));
  const p: Part = {
    id: 'EDGE-1',
    title: 'edge case',
    kind: 'quartz-at',
    samples: [{ id: 'A', sweeps: refs }],
    ...part,
  };
  const result: PartResult = extractPart(
    p,
    sweeps.map((s, i) => ({
      sampleId: 'A',
      ref: refs[i],
      file: refs[i].file,
      impedance: { ...s.z, source: refs[i].file },
    })),
  );
  expectNothingBadPublished(result);
  return result.samples[0];
}

/** No NaN or Infinity anywhere; every published physical parameter positive; fs < fp. */
function expectNothingBadPublished(result: PartResult): void {
  const bad = firstNonFinite(result);
  if (bad) throw new Error(`published ${bad[1]} at ${bad[0]}`);
  for (const s of result.samples) {
    for (const m of s.modes) {
      for (const k of ['fsHz', 'fpHz', 'r1Ohm', 'l1H', 'c1F', 'q'] as const)
        expect(m[k], `${k} of a published mode`).toBeGreaterThan(0);
      expect(m.fpHz).toBeGreaterThan(m.fsHz);
      for (const [k, u] of Object.entries(m.uncertainty)) expect(u, `uncertainty ${k}`).toBeGreaterThanOrEqual(0);
    }
    if (s.modes.length > 0) expect(s.c0F).toBeGreaterThan(0);
    else expect(s.c0F).toBeGreaterThanOrEqual(0);
    for (const b of s.model.branches) for (const v of [b.fsHz, b.r1Ohm, b.c1F]) expect(v).toBeGreaterThan(0);
    // the extract JSON: numbers stay numbers (JSON.stringify would turn NaN into null)
    expect(JSON.stringify({ c0F: s.c0F, modes: s.modes })).not.toContain('null');
  }
}

function warningMatching(s: SampleResult, re: RegExp): string {
  const w = s.warnings.find((x) => re.test(x));
  expect(w, `warnings: ${JSON.stringify(s.warnings, null, 1)}`).toBeDefined();
  return w!;
}

/** Impedance of a plain capacitor, ohm. */
function capacitor(cF: number, f: Float64Array): ImpedanceSweep {
  return { freqHz: f, zRe: new Float64Array(f.length), zIm: f.map((x) => -1 / (2 * Math.PI * x * cF)), source: 'c' };
}

describe('extraction never publishes a bad number', () => {
  it('no resonance (a plain 3 pF capacitor): no mode, an error that says where the sweep looked and what to do', () => {
    const s = run([{ z: capacitor(3e-12, linGrid(FS - 50e3, FS + 50e3, 401)) }]);
    expect(s.modes).toEqual([]);
    const w = warningMatching(s, /no resonance/);
    expect(w).toMatch(/capacitive only between/);
    // and what to do about it (sweep across the expected fs, check the fixture or the frequency unit)
    expect(s.warnings.join('\n')).toMatch(ADVICE);
  });

  it('no resonance (a flat resistor, and a sweep of pure noise): no mode, an error', () => {
    const f = linGrid(FS - 50e3, FS + 50e3, 401);
    const flat = run([{ z: { freqHz: f, zRe: f.map(() => 50), zIm: new Float64Array(f.length), source: 'r' } }]);
    expect(flat.modes).toEqual([]);
    warningMatching(flat, /no resonance|no conductance peak/);
    const rng = createRng(7);
    const noise = run([
      {
        z: {
          freqHz: f,
          zRe: f.map(() => 50 + 10 * rng.gaussian()),
          zIm: f.map(() => 10 * rng.gaussian()),
          source: 'n',
        },
      },
    ]);
    for (const m of noise.modes) expect(m.q).toBeGreaterThan(0); // anything published is still physical
    expect(noise.warnings.length).toBeGreaterThan(0);
  });

  it('two modes closer than the step: a warning to use a finer step there', () => {
    const twin: BvdModel = { c0F: 3e-12, branches: [X1.branches[0], { fsHz: FS + 0.3 * BW, r1Ohm: 25, c1F: 8e-15 }] };
    // step 4 bandwidths: the two modes fall between neighbouring points
    const s = run([{ z: synthSweep(twin, linGrid(FS - 200 * BW, FS + 200 * BW, 101), { noiseDb: -80, seed: 3 }) }]);
    expect(warningMatching(s, /closer than the sweep resolves|points per resonance bandwidth/)).toMatch(
      /finer step|step of at most/,
    );
  });

  it('a resonance at the sweep edge: a warning to widen the span', () => {
    const f = linGrid(FS - 2e3, FS + 0.2 * BW, 401); // ends just above fs: the peak is cut
    const s = run([{ z: synthSweep(X1, f, { noiseDb: -80, seed: 4 }) }]);
    const all = [...s.warnings, ...s.diagnostics.map((d) => d.message)].join('\n');
    expect(all).toMatch(/sweep edge|widen the span/);
  });

  it('data with negative resistance (not a passive part): no negative R1 published, a warning or error', () => {
    const z = synthSweep(X1, linGrid(FS - 20 * BW, FS + 20 * BW, 401), { noiseDb: -80, seed: 5 });
    const negative = { ...z, zRe: z.zRe.map((r) => -r) };
    const s = run([{ z: negative }]);
    warningMatching(s, /no resonance|negative/);
  });

  it('an added capacitor larger than the whole shunt capacitance (C0 of the part alone would be negative): no negative C0, an error', () => {
    const z = synthSweep(X1, linGrid(FS - 20 * BW, FP + 20 * BW, 2001), { noiseDb: -80, seed: 6 });
    const s = run([{ z, ref: { addedCapacitanceF: 10e-12, addedConnection: 'parallel' } }]);
    // the part alone has C0 = 3 pF − 10 pF < 0: the record's addedCapacitance cannot be right, and
    // no C0 may be published as if it were measured
    const w = warningMatching(s, /negative|added ?capacit/i);
    expect(w).toMatch(ADVICE);
  });

  it('zero impedance (a shorted fixture) and a 0 Hz point: no Infinity or NaN reaches the result', () => {
    const f = linGrid(0, FS + 20 * BW, 401);
    const short = run([
      { z: { freqHz: f, zRe: new Float64Array(f.length), zIm: new Float64Array(f.length), source: 'short' } },
    ]);
    expect(short.modes).toEqual([]);
    warningMatching(short, /no resonance/);
    const withDc = synthSweep(X1, Float64Array.from([0, ...linGrid(FS - 20 * BW, FS + 20 * BW, 400)]), {
      noiseDb: -80,
      seed: 8,
    });
    withDc.zRe[0] = 1e12;
    withDc.zIm[0] = -1e15;
    run([{ z: withDc }]);
  });

  it('fits that cannot converge (three points, noise as large as the signal): a warning with the reason, values from another method or none', () => {
    const three = run([{ z: synthSweep(X1, Float64Array.from([FS - BW, FS, FS + BW]), { seed: 9 }) }]);
    expect(warningMatching(three, /points per resonance bandwidth/)).toMatch(/use a step of at most/);
    const noisy = run([{ z: synthSweep(X1, linGrid(FS - 20 * BW, FS + 20 * BW, 201), { noiseDb: 0, seed: 10 }) }]);
    warningMatching(noisy, /no resonance|fit failed|no usable estimate/);
    expect(noisy.warnings.join('\n')).toMatch(ADVICE);
  });

  it('extreme scales (a 1 kHz and a 3 GHz resonator, 1 mΩ and 1 MΩ resistance) publish only finite positive values', () => {
    for (const m of [
      { c0F: 1e-12, branches: [{ fsHz: 1e3, r1Ohm: 1e6, c1F: 1e-15 }] },
      { c0F: 1e-13, branches: [{ fsHz: 3e9, r1Ohm: 1e-3, c1F: 1e-16 }] },
    ] as BvdModel[]) {
      const b = m.branches[0];
      const bw = b.fsHz * 2 * Math.PI * b.fsHz * b.r1Ohm * b.c1F;
      run([{ z: synthSweep(m, linGrid(b.fsHz - 30 * bw, b.fsHz + 30 * bw, 401), { noiseDb: -80, seed: 11 }) }]);
    }
  });
});
