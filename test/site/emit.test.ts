import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { makeDownloads, writeCatalogueData } from '../../src/pipeline/emit.ts';
import { makePartData } from '../../src/lib/report/part-data.ts';
import { run as runNetlist } from '../../scripts/cli/netlist.ts';
import { DEMO_CIRCUIT } from './fixture.ts';

/** Run `motional netlist` in-process and return what it printed. */
async function netlistCli(args: string[]): Promise<string> {
  let out = '';
  const code = await runNetlist(args, { out: (t) => void (out += t), err: () => undefined });
  expect(code).toBe(0);
  return out;
}

// The downloads must be what the command line prints for the same part and sample (README: Commands).
describe('makeDownloads on a demo record', async () => {
  const folder = join('content', 'parts', 'xt-8m-hc49s');
  const loaded = await loadPart(folder);
  const result = extractPart(loaded.part!, loaded.sweeps);
  const downloads = makeDownloads(loaded, result);
  const file = (name: string) => downloads.find((d) => d.name === name)?.content;
  const id = loaded.part!.id;

  it('writes the netlist with all modes byte for byte as `netlist PART` prints it', async () => {
    expect(file(`${id}.cir`)).toBe(await netlistCli([folder]));
  });
  it('writes the main-mode netlist as `netlist PART --main-only` prints it', async () => {
    expect(file(`${id}-main.cir`)).toBe(await netlistCli([folder, '--main-only']));
  });
  it('writes the model Touchstone and the parameters as the other `netlist` formats print them', async () => {
    expect(file(`${id}-model.s1p`)).toBe(await netlistCli([folder, '--format', 'touchstone']));
    expect(file(`${id}-parameters.json`)).toBe(await netlistCli([folder, '--format', 'json']));
    expect(file(`${id}-parameters.csv`)).toBe(await netlistCli([folder, '--format', 'csv']));
  });
  it('copies the record and its sweeps unchanged under raw/', () => {
    expect(file('raw/part.yaml')).toBe(readFileSync(join(folder, 'part.yaml'), 'utf8'));
    for (const s of loaded.part!.samples.flatMap((x) => x.sweeps))
      expect(file(`raw/${s.file}`)).toBe(readFileSync(join(folder, s.file), 'utf8'));
  });

  const out = mkdtempSync(join(tmpdir(), 'motional-emit-'));
  afterAll(() => rmSync(out, { recursive: true, force: true }));
  it('writeCatalogueData writes the part data, compare data, index and downloads', async () => {
    const data = makePartData(loaded, result, [DEMO_CIRCUIT], { downloads });
    await writeCatalogueData(out, [{ data, downloads }]);
    expect(JSON.parse(readFileSync(join(out, 'parts', `${id}.json`), 'utf8'))).toEqual(
      JSON.parse(JSON.stringify(data)),
    );
    const index = JSON.parse(readFileSync(join(out, 'index.json'), 'utf8'));
    expect(index.map((e: { id: string }) => e.id)).toEqual([id]);
    expect(JSON.parse(readFileSync(join(out, 'compare', `${id}.json`), 'utf8')).id).toBe(id);
    expect(readFileSync(join(out, 'downloads', id, `${id}.cir`), 'utf8')).toBe(file(`${id}.cir`));
    expect(readdirSync(join(out, 'downloads', id, 'raw'))).toContain('part.yaml');
  });

  it('refuses a download name that leaves its folder', async () => {
    const data = makePartData(loaded, result, []);
    await expect(
      writeCatalogueData(out, [{ data, downloads: [{ name: '../evil.txt', content: 'x' }] }]),
    ).rejects.toThrow(/leaves its folder/);
  });
});
