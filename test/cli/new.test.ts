/**
 * `motional new` (README: Commands): folders of sweeps of known parts, written by the project's
 * synthesis in every fixture and format (test/cli/new-folders.ts), get a draft record that passes
 * `check` as written, names the right fixture and roles, suggests the added capacitance within
 * 5 % of the true one, and extracts to the part's parameters. Bad folders get a clear message and
 * nothing written.
 */
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../scripts/motional.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { AT_12M, AT_16M, FORK_32K, writeFolder, type FolderSpec } from './new-folders.ts';

const work = mkdtempSync(join(tmpdir(), 'motional-new-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { out: (t: string) => void out.push(t), err: (t: string) => void err.push(t) }, out, err };
}

const CASES: Array<{ name: string; spec: FolderSpec }> = [
  {
    name: 'reflection, 1-port Touchstone 1.x, open/short, parallel and series loads',
    spec: {
      model: AT_16M,
      fixture: 'reflection',
      format: { kind: 'touchstone', version: 1 },
      compensation: true,
      loads: [
        { capacitanceF: 10e-12, connection: 'parallel' },
        { capacitanceF: 8e-12, connection: 'series' },
      ],
    },
  },
  {
    name: 'reflection, 2-port Touchstone 2.0, no loads',
    spec: { model: AT_16M, fixture: 'reflection', ports: 2, format: { kind: 'touchstone', version: 2, format: 'MA' } },
  },
  {
    name: 'series-through, Touchstone 1.x, open/short, parallel load',
    spec: {
      model: AT_16M,
      fixture: 'series-thru',
      format: { kind: 'touchstone', version: 1, format: 'DB' },
      compensation: true,
      loads: [{ capacitanceF: 12e-12, connection: 'parallel' }],
    },
  },
  {
    name: 'shunt-through, Touchstone 2.0, series load',
    spec: {
      model: AT_16M,
      fixture: 'shunt-thru',
      format: { kind: 'touchstone', version: 2 },
      loads: [{ capacitanceF: 6e-12, connection: 'series' }],
    },
  },
  {
    name: 'impedance as Z, Touchstone 1.x, parallel load',
    spec: {
      model: AT_16M,
      fixture: 'impedance',
      parameter: 'Z',
      format: { kind: 'touchstone', version: 1 },
      loads: [{ capacitanceF: 10e-12, connection: 'parallel' }],
    },
  },
  {
    name: 'impedance as Y, Touchstone 2.0, open/short',
    spec: {
      model: AT_16M,
      fixture: 'impedance',
      parameter: 'Y',
      format: { kind: 'touchstone', version: 2 },
      compensation: true,
    },
  },
  {
    name: 'impedance CSV (; and |Z|/phase), open/short, parallel load',
    spec: {
      model: AT_16M,
      fixture: 'impedance',
      format: { kind: 'csv', form: 'magphase', delimiter: ';', freqUnit: 'MHz' },
      compensation: true,
      loads: [{ capacitanceF: 10e-12, connection: 'parallel' }],
    },
  },
  {
    name: 'tuning fork, impedance TSV, two parallel loads',
    spec: {
      model: FORK_32K,
      fixture: 'impedance',
      format: { kind: 'csv', delimiter: '\t', freqUnit: 'kHz' },
      loads: [
        { capacitanceF: 6e-12, connection: 'parallel' },
        { capacitanceF: 12e-12, connection: 'parallel' },
      ],
    },
  },
];

describe('motional new on folders of known parts', () => {
  CASES.forEach(({ name, spec }, k) => {
    it(
      name,
      async () => {
        const written = writeFolder(join(work, `P${k}`), spec);
        const run = capture();
        expect(await main(['new', written.folder], run.io), run.err.join('')).toBe(0);
        const text = readFileSync(join(written.folder, 'part.yaml'), 'utf8');

        // passes check as written, without warnings
        const check = capture();
        expect(await main(['check', written.folder], check.io), check.err.join('')).toBe(0);
        expect(check.err.join('')).toBe('');

        const loaded = await loadPart(written.folder);
        const part = loaded.part!;
        const sweeps = part.samples[0].sweeps;
        // every sweep of the part, in the right fixture and role
        expect(sweeps.map((s) => s.file).sort()).toEqual(Object.keys(written.files).sort());
        for (const s of sweeps) {
          expect(s.fixture, s.file).toBe(spec.fixture);
          const truth = written.files[s.file];
          expect(text).toContain(`file: "${s.file}"`);
          if (truth.role === 'loaded') {
            expect(s.addedConnection, s.file).toBe(truth.added!.connection);
            // the suggestion is within 5 % of the capacitor the sweep was synthesised with
            expect(Math.abs(s.addedCapacitanceF! / truth.added!.capacitanceF - 1), s.file).toBeLessThan(0.05);
          } else expect(s.addedCapacitanceF, s.file).toBeUndefined();
        }
        const roleLines = [...text.matchAll(/- file: "([^"]+)"[^\n]*\n\s+# inferred role: (\w+)/g)].map((m) => [
          m[1],
          m[2],
        ]);
        for (const [file, role] of roleLines) expect(role, file).toBe(written.files[file].role);
        expect(roleLines).toHaveLength(sweeps.length);
        // compensation found by name and flat response
        if (written.compensation) expect(part.samples[0].compensation).toMatchObject(written.compensation);
        else expect(part.samples[0].compensation).toBeUndefined();
        // nominal frequency from the main mode; kind from fs and Q
        expect(part.datasheet?.frequencyHz).toBe(spec.model.branches[0].fsHz);
        expect(part.kind).toBe(spec.model === FORK_32K ? 'quartz-tuning-fork' : 'quartz-at');
        // person-only values are placeholders
        for (const key of ['supplier', 'supplierPart', 'lot', 'drive', 'esrMax'])
          expect(text).toMatch(new RegExp(`# ${key}: `));

        // extracting the draft gives the part's parameters (bounds of README: Accuracy and uncertainty, widened for a draft)
        const result = extractPart(part, loaded.sweeps);
        const sample = result.samples[0];
        const mode = sample.modes[sample.mainMode.index];
        const b = spec.model.branches[0];
        expect(Math.abs(mode.fsHz / b.fsHz - 1)).toBeLessThan(0.1e-6);
        expect(Math.abs(mode.r1Ohm / b.r1Ohm - 1)).toBeLessThan(0.01);
        expect(Math.abs(mode.c1F / b.c1F - 1)).toBeLessThan(0.005);
        expect(Math.abs(sample.c0F / spec.model.c0F - 1)).toBeLessThan(0.01);
      },
      60_000,
    );
  });

  it('takes --id and --kind, and refuses a bad kind', async () => {
    const written = writeFolder(join(work, 'ids'), {
      model: AT_16M,
      fixture: 'reflection',
      format: { kind: 'touchstone', version: 1 },
      wide: false,
    });
    const bad = capture();
    expect(await main(['new', written.folder, '--kind', 'tuning'], bad.io)).toBe(2);
    expect(bad.err.join('')).toMatch(
      /--kind: expected one of quartz-at, quartz-tuning-fork, ceramic, saw, other, got "tuning"/,
    );
    const run = capture();
    expect(await main(['new', written.folder, '--id', 'XO-0099', '--kind', 'saw'], run.io)).toBe(0);
    const part = (await loadPart(written.folder)).part!;
    expect([part.id, part.kind]).toEqual(['XO-0099', 'saw']);
  });
});

