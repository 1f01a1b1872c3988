import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { run as runExtract } from '../../scripts/cli/extract.ts';
import { formatSweepCsv } from '../../src/lib/io/sweep-csv.ts';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import { linGrid, synthSweep } from '../lib/extract/synthetic.ts';

// Reference resonator X1 (synthetic, IEEE Std 177 model) written as CSV sweeps of an invented part.
const FS = 1e8 / (2 * Math.PI);
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: FS, r1Ohm: 20, c1F: 10e-15 }] };

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runExtract(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

let dir: string;
let good: string;
let empty: string;
let bad: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'motional-extract-'));
  good = join(dir, 'xt-test');
  mkdirSync(good);
  writeFileSync(
    join(good, 'a1-narrow.csv'),
    formatSweepCsv(synthSweep(X1, linGrid(FS - 1600, FS + 1600, 801), { noiseDb: -70, seed: 1 })),
  );
  writeFileSync(
    join(good, 'a1-wide.csv'),
    formatSweepCsv(synthSweep(X1, linGrid(0.995 * FS, 1.005 * FS, 2001), { noiseDb: -70, seed: 2 })),
  );
  writeFileSync(
    join(good, 'part.yaml'),
    [
      'id: XT-TEST',
      'title: test crystal (synthetic)',
      'kind: quartz-at',
      'samples:',
      '  - id: A1',
      '    instrumentMaxFrequency: 15.95 MHz',
      '    sweeps:',
      '      - file: a1-narrow.csv',
      '        fixture: impedance',
      '      - file: a1-wide.csv',
      '        fixture: impedance',
      '',
    ].join('\n'),
  );
  empty = join(dir, 'xt-empty');
  mkdirSync(empty);
  const below: BvdModel = { c0F: 5e-12, branches: [{ fsHz: 4.2e6, r1Ohm: 50, c1F: 20e-15 }] };
  writeFileSync(
    join(empty, 'a1.csv'),
    formatSweepCsv(synthSweep(below, linGrid(3.97e6, 4.03e6, 401), { noiseDb: -70 })),
  );
  writeFileSync(
    join(empty, 'part.yaml'),
    'id: XT-EMPTY\ntitle: no resonance\nkind: quartz-at\nsamples:\n  - id: A1\n    sweeps:\n      - file: a1.csv\n        fixture: impedance\n',
  );
  bad = join(dir, 'xt-bad');
  mkdirSync(bad);
  writeFileSync(
    join(bad, 'part.yaml'),
    'id: XT-BAD\ntitle: bad\nkind: quartz-at\ndatasheet:\n  c0Max: 80 ohm\nsamples:\n  - id: A1\n    sweeps:\n      - file: missing.csv\n        fixture: impedance\n',
  );
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('motional extract', () => {
  it('prints the extract JSON in SI units and exits 0', async () => {
    const r = await run([good, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.part).toBe('XT-TEST');
    const s = j.samples[0];
    expect(s.sample).toBe('A1');
    expect(s.c0F / 3e-12 - 1).toBeLessThan(1e-3);
    const m = s.modes[0];
    expect(m).toMatchObject({ overtone: 1, spurious: false });
    expect(Math.abs(m.fsHz / FS - 1)).toBeLessThan(1e-7);
    expect(m.r1Ohm).toBeCloseTo(20, 1);
    for (const k of ['fsHz', 'r1Ohm', 'l1H', 'c1F', 'c0F']) expect(m.uncertainty[k]).toBeGreaterThan(0);
    expect(s.warnings).toEqual([
      `sweep a1-wide.csv: above instrumentMaxFrequency from 15.95 MHz; modes there are flagged`,
    ]);
    expect(r.out).not.toMatch(/NaN|Infinity|null/);
  });

  it('prints a readable table without --json', async () => {
    const r = await run([join(good, 'part.yaml')]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^part XT-TEST\n\nsample A1\n  C0 (2\.99\d*|3(\.0\d*)?)\(\d{1,2}\) pF/); // GUM concise form, at most two digits of u
    expect(r.out).toMatch(/\n {2}fundamental +15915494\.3\d*\(\d{1,2}\) Hz /);
    expect(r.out).toContain(
      'warnings:\n    - sweep a1-wide.csv: above instrumentMaxFrequency from 15.95 MHz; modes there are flagged',
    );
  });

  it('exits 1 with the clear message when no sample shows a resonance', async () => {
    const r = await run([empty, '--json']);
    expect(r.code).toBe(1);
    expect(r.err).toContain(
      'a1.csv:1: sample A1: sweep a1.csv: no resonance: capacitive only between 3.97 and 4.03 MHz',
    );
    expect(JSON.parse(r.out).samples[0].modes).toEqual([]);
  });

  it('exits 1 and prints FILE:LINE: message for a bad record', async () => {
    const r = await run([bad, '--json']);
    expect(r.code).toBe(1);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/part\.yaml:5: datasheet\.c0Max: /);
  });

  it('exits 2 on usage errors', async () => {
    expect((await run([])).code).toBe(2);
    expect((await run([good, good])).code).toBe(2);
    expect((await run([good, '--frobnicate'])).code).toBe(2);
    const h = await run(['--help']);
    expect(h.code).toBe(0);
    expect(h.out).toMatch(/^usage: motional extract PART/);
  });

  it('extracts only the requested sample and rejects an unknown one', async () => {
    expect(JSON.parse((await run([good, '--json', '--sample', 'A1'])).out).samples).toHaveLength(1);
    const r = await run([good, '--sample', 'Z9']);
    expect(r.code).toBe(1);
    expect(r.err).toContain('no sample "Z9" (samples: A1)');
  });
});
