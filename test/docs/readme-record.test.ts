/**
 * The README's complete record example must be a valid record: the test takes the YAML block
 * under "The part record" from README.md, writes the sweep files it names (synthetic, from
 * values like the reference resonator X1's, scaled to 12 MHz), and runs `motional check` and `extract` on it.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from 'yaml';
import { synthesizeSweep } from '../../src/lib/synth/synth-sweep.ts';
import { synthesizeCompensation } from '../../src/lib/synth/synth-compensation.ts';
import { formatSynthFile } from '../../src/lib/synth/synth-file.ts';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import { run as runCheck } from '../../scripts/cli/check.ts';
import { run as runExtract } from '../../scripts/cli/extract.ts';

function readmeRecord(): string {
  const readme = readFileSync('README.md', 'utf8');
  const section = readme.slice(readme.indexOf('## The part record'));
  const m = /```yaml\n([\s\S]*?)```/.exec(section);
  if (!m) throw new Error('README.md: no ```yaml block under "## The part record"');
  return m[1];
}

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { out: (t: string) => void out.push(t), err: (t: string) => void err.push(t) }, out, err };
}

describe('README record example', () => {
  const yamlText = readmeRecord();
  const dir = mkdtempSync(join(tmpdir(), 'motional-readme-'));
  writeFileSync(join(dir, 'part.yaml'), yamlText);

  // A 12 MHz AT-cut part in the typical range (from memory; invented values): C1 12 fF, C0 2.4 pF, R1 25 Ω.
  // fs chosen so that at the 8 pF datasheet load the part sits on 12 MHz.
  const c1F = 12e-15;
  const c0F = 2.4e-12;
  const fsHz = 12e6 / Math.sqrt(1 + c1F / (c0F + 8e-12));
  const model: BvdModel = { c0F, branches: [{ fsHz, r1Ohm: 25, c1F }] };
  const parasitics = { rsOhm: 0.3, lsH: 3e-9, cpF: 0.4e-12 };
  const bw = fsHz / 40000;
  const narrow = { kind: 'centered' as const, centerHz: fsHz, spanHz: 12 * bw, points: 801 };
  const record = parseDocument(yamlText).toJS();
  const sweeps = record.samples[0].sweeps as Array<{ file: string; addedCapacitance?: string; fixture: string }>;
  const wideGrid = { kind: 'linear' as const, startHz: 11.7e6, stopHz: 12.3e6, points: 3001 };

  for (const [i, s] of sweeps.entries()) {
    if (s.file.endsWith('.csv')) {
      const r = synthesizeSweep({ model, grid: wideGrid, fixture: 'impedance', noiseDb: -75, seed: 10 + i });
      writeFileSync(join(dir, s.file), formatSynthFile(r, { kind: 'csv', form: 'magphase', freqUnit: 'MHz' }));
    } else {
      const added = s.addedCapacitance ? { capacitanceF: 10e-12, connection: 'parallel' as const } : undefined;
      const grid = added
        ? { kind: 'segments' as const, segments: [narrow, wideGrid] }
        : { kind: 'segments' as const, segments: [narrow, wideGrid] };
      const r = synthesizeSweep({ model, grid, fixture: 'series-thru', parasitics, added, noiseDb: -75, seed: 10 + i });
      writeFileSync(join(dir, s.file), formatSynthFile(r, { kind: 'touchstone' }));
    }
  }
  const comp = synthesizeCompensation({
    parasitics,
    grid: { kind: 'linear', startHz: 11.6e6, stopHz: 12.4e6, points: 201 },
    fixture: 'series-thru',
    noiseDb: -90,
    seed: 3,
  });
  writeFileSync(join(dir, record.samples[0].compensation.open), formatSynthFile(comp.open, { kind: 'touchstone' }));
  writeFileSync(join(dir, record.samples[0].compensation.short), formatSynthFile(comp.short, { kind: 'touchstone' }));

  it('passes motional check with no problem', async () => {
    const c = capture();
    const status = await runCheck([dir], c.io);
    expect(c.err.join('')).toBe('');
    expect(status).toBe(0);
    expect(c.out.join('')).toMatch(/^1 part, 0 problems/);
  });

  it('extracts to the model it was generated from (fs 0.1 ppm, R1 1 %, C1 0.5 %, C0 1 %: extraction issue tolerances)', async () => {
    const c = capture();
    const status = await runExtract([dir, '--json'], c.io);
    expect(status).toBe(0);
    const json = JSON.parse(c.out.join(''));
    expect(json.part).toBe('XO-0012');
    const mode = json.samples[0].modes[0];
    expect(Math.abs(mode.fsHz / fsHz - 1)).toBeLessThan(0.1e-6);
    expect(Math.abs(mode.r1Ohm / 25 - 1)).toBeLessThan(0.01);
    expect(Math.abs(mode.c1F / c1F - 1)).toBeLessThan(0.005);
    expect(Math.abs(json.samples[0].c0F / c0F - 1)).toBeLessThan(0.01);
  });
});
