import { describe, expect, it } from 'vitest';
import { makePartData } from '../../../src/lib/report/part-data.ts';
import { makeCompareData, makeIndexEntry } from '../../../src/lib/report/catalogue-entries.ts';
import { modeWindow } from '../../../src/lib/report/plots.ts';
import { makeDownloads } from '../../../src/pipeline/emit.ts';
import { advisePierce } from '../../../src/lib/osc/pierce.ts';
import { DEMO_CIRCUIT, X1, fixtureCatalogue, makeFixturePart } from '../../site/fixture.ts';

function x1Part() {
  const spec = fixtureCatalogue().find((s) => s.id === 'XT-0001')!;
  const { loaded, result } = makeFixturePart(spec);
  const downloads = makeDownloads(loaded, result, { readText: (p) => `raw ${p.split('/').pop()}\n` });
  return { loaded, result, downloads, data: makePartData(loaded, result, [DEMO_CIRCUIT], { downloads }) };
}

describe('makePartData', () => {
  it('is plain JSON: a round trip through JSON.stringify changes nothing', () => {
    const { data } = x1Part();
    expect(JSON.parse(JSON.stringify(data))).toEqual(data);
    expect(JSON.stringify(data)).not.toMatch(/NaN|Infinity/);
  });

  // Reference resonator X1: fs = 15 915 494.309 Hz, Q = 50 000 (IEEE Std 177 BVD model).
  it('summarises the first sample main mode of the X1 reference resonator', () => {
    const { data } = x1Part();
    expect(data.summary.fsHz).toBeCloseTo(15_915_494.309, 2);
    expect(data.summary.r1Ohm).toBe(20);
    expect(data.summary.c1F).toBe(10e-15);
    expect(data.summary.c0F).toBe(3e-12);
    expect(data.summary.q).toBeCloseTo(50_000, 6);
    expect(data.synthetic).toBe(true);
  });

  // CL for a target f: CL = C1/((f/fs)² − 1) − C0 (lossless, derived from the BVD model), independent arithmetic here.
  it('gives the load capacitance that reaches the datasheet frequency', () => {
    const { data } = x1Part();
    const fs = X1.branches[0].fsHz;
    const ratio = 15.92e6 / fs;
    expect(data.summary.clForNominalF).toBeCloseTo(10e-15 / (ratio * ratio - 1) - 3e-12, 20);
  });

  it('decimates the mode plot within the point budget and keeps fs and fp inside its window', () => {
    const { data } = x1Part();
    const p = data.samples[0].plots.modes[0];
    expect(p.measuredMag.x.length).toBeLessThanOrEqual(322);
    expect(p.measuredMag.x.length).toBe(p.measuredMag.y.length);
    const [lo, hi] = modeWindow({ fsHz: p.fsHz, fpHz: p.fpHz, q: 50_000 });
    expect(lo).toBeLessThan(p.fsHz);
    expect(hi).toBeGreaterThan(p.fpHz);
    // The measured minimum sits next to fs (fixture noise is 0.2 %).
    const iMin = p.measuredMag.y.indexOf(Math.min(...p.measuredMag.y));
    expect(Math.abs(p.measuredMag.x[iMin] - p.fsHz)).toBeLessThan(50);
    // The residual of a model against its own data plus 0.2 % noise stays near 0.2 %.
    expect(Math.max(...p.residualPct.y)).toBeLessThan(0.5);
  });

  // Pulling at the datasheet CL: DL = fs·√(1 + C1/(C0 + CL)) vs nominal (lossless, derived from the BVD model).
  it('marks the datasheet load capacitance on the pulling curve', () => {
    const { data } = x1Part();
    const pull = data.samples[0].plots.pulling!;
    expect(pull.reference).toBe('nominal');
    expect(pull.datasheetClF).toBe(8e-12);
    const fs = X1.branches[0].fsHz;
    const expected = ((fs * Math.sqrt(1 + 10e-15 / 11e-12)) / 15.92e6 - 1) * 1e6;
    expect(pull.datasheetClPpm).toBeCloseTo(expected, 3);
  });

  it('gives the Pierce advice of the advice code for each circuit', () => {
    const { data } = x1Part();
    expect(data.pierce).toHaveLength(1);
    const direct = advisePierce({
      partId: 'XT-0001',
      datasheet: data.calculator!.datasheet,
      model: data.calculator!.model,
      mainBranch: 0,
      circuit: DEMO_CIRCUIT,
    });
    expect(data.pierce[0]).toEqual(JSON.parse(JSON.stringify(direct)));
  });

  it('lists downloads with their sizes and lot statistics for two samples', () => {
    const { data, downloads } = x1Part();
    const names = data.downloads.map((d) => d.name);
    expect(names).toEqual(
      expect.arrayContaining([
        'XT-0001.cir',
        'XT-0001-main.cir',
        'XT-0001-model.s1p',
        'XT-0001-parameters.json',
        'XT-0001-parameters.csv',
        'raw/part.yaml',
        'raw/s1-mode1.csv',
      ]),
    );
    const cir = downloads.find((d) => d.name === 'XT-0001.cir')!;
    expect(data.downloads.find((d) => d.name === 'XT-0001.cir')!.bytes).toBe(
      new TextEncoder().encode(cir.content).length,
    );
    expect(data.lotStats?.n).toBe(2);
  });
});

describe('makeIndexEntry', () => {
  it('carries the main mode, samples, overtone, state and a plain notes excerpt', () => {
    const { data } = x1Part();
    const e = makeIndexEntry(data);
    expect(e).toMatchObject({
      id: 'XT-0001',
      kind: 'quartz-at',
      package: '3225',
      samples: 2,
      overtone: 1,
      r1Ohm: 20,
      c0F: 3e-12,
      c1F: 1e-14,
      synthetic: true,
    });
    expect(e.fsHz).toBe(data.summary.fsHz);
    expect(['pass', 'fail', 'unknown', 'warnings']).toContain(e.state);
    expect(e.notes).toBe('Reference part X1. See the guide.');
  });

  it('marks a part that misses its datasheet ESR as fail', () => {
    const spec = fixtureCatalogue().find((s) => s.id === 'XT-0004')!; // R1 55 Ω against esrMax 40 Ω
    const { loaded, result } = makeFixturePart(spec);
    const e = makeIndexEntry(makePartData(loaded, result, []));
    expect(e.state).toBe('fail');
  });

  it('keeps the compare data small and without residuals', () => {
    const { data } = x1Part();
    const c = makeCompareData(data);
    expect(c.mode?.residualPct.x).toEqual([]);
    expect(c.mode!.measuredMag.x.length).toBeLessThanOrEqual(252);
    expect(JSON.stringify(c).length).toBeLessThan(40_000);
  });

  it('shows on the compare page the plot of the main mode the extraction recorded, found by its index', () => {
    const { data } = x1Part();
    const first = data.samples[0];
    expect(first.mainMode?.index).toBe(0);
    expect(first.plots.modes[0].modeIndex).toBe(0);
    // A decoy plot of another mode at exactly the summary's fs must not be taken for the main mode.
    const decoy = { ...first.plots.modes[0], modeIndex: 1, fsHz: data.summary.fsHz! };
    const main = { ...first.plots.modes[0], fsHz: data.summary.fsHz! + 1 };
    const c = makeCompareData({ ...data, samples: [{ ...first, plots: { ...first.plots, modes: [decoy, main] } }] });
    expect(c.mode?.modeIndex).toBe(0);
    expect(c.mode?.fsHz).toBe(data.summary.fsHz! + 1);
  });
});
