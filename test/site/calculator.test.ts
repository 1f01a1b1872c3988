import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { parseOscillatorsYaml } from '../../src/lib/osc/oscillators-yaml.ts';
import { makePartData } from '../../src/lib/report/part-data.ts';
import { formFromCircuit, runCalculator } from '../../src/site/calculator.ts';
import { run as runAdvise } from '../../scripts/cli/advise.ts';

async function adviseCli(args: string[]): Promise<unknown> {
  let out = '';
  await runAdvise([...args, '--json'], { out: (t) => void (out += t), err: () => undefined });
  return JSON.parse(out);
}

// The page calculator must give the `advise` command's answer for the same circuit values.
describe('runCalculator', async () => {
  const folder = join('content', 'parts', 'xt-16m-3225-lots');
  const loaded = await loadPart(folder);
  const result = extractPart(loaded.part!, loaded.sweeps);
  const circuits = parseOscillatorsYaml(
    readFileSync(join('content', 'oscillators.yaml'), 'utf8'),
    'oscillators.yaml',
  ).circuits;
  const data = makePartData(loaded, result, circuits).calculator!;

  it('with a circuit file entry and the datasheet target equals `advise --circuit NAME`', async () => {
    for (const c of data.circuits) {
      const got = runCalculator(data, formFromCircuit(data, c));
      const cli = (await adviseCli([folder, '--circuit', c.name])) as Array<{
        ok: boolean;
        best?: unknown;
        equal?: unknown;
        reason?: string;
      }>;
      expect(got.ok, c.name).toBe(cli[0].ok);
      if (got.ok) {
        expect(JSON.parse(JSON.stringify(got.advice.best))).toEqual(cli[0].best);
        expect(JSON.parse(JSON.stringify(got.advice.equal))).toEqual(cli[0].equal);
      }
    }
  });

  it('with changed stray and pin capacitances equals `advise` with the same flags', async () => {
    const c = data.circuits[0];
    const form = { ...formFromCircuit(data, c), stray: '2.5', pinIn: '5p', gm: '12' };
    const got = runCalculator(data, form);
    const cli = (await adviseCli([
      folder,
      '--circuit',
      c.name,
      '--stray',
      '2.5pF',
      '--pin-in',
      '5pF',
      '--gm',
      '12mA/V',
    ])) as Array<{ best: unknown }>;
    expect(got.ok).toBe(true);
    if (got.ok) expect(JSON.parse(JSON.stringify(got.advice.best))).toEqual(cli[0].best);
  });

  it('names the field that does not parse', () => {
    const got = runCalculator(data, { ...formFromCircuit(data, data.circuits[0]), stray: 'lots' });
    expect(got.ok).toBe(false);
    if (!got.ok) expect(got.message).toMatch(/^board stray: .*"lots"/);
  });

  it('a capacitance field that does not parse suggests a capacitance ("8p", never "12M") and names its input', () => {
    for (const field of ['stray', 'pinIn', 'pinOut', 'pinToPin'] as const) {
      const got = runCalculator(data, { ...formFromCircuit(data, data.circuits[0]), [field]: 'abc' });
      expect(got.ok).toBe(false);
      if (got.ok) continue;
      expect(got.field).toBe(field);
      expect(got.message).toContain('"8p"');
      expect(got.message).not.toContain('12M');
    }
    const gm = runCalculator(data, { ...formFromCircuit(data, data.circuits[0]), gm: '-3' });
    expect(!gm.ok && gm.field).toBe('gm');
  });
});
