/**
 * Every demo part (content/parts, written by scripts/make-demo.ts) goes through the real loader
 * and the extraction and must give back the documented model values it was generated from
 * (scripts/demo/parts.ts), within the tolerances of the extraction issue: fs 0.1 ppm, fp 1 ppm,
 * R1 1 %, C1 and L1 0.5 %, C0 1 %. Modes documented as above the instrument range must be flagged
 * instead. The scenario of each part (temperature, drive level, ESR failure, spurious mode, lots)
 * is checked against its documented values as well. Synthetic data: the point is recovery.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import type { PartResult } from '../../src/lib/extract/types.ts';
import { parseQuantity } from '../../src/lib/units/si.ts';
import { DEMO_PARTS } from '../../scripts/demo/parts.ts';
import { atCutOffset } from '../../scripts/demo/demo-physics.ts';
import { compareSample } from './demo-compare.ts';

const CONTENT = join(process.cwd(), 'content', 'parts');
const results = new Map<string, PartResult>();

async function extracted(id: string): Promise<PartResult> {
  const cached = results.get(id);
  if (cached) return cached;
  const loaded = await loadPart(join(CONTENT, id));
  const errors = loaded.issues.filter((i) => i.severity === 'error');
  expect(errors, `${id} loads without errors`).toEqual([]);
  const result = extractPart(loaded.part!, loaded.sweeps);
  results.set(id, result);
  return result;
}

describe('demo catalogue recovery', () => {
  for (const part of DEMO_PARTS) {
    it(`${part.id} (${part.scenario.shows}) extracts to its documented model values`, async () => {
      const result = await extracted(part.id);
      for (const sample of part.samples) {
        const got = result.samples.find((s) => s.sample === sample.id);
        expect(got, `${part.id}/${sample.id} has a result`).toBeDefined();
        expect(compareSample(got!, sample.model, sample.modes), `${part.id}/${sample.id}`).toEqual([]);
      }
    });
  }
});

describe('demo catalogue scenarios', () => {
  const part = (id: string) => DEMO_PARTS.find((p) => p.id === id)!;

  it('the temperature part reproduces the AT-cut cubic at an angle offset of +2′', async () => {
    const p = part('xt-16m-2520-temp');
    const t = (await extracted(p.id)).samples[0].temperature;
    expect(t).toBeDefined();
    expect(t!.form).toBe('cubic');
    // Δθ = +2′, coefficients of Gerber & Ballato (eds.), Precision Frequency Control, Academic
    // Press 1985, as quoted in M. Haney's 2001 thesis; evaluated with mpmath: −40 °C −20.7189 ppm,
    // 85 °C +11.6776 ppm, peak-to-peak −40…85 °C 32.3965 ppm.
    expect(atCutOffset(-40, p.scenario.temperatureCoefficients!) * 1e6).toBeCloseTo(-20.7189, 3);
    const at = (c: number) => t!.points.find((x) => x.temperatureC === c)!.offsetPpm;
    expect(at(-40) - at(25)).toBeCloseTo(-20.7189, 0);
    expect(at(85) - at(25)).toBeCloseTo(11.6776, 0);
    expect(t!.spanPpm).toBeGreaterThan(32.3965 - 0.5);
    expect(t!.spanPpm).toBeLessThan(32.3965 + 0.5);
  });

  it('the drive-level part shows R1 rising at low drive by the documented ratio', async () => {
    const p = part('xt-20m-2520-dld');
    const levels = p.scenario.driveLevels!;
    const d = (await extracted(p.id)).samples[0].drive;
    expect(d).toBeDefined();
    const want = Math.max(...levels.map((l) => l.r1Ohm)) / Math.min(...levels.map((l) => l.r1Ohm));
    expect(Math.abs(d!.resistanceRatio / want - 1)).toBeLessThan(0.02);
    expect(d!.frequencyShiftPpm).toBeCloseTo(levels[levels.length - 1].offsetPpm - levels[0].offsetPpm, 1);
  });

  it('the borderline part measures above its datasheet ESR in every sample', async () => {
    const p = part('xt-24m-2016-esr');
    const esrMax = parseQuantity(p.datasheet.esrMax!, 'resistance');
    expect(esrMax.ok).toBe(true);
    for (const s of (await extracted(p.id)).samples) {
      const main = s.modes.find((m) => !m.spurious && m.overtone === 1)!;
      expect(main.r1Ohm).toBeGreaterThan(esrMax.ok ? esrMax.value : Infinity);
    }
  });

  it('the spurious mode is reported with its documented resistance ratio', async () => {
    const p = part('xt-10m-hc49s-spur');
    const model = p.samples[0].model;
    const spur = (await extracted(p.id)).samples[0].modes.find((m) => m.spurious)!;
    expect(spur).toBeDefined();
    expect(Math.abs(spur.resistanceRatio! / (model.branches[1].r1Ohm / model.branches[0].r1Ohm) - 1)).toBeLessThan(
      0.02,
    );
  });

  it('the overtone swept above the instrument range is flagged with a warning', async () => {
    const s = (await extracted('xt-40m-2016-range')).samples[0];
    expect(s.modes.some((m) => m.overtone === 3 && m.flagged === true)).toBe(true);
    expect(s.modes.filter((m) => m.overtone === 1).every((m) => !m.flagged)).toBe(true);
    expect(s.warnings.some((w) => /instrumentMaxFrequency/.test(w))).toBe(true);
  });

  it('the outlier sample of the two-lot part stands out in R1', async () => {
    const r1 = (await extracted('xt-16m-3225-lots')).samples.map((s) => [s.sample, s.modes[0].r1Ohm] as const);
    const others = r1.filter(([id]) => id !== 'B2').map(([, r]) => r);
    const outlier = r1.find(([id]) => id === 'B2')![1];
    expect(outlier).toBeGreaterThan(1.6 * Math.max(...others));
  });

  it('parts without a deliberate problem extract without warnings', async () => {
    const noisy: string[] = [];
    const meant = new Set(['xt-40m-2016-range', 'xt-20m-2520-dld', 'xt-24m-2016-esr']);
    for (const p of DEMO_PARTS) {
      if (meant.has(p.id)) continue;
      for (const s of (await extracted(p.id)).samples) {
        for (const w of s.warnings) noisy.push(`${p.id}/${s.sample}: ${w}`);
      }
    }
    expect(noisy).toEqual([]);
  });
});
