import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadPart } from '../../src/pipeline/load-part.ts';
import type { FileSource, FileStat } from '../../src/pipeline/file-source.ts';
import { impedanceAt, type BvdModel } from '../../src/lib/models/bvd.ts';
import { formatIssue } from '../../src/lib/issues.ts';

// Synthetic reference resonator X1 (not a real part): L1 10 mH, C1 10 fF, R1 20 Ω, C0 3 pF.
const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };
const FS = X1.branches[0].fsHz;
const FREQS = Array.from({ length: 11 }, (_, i) => FS - 5e3 + i * 1e3);

type C = [number, number];
const div = ([a, b]: C, [c, d]: C): C => [(a * c + b * d) / (c * c + d * d), (b * c - a * d) / (c * c + d * d)];
const n17 = (x: number) => x.toPrecision(17);

/** Reflection: S11 = (Z − Z0)/(Z + Z0). */
function s1pReflection(z: (f: number) => C, freqs = FREQS, z0 = 50): string {
  const rows = freqs.map((f) => {
    const [r, x] = z(f);
    return [f, ...div([r - z0, x], [r + z0, x])].map(n17).join(' ');
  });
  return `# Hz S RI R ${z0}\n${rows.join('\n')}\n`;
}

/** Series-through (derived from the circuit): S21 = 2Z0/(Z + 2Z0), S11 = Z/(Z + 2Z0). */
function s2pSeries(z: (f: number) => C, freqs = FREQS): string {
  const rows = freqs.map((f) => {
    const [r, x] = z(f);
    const s11 = div([r, x], [r + 100, x]);
    const s21 = div([100, 0], [r + 100, x]);
    return [f, ...s11, ...s21, ...s21, ...s11].map(n17).join(' ');
  });
  return `# Hz S RI R 50\n${rows.join('\n')}\n`;
}

function csvZ(z: (f: number) => C, freqs = FREQS): string {
  return `f (Hz),r (ohm),x (ohm)\n${freqs.map((f) => [f, ...z(f)].map(n17).join(',')).join('\n')}\n`;
}

const x1 = (f: number): C => impedanceAt(X1, f);

function record(sweeps: string, extra = ''): string {
  return `id: XO-T\ntitle: t\nkind: quartz-at\n${extra}samples:\n  - id: A1\n${sweeps}`;
}