describe('motional new on bad folders writes nothing', () => {
  const expectRefused = async (folder: string, message: RegExp, listed: RegExp[] = []) => {
    const before = existsSync(folder) ? readdirSync(folder).sort() : [];
    const run = capture();
    expect(await main(['new', folder], run.io)).toBe(1);
    const err = run.err.join('');
    expect(err).toMatch(message);
    for (const l of listed) expect(err).toMatch(l);
    expect(existsSync(folder) ? readdirSync(folder).sort() : []).toEqual(before);
  };

  it('an empty folder', async () => {
    const folder = join(work, 'empty');
    mkdirSync(folder);
    await expectRefused(folder, /empty-?\S*: the folder is empty|the folder is empty/);
  });

  it('a folder whose files cannot be read lists each with the reason', async () => {
    const folder = join(work, 'unreadable');
    mkdirSync(folder);
    writeFileSync(join(folder, 'a.s2p'), '# Hz S RI R 50\n1 2 3\n');
    writeFileSync(join(folder, 'b.csv'), 'just words\nand more words\n');
    writeFileSync(join(folder, 'notes.md'), 'bench notes\n');
    await expectRefused(folder, /no sweep file could be read; nothing written/, [
      /^a\.s2p: not used: a\.s2p:2: /m,
      /^b\.csv: not used: b\.csv:1: header has a single column/m,
      /^notes\.md: not used: not a sweep file/m,
    ]);
  });

  it('sweeps of two parts in one folder', async () => {
    const folder = join(work, 'mixed');
    writeFolder(folder, {
      model: AT_16M,
      fixture: 'reflection',
      format: { kind: 'touchstone', version: 1 },
      wide: false,
    });
    const other = writeFolder(join(work, 'mixed-other'), {
      model: AT_12M,
      fixture: 'reflection',
      format: { kind: 'touchstone', version: 1 },
      wide: false,
      seed: 40,
    });
    writeFileSync(join(folder, 'b1-narrow.s1p'), readFileSync(join(other.folder, 'a1-narrow.s1p')));
    await expectRefused(
      folder,
      /the sweeps look like more than one part: .*modes at 1[26] MHz and 1[26] MHz are not one part's.*put each part's sweeps in its own folder; nothing written/,
    );
  });

  it('a folder that already holds a part.yaml', async () => {
    const written = writeFolder(join(work, 'exists'), {
      model: AT_16M,
      fixture: 'reflection',
      format: { kind: 'touchstone', version: 1 },
      wide: false,
    });
    writeFileSync(join(written.folder, 'part.yaml'), 'id: MINE\n');
    await expectRefused(written.folder, /part\.yaml exists; a draft never replaces a record/);
    expect(readFileSync(join(written.folder, 'part.yaml'), 'utf8')).toBe('id: MINE\n');
  });
});
