import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../scripts/motional.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { impedanceAt } from '../../src/lib/models/bvd.ts';
import { formatNetlist } from '../../src/lib/models/netlist-spice.ts';
import { modelFromResult } from '../../src/lib/report/netlist-model.ts';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { engineImpedance, impedanceDeck } from '../support/spice.ts';
import { FS_SPUR, FS_X1, writeDesignPart } from './design-part.ts';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

let dir: string;
let part: string;
let lot: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'motional-netlist-'));
  part = writeDesignPart(join(dir, 'one'));
  lot = writeDesignPart(join(dir, 'lot'), [1, 1.05, 0.97]);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('motional netlist', () => {
  it('prints the subcircuit of the first sample with every mode and the measurement date', async () => {
    const r = await run(['netlist', part]);
    // Extraction warnings may appear on stderr; nothing else.
    expect(r.err.split('\n').filter((l) => l !== '' && !/: warning: /.test(l))).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^\.subckt dsn_16m_S1 1 2$/m);
    expect(r.out.match(/^L\d /gm)).toHaveLength(2);
    expect(r.out).toContain('* measured: 2026-03-01');
    expect(r.out).toContain('* conditions: temperature 25 C, drive 10 uW');
    expect(r.out).toContain('* branch 2: spurious mode');
  });

  it('writes exactly the extracted model, and eecircuit-engine simulates it to that model within 1e-6', async () => {
    const r = await run(['netlist', part]);
    const loaded = await loadPart(part);
    const result = extractPart(loaded.part!, loaded.sweeps);
    const chosen = modelFromResult(result.samples[0]);
    // The extraction recovers X1 and the second branch of design-part.ts (loose: the extractor's own tests are strict).
    expect(Math.abs(chosen.model.branches[0].fsHz / FS_X1 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(chosen.model.branches[1].fsHz / FS_SPUR - 1)).toBeLessThan(1e-6);
    expect(chosen.model.branches[0].r1Ohm).toBeCloseTo(20, 1);
    const name = /^\.subckt (\S+)/m.exec(r.out)![1];
    const rows = await engineImpedance(
      impedanceDeck('cli netlist', `${r.out}XDUT in 0 ${name}\n`, {
        startHz: FS_X1 - 1000,
        stopHz: FS_SPUR + 1000,
        points: 4001,
      }),
    );
    let worst = 0;
    for (const [f, re, im] of rows) {
      const [mr, mi] = impedanceAt(chosen.model, f);
      worst = Math.max(worst, Math.hypot(re - mr, im - mi) / Math.hypot(mr, mi));
    }
    expect(worst).toBeLessThan(1e-6);
  });

  it('keeps only the main mode with --main-only and drops the spurious one with --no-spurious', async () => {
    const main1 = await run(['netlist', part, '--main-only']);
    expect(main1.out.match(/^L\d /gm)).toHaveLength(1);
    expect(main1.out).toContain('1 measured mode left out (main mode only)');
    const noSpur = await run(['netlist', part, '--no-spurious']);
    expect(noSpur.out.match(/^L\d /gm)).toHaveLength(1);
    expect(noSpur.out).not.toContain('spurious mode near');
  });

  it('models one named sample or the lot median', async () => {
    const s2 = await run(['netlist', lot, '--sample', 'S2']);
    expect(s2.code).toBe(0);
    expect(s2.out).toMatch(/^\.subckt dsn_16m_S2 1 2$/m);
    const med = await run(['netlist', lot, '--lot-median']);
    expect(med.code).toBe(0);
    expect(med.out).toContain('lot median part: median of each parameter per mode over 3 samples');
    expect(med.out).toContain('* measured: 2026-03-01 to 2026-03-03');
    // R1 of the samples ≈ 20, 21, 19.4 Ω: the median part has the middle one.
    const r1 = Number(/^R1 \S+ \S+ (\S+)$/m.exec(med.out)![1]);
    expect(r1).toBeCloseTo(20, 1);
  });

  it('prints the model as Touchstone and the parameters as CSV and JSON on request', async () => {
    const ts = await run([
      'netlist',
      part,
      '--format',
      'touchstone',
      '--start',
      '15.9MHz',
      '--stop',
      '15.93MHz',
      '--points',
      '11',
    ]);
    expect(ts.code).toBe(0);
    expect(ts.out).toContain('# Hz S RI R 50');
    expect(
      ts.out
        .trimEnd()
        .split('\n')
        .filter((l) => /^\d/.test(l)),
    ).toHaveLength(11);
    const csv = await run(['netlist', part, '--format', 'csv']);
    expect(csv.out.split('\n')[0]).toMatch(/^mode,overtone,spurious,fs \(Hz\)/);
    const json = JSON.parse((await run(['netlist', part, '--format', 'json'])).out);
    expect(json.part).toBe('dsn-16m');
    expect(json.modes).toHaveLength(2);
  });

  it('matches formatNetlist of the extracted sample (the command adds nothing of its own)', async () => {
    const loaded = await loadPart(part);
    const s = extractPart(loaded.part!, loaded.sweeps).samples[0];
    const chosen = modelFromResult(s);
    const r = await run(['netlist', part]);
    const body = (t: string) =>
      t
        .split('\n')
        .filter((l) => !l.startsWith('*'))
        .join('\n');
    expect(body(r.out)).toBe(
      body(formatNetlist(chosen.model, { partId: 'dsn-16m', sample: 'S1', labels: chosen.labels })),
    );
  });

  it('exits 1 naming the part for an unknown sample, and 2 for usage errors', async () => {
    const r = await run(['netlist', part, '--sample', 'Z9']);
    expect(r.code).toBe(1);
    expect(r.err).toContain('no sample "Z9" in dsn-16m (samples: S1)');
    expect((await run(['netlist'])).code).toBe(2);
    expect((await run(['netlist', part, '--bogus'])).code).toBe(2);
    expect((await run(['netlist', part, '--format', 'pdf'])).err).toContain(
      '--format: expected one of spice, touchstone, csv, json, got "pdf"',
    );
    expect((await run(['netlist', part, '--sample', 'S1', '--lot-median'])).code).toBe(2);
  });

  it('exits 1 with the located problems of a bad record', async () => {
    const r = await run(['netlist', 'test/fixtures/bad-records/wrong-unit']);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/part\.yaml:\d+: .*esrMax/);
    expect(r.out).toBe('');
  });
});