let root: string;
function makePart(name: string, files: Record<string, string>): string {
  const dir = join(root, name);
  mkdirSync(dir, { recursive: true });
  for (const [f, text] of Object.entries(files)) writeFileSync(join(dir, f), text);
  return dir;
}

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'motional-load-part-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('loadPart: reading sweeps', () => {
  it('reads a reflection .s1p into the impedance of the part (reflection round trip)', async () => {
    const dir = makePart('reflection', {
      'part.yaml': record('    sweeps:\n      - file: a1.s1p\n        fixture: reflection\n'),
      'a1.s1p': s1pReflection(x1),
    });
    const loaded = await loadPart(dir);
    expect(loaded.issues).toEqual([]);
    expect(loaded.yamlFile).toBe(join(dir, 'part.yaml'));
    expect(loaded.sweeps).toHaveLength(1);
    const s = loaded.sweeps[0];
    expect(s).toMatchObject({ sampleId: 'A1', index: 0, file: join(dir, 'a1.s1p') });
    expect(s.network?.ports).toBe(1);
    FREQS.forEach((f, i) => {
      const [r, x] = x1(f);
      expect(s.impedance!.zRe[i]).toBeCloseTo(r, 6);
      expect(s.impedance!.zIm[i]).toBeCloseTo(x, 6);
    });
  });

  it('reads the same part through the part.yaml path and through its folder', async () => {
    const dir = makePart('either', {
      'part.yaml': record('    sweeps:\n      - file: a1.csv\n        fixture: impedance\n'),
      'a1.csv': csvZ(x1),
    });
    const a = await loadPart(dir);
    const b = await loadPart(join(dir, 'part.yaml'));
    expect(a.issues).toEqual([]);
    expect(b.folder).toBe(dir);
    expect(Array.from(b.sweeps[0].impedance!.zRe)).toEqual(Array.from(a.sweeps[0].impedance!.zRe));
  });

  it('applies open/short and open/short/load compensation (check values computed with mpmath: 16 MHz, Rs 0.5 Ω, Ls 5 nH, Cp 1 pF, DUT 20 Ω)', async () => {
    const w = (f: number) => 2 * Math.PI * f;
    const zs = (f: number): C => [0.5, w(f) * 5e-9];
    const withFixture =
      (zdut: C) =>
      (f: number): C => {
        // Zm = Zs + 1/(jωCp + 1/Zdut)
        const y = div([1, 0], zdut);
        const [r, x] = div([1, 0], [y[0], y[1] + w(f) * 1e-12]);
        return [r + zs(f)[0], x + zs(f)[1]];
      };
    const open = (f: number): C => {
      const [r, x] = div([1, 0], [0, w(f) * 1e-12]);
      return [r + zs(f)[0], x + zs(f)[1]];
    };
    const freqs = [15.9e6, 16e6, 16.1e6];
    const dir = makePart('compensated', {
      'part.yaml': record(
        '    compensation:\n      open: open.csv\n      short: short.csv\n    sweeps:\n      - file: dut.csv\n        fixture: impedance\n',
      ),
      'dut.csv': csvZ(withFixture([20, 0]), freqs),
      'open.csv': csvZ(open, freqs),
      'short.csv': csvZ(zs, freqs),
    });
    // check value (mpmath): Zm = 20.499919 + j0.462443 Ω at 16 MHz
    expect(withFixture([20, 0])(16e6)[0]).toBeCloseTo(20.499919, 5);
    expect(withFixture([20, 0])(16e6)[1]).toBeCloseTo(0.462443, 5);
    const loaded = await loadPart(dir);
    expect(loaded.issues).toEqual([]);
    const z = loaded.sweeps[0].impedance!;
    // check value (mpmath): exact open/short → 20.000000 Ω
    for (let i = 0; i < 3; i++) {
      expect(z.zRe[i]).toBeCloseTo(20, 9);
      expect(z.zIm[i]).toBeCloseTo(0, 9);
    }

    // check value (mpmath): open/short/load with a 50 Ω load → 20.000000 Ω. The OSL formula is
    // linear in the stated load value, so stating 100 Ω for the 50 Ω standard must give 40 Ω:
    // that shows the load sweep and loadResistance are used, not only open and short.
    const osl = makePart('compensated-osl', {
      'part.yaml': record(
        '    compensation:\n      open: open.csv\n      short: short.csv\n      load: load.csv\n      loadResistance: 100 ohm\n    sweeps:\n      - file: dut.csv\n        fixture: impedance\n',
      ),
      'dut.csv': csvZ(withFixture([20, 0]), freqs),
      'open.csv': csvZ(open, freqs),
      'short.csv': csvZ(zs, freqs),
      'load.csv': csvZ(withFixture([50, 0]), freqs),
    });
    const loadedOsl = await loadPart(osl);
    expect(loadedOsl.issues).toEqual([]);
    expect(loadedOsl.sweeps[0].impedance!.zRe[1]).toBeCloseTo(40, 9);
    expect(loadedOsl.sweeps[0].impedance!.zIm[1]).toBeCloseTo(0, 9);
  });

  it('reads compensation files with the compensation fixture, once for several sweeps', async () => {
    const dir = makePart('comp-shared', {
      'part.yaml': record(
        '    compensation:\n      open: open.s2p\n      short: short.s2p\n    sweeps:\n      - file: a.s2p\n        fixture: series-thru\n      - file: b.s2p\n        fixture: series-thru\n',
      ),
      'a.s2p': s2pSeries(x1),
      'b.s2p': s2pSeries(x1),
      'open.s2p': s2pSeries((f) => [1e6, -1 / (2 * Math.PI * f * 0.2e-12)]),
      'short.s2p': '# Hz S RI R 50\n1 2 3\n',
    });
    const loaded = await loadPart(dir);
    // The broken short standard is reported once, not once per sweep that uses it.
    expect(loaded.issues.map(formatIssue)).toEqual([
      `${join(dir, 'short.s2p')}:2: expected 9 numbers per row (2-port RI), got 3`,
    ]);
    expect(loaded.sweeps.map((s) => s.impedance)).toEqual([undefined, undefined]);
  });

  it("warns when the record names a reference impedance other than the file's", async () => {
    const dir = makePart('z0', {
      'part.yaml': record(
        '    sweeps:\n      - file: a1.s1p\n        fixture: reflection\n        referenceImpedance: 75 ohm\n',
      ),
      'a1.s1p': s1pReflection(x1),
    });
    const loaded = await loadPart(dir);
    expect(loaded.issues).toEqual([
      {
        severity: 'warning',
        file: join(dir, 'part.yaml'),
        line: 9,
        col: 29,
        path: 'samples[0].sweeps[0].referenceImpedance',
        message: "referenceImpedance 75 ohm differs from the reference 50 ohm in a1.s1p; the file's value is used",
        code: 'reference-impedance',
      },
    ]);
    expect(loaded.part).toBeDefined();
  });
});

