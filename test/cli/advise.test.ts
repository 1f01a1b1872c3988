import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../scripts/motional.ts';
import { writeDesignPart } from './design-part.ts';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

const CIRCUITS = `circuits:
  - name: test-pierce
    gm: 5 mA/V
    inputCapacitance: 3 pF
    outputCapacitance: 3 pF
    boardStray: 1 pF
    boardStrayUncertainty: 0.5 pF
    supply: 3.3 V
    swing: 1 V
    maxDrive: 100 uW
    capacitorTolerance: 5 %
    series: E12
    frequencyRange: 10 MHz to 20 MHz
  - name: rtc-only
    gm: 20 uA/V
    inputCapacitance: 3 pF
    outputCapacitance: 3 pF
    boardStray: 1 pF
    supply: 1.8 V
    capacitorTolerance: 5 %
    series: E12
    frequencyRange: 30 kHz to 40 kHz
`;

let dir: string;
let part: string;
let circuits: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'motional-advise-'));
  part = writeDesignPart(dir);
  circuits = join(dir, 'oscillators.yaml');
  writeFileSync(circuits, CIRCUITS);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('motional advise', () => {
  it('advises on every circuit whose frequency range holds the part, as text', async () => {
    const r = await run(['advise', part, '--circuits', circuits]);
    expect(r.code).toBe(0);
    expect(r.out).toContain('dsn-16m (sample S1) in circuit test-pierce');
    expect(r.out).not.toContain('rtc-only');
    expect(r.out).toMatch(/target 15\.9208 MHz \(datasheet frequency\)/);
    expect(r.out).toMatch(/\[(pass|warn)\] gain margin: /);
    expect(r.out).toContain('assumptions:');
    expect(r.out).toContain('cautions:');
  });

  it('prints JSON with both pairs and their verdicts', async () => {
    const r = await run(['advise', part, '--circuits', circuits, '--circuit', 'test-pierce', '--json']);
    expect(r.code).toBe(0);
    const [a] = JSON.parse(r.out);
    expect(a.ok).toBe(true);
    expect(a.circuit).toBe('test-pierce');
    // Ideal CL for the sample: a few pF either side of the datasheet 12 pF; external caps ≈ 2(CL) − pins − board.
    expect(a.target.idealLoadF).toBeGreaterThan(10e-12);
    expect(a.target.idealLoadF).toBeLessThan(14e-12);
    for (const pair of [a.equal, a.best]) {
      expect(['pass', 'warn']).toContain(pair.checks.drive.verdict);
      expect(Math.abs(pair.offsetPpm)).toBeLessThan(40);
      expect(pair.bandPpm.min).toBeLessThanOrEqual(pair.offsetPpm);
    }
    expect(Math.abs(a.best.offsetPpm)).toBeLessThanOrEqual(Math.abs(a.equal.offsetPpm));
  });

  it('takes a whole circuit from flags and validates each value', async () => {
    const r = await run([
      'advise',
      part,
      '--gm',
      '5mA/V',
      '--pin-in',
      '3pF',
      '--pin-out',
      '4pF',
      '--stray',
      '1pF',
      '--supply',
      '3.3V',
      '--json',
    ]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out)[0].circuit).toBe('command-line');
  });

  it('rejects a transconductance in the wrong unit and a negative capacitance, naming the flag', async () => {
    const gm = await run([
      'advise',
      part,
      '--gm',
      '5pF',
      '--pin-in',
      '3pF',
      '--pin-out=-3pF',
      '--stray',
      '1pF',
      '--supply',
      '3.3V',
    ]);
    expect(gm.code).toBe(2);
    expect(gm.err).toContain('--gm: expected a transconductance such as "5 mA/V" or "5 mS", got "5pF" (a capacitance)');
    expect(gm.err).toContain('--pin-out: expected a non-negative capacitance, got "-3pF"');
    const missing = await run(['advise', part, '--gm', '5mS']);
    expect(missing.code).toBe(2);
    expect(missing.err).toContain('--supply: missing (needed without --circuit)');
  });

  it("replaces a named circuit's values with flags", async () => {
    const r = await run([
      'advise',
      part,
      '--circuits',
      circuits,
      '--circuit',
      'test-pierce',
      '--gm',
      '0.2mS',
      '--json',
    ]);
    const [a] = JSON.parse(r.out);
    expect(a.best.checks.gainMargin.verdict).toBe('warn');
  });

  it('reports a bad circuits file with located errors and exits 1', async () => {
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, CIRCUITS.replace('gm: 5 mA/V', 'gm: 5 pF'));
    const r = await run(['advise', part, '--circuits', bad]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`${bad}:3: circuits[0].gm: expected a transconductance`);
  });

  it('exits 2 for an unknown circuit name and 1 when no circuit covers the part', async () => {
    expect((await run(['advise', part, '--circuits', circuits, '--circuit', 'nope'])).code).toBe(2);
    const rtcOnly = join(dir, 'rtc.yaml');
    writeFileSync(rtcOnly, `circuits:\n${CIRCUITS.split('  - name: rtc-only')[1].replace(/^/, '  - name: rtc-only')}`);
    const r = await run(['advise', part, '--circuits', rtcOnly]);
    expect(r.code).toBe(1);
    // offered by the datasheet nominal 15.9208 MHz (design-part.ts), not the measured fs 15.9155 MHz
    expect(r.err).toMatch(/no circuit in the circuits file covers 15\.9208 MHz/);
  });

  it('--json carries the start-up time constant in seconds (startupTauS) for every pair', async () => {
    const r = await run(['advise', part, '--circuits', circuits, '--json']);
    expect(r.code).toBe(0);
    const advice = JSON.parse(r.out) as Array<{
      ok: boolean;
      equal: Record<string, unknown>;
      best: Record<string, unknown>;
    }>;
    expect(advice.length).toBeGreaterThan(0);
    for (const a of advice) {
      for (const p of [a.equal, a.best]) {
        expect(typeof p.startupTauS).toBe('number');
        expect(p.startupTauS as number).toBeGreaterThan(0);
        expect(typeof p.motionalResistanceOhm).toBe('number');
        expect(typeof p.pinsResistanceOhm).toBe('number');
        expect((p.budget as { terms: unknown[] }).terms.length).toBeGreaterThan(1);
      }
    }
  });

  it('offers circuits by the nominal frequency, not the measured fs', async () => {
    // The part's fs is 15.9155 MHz and its datasheet nominal 15.9208 MHz: a circuit for 15.92 MHz
    // and up is meant for it.
    const upper = join(dir, 'upper.yaml');
    writeFileSync(upper, CIRCUITS.replace('frequencyRange: 10 MHz to 20 MHz', 'frequencyRange: 15.92 MHz to 52 MHz'));
    const r = await run(['advise', part, '--circuits', upper]);
    expect(r.code).toBe(0);
    expect(r.out).toContain('in circuit test-pierce');
  });

  it('--all prints one row per part and circuit as text, CSV and JSON', async () => {
    const content = join(dir, 'content');
    writeDesignPart(join(content, 'parts'));
    writeFileSync(join(content, 'oscillators.yaml'), CIRCUITS);
    const text = await run(['advise', '--all', content]);
    expect(text.code).toBe(0);
    expect(text.out.split('\n')[0]).toMatch(
      /^part\s+circuit\s+verdict\s+pair in \/ out\s+offset\s+gain margin\s+start-up/,
    );
    expect(text.out).toMatch(/dsn-16m\s+rtc-only\s+outside range/);
    const csv = await run(['advise', '--all', content, '--format', 'csv']);
    const lines = csv.out.trim().split('\n');
    expect(lines[0]).toBe(
      'part,circuit,verdict,inputCapF,outputCapF,offsetPpm,gainMargin,startupTauS,startupTimeS,budgetWorstPpm,reason',
    );
    expect(lines).toHaveLength(3);
    const json = await run(['advise', '--all', content, '--format', 'json', '--circuit', 'test-pierce']);
    const rows = JSON.parse(json.out) as Array<{
      part: string;
      circuit: string;
      verdict: string;
      startupTauS?: number;
    }>;
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ part: 'dsn-16m', circuit: 'test-pierce' });
    expect(['fits', 'check', 'no']).toContain(rows[0].verdict);
    expect(rows[0].startupTauS).toBeGreaterThan(0);
    expect((await run(['advise', '--all', content, '--format', 'xml'])).code).toBe(2);
    expect((await run(['advise', '--all', content, '--gm', '5mS'])).code).toBe(2);
  });
});