describe('loadPart: where problems are reported', () => {
  it('puts a missing file at the record field with its YAML line', async () => {
    const dir = makePart('missing', {
      'part.yaml': record('    sweeps:\n      - file: gone.s1p\n        fixture: reflection\n'),
    });
    const loaded = await loadPart(dir);
    expect(loaded.issues.map(formatIssue)).toEqual([
      `${join(dir, 'part.yaml')}:7: samples[0].sweeps[0].file: file "gone.s1p" not found in the part folder`,
    ]);
  });

  it("puts a content error at the sweep file's own line", async () => {
    const text = s1pReflection(x1).replace(
      /\n([^\n]*)\n/,
      (_m, row: string) => `\n${row.replace(/ \S+$/, ' 1.2.3')}\n`,
    );
    const dir = makePart('corrupt', {
      'part.yaml': record('    sweeps:\n      - file: a1.s1p\n        fixture: reflection\n'),
      'a1.s1p': text,
    });
    const loaded = await loadPart(dir);
    expect(loaded.issues).toHaveLength(1);
    expect(loaded.issues[0]).toMatchObject({ file: join(dir, 'a1.s1p'), line: 2 });
    expect(loaded.sweeps[0].impedance).toBeUndefined();
  });

  it('puts a fixture that does not fit the file at the fixture field, naming the sweep file', async () => {
    const dir = makePart('ports', {
      'part.yaml': record('    sweeps:\n      - file: a1.s1p\n        fixture: shunt-thru\n'),
      'a1.s1p': s1pReflection(x1),
    });
    const [issue] = (await loadPart(dir)).issues;
    expect(issue).toMatchObject({ file: join(dir, 'part.yaml'), line: 8, path: 'samples[0].sweeps[0].fixture' });
    expect(issue.message).toMatch(/^a1\.s1p: fixture 'shunt-thru' needs 2-port data/);
  });

  it('refuses a CSV sweep with a network fixture at the fixture field', async () => {
    const dir = makePart('csv-fixture', {
      'part.yaml': record('    sweeps:\n      - file: a1.csv\n        fixture: reflection\n'),
      'a1.csv': csvZ(x1),
    });
    const loaded = await loadPart(dir);
    expect(loaded.issues.map(formatIssue)).toEqual([
      `${join(dir, 'part.yaml')}:8: samples[0].sweeps[0].fixture: a1.csv is a CSV impedance sweep; expected fixture "impedance", got "reflection"`,
    ]);
    expect(loaded.sweeps[0].impedance).toBeUndefined();
  });

  it('still checks the sweeps of valid samples when the record has other errors', async () => {
    const dir = makePart('partial', {
      'part.yaml': record(
        '    sweeps:\n      - file: gone.s1p\n        fixture: reflection\n',
        'datasheet:\n  esrMax: 8 pF\n',
      ),
    });
    const loaded = await loadPart(dir);
    expect(loaded.part).toBeUndefined();
    expect(loaded.id).toBe('XO-T');
    expect(loaded.issues.map((i) => [i.line, i.path])).toEqual([
      [5, 'datasheet.esrMax'],
      [9, 'samples[0].sweeps[0].file'],
    ]);
  });

  it('reports a missing part.yaml and a missing path', async () => {
    const dir = makePart('no-yaml', { 'a.s1p': '' });
    expect((await loadPart(dir)).issues).toEqual([
      { severity: 'error', file: join(dir, 'part.yaml'), message: 'no part.yaml in this folder', code: 'missing' },
    ]);
    expect((await loadPart(join(root, 'nowhere.yaml'))).issues[0]).toMatchObject({ message: 'file not found' });
  });

  it('flags names in one record that differ only by case', async () => {
    const dir = makePart('case', {
      'part.yaml': record(
        '    sweeps:\n      - file: a1.s1p\n        fixture: reflection\n      - file: A1.s1p\n        fixture: reflection\n',
      ),
      'a1.s1p': s1pReflection(x1),
    });
    const issues = (await loadPart(dir)).issues;
    // Also reported, depending on the file system: A1.s1p missing (case-sensitive) or its case differing.
    expect(
      issues
        .filter((i) => i.code === 'path-case' && i.path === 'samples[0].sweeps[1].file')
        .map((i) => [i.line, i.message]),
    ).toContainEqual([
      9,
      '"A1.s1p" and "a1.s1p" differ only by letter case or Unicode normalisation; they are one file on some systems and two on others, rename one',
    ]);
  });
});

/** A FileSource over a map of file names to text, with no links. */
function memoryFs(files: Record<string, string>, sizes: Record<string, number> = {}): FileSource & { reads: string[] } {
  const reads: string[] = [];
  const isDir = (p: string) => Object.keys(files).some((f) => f.startsWith(`${p}/`));
  return {
    reads,
    async readText(p) {
      reads.push(p);
      if (!(p in files)) throw Object.assign(new Error('ENOENT'), { code: 'ENOENT' });
      return files[p];
    },
    async stat(p): Promise<FileStat | undefined> {
      if (p in files) return { kind: 'file', sizeBytes: sizes[p] ?? files[p].length, isSymlink: false };
      return isDir(p) ? { kind: 'directory', sizeBytes: 0, isSymlink: false } : undefined;
    },
    async list(dir) {
      return [
        ...new Set(
          Object.keys(files)
            .filter((f) => f.startsWith(`${dir}/`))
            .map((f) => f.slice(dir.length + 1).split('/')[0]),
        ),
      ];
    },
    async realPath(p) {
      if (p in files || isDir(p)) return `/mem/${p}`;
      throw new Error('ENOENT');
    },
  };
}

describe('loadPart on another FileSource', () => {
  it('loads a part from memory without touching the disk', async () => {
    const fs = memoryFs({
      'p/part.yaml': record('    sweeps:\n      - file: a1.csv\n        fixture: impedance\n'),
      'p/a1.csv': csvZ(x1),
    });
    const loaded = await loadPart('p', fs);
    expect(loaded.issues).toEqual([]);
    expect(loaded.sweeps[0].impedance?.freqHz.length).toBe(FREQS.length);
  });

  it('refuses an oversized sweep file from its size, without reading it', async () => {
    const fs = memoryFs(
      { 'p/part.yaml': record('    sweeps:\n      - file: big.csv\n        fixture: impedance\n'), 'p/big.csv': '' },
      { 'p/big.csv': 1e12 },
    );
    const loaded = await loadPart('p', fs);
    expect(loaded.issues.map(formatIssue)).toEqual([
      'p/big.csv:1: file is 1000000000000 bytes, over the limit of 67108864 bytes',
    ]);
    expect(fs.reads).toEqual(['p/part.yaml']);
  });

  it('turns a read failure into an issue instead of throwing', async () => {
    const fs = memoryFs({
      'p/part.yaml': record('    sweeps:\n      - file: a1.csv\n        fixture: impedance\n'),
      'p/a1.csv': '',
    });
    fs.readText = async (p) => {
      if (p.endsWith('.csv')) throw Object.assign(new Error('EIO'), { code: 'EIO' });
      return record('    sweeps:\n      - file: a1.csv\n        fixture: impedance\n');
    };
    const loaded = await loadPart('p', fs);
    expect(loaded.issues.map(formatIssue)).toEqual([
      'p/part.yaml:7: samples[0].sweeps[0].file: cannot read a1.csv (EIO)',
    ]);
  });
});
