/**
 * A sweep's `headerLine:` and `columns:` (README: The part record, "Sweep files"): validated like
 * every other field, located at their line, and used by the reader when the record is loaded.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePartYaml } from '../../../src/lib/io/part-yaml.ts';
import { formatIssue } from '../../../src/lib/issues.ts';
import { loadPart } from '../../../src/pipeline/load-part.ts';

const record = (sweep: string) => `id: XO-1
title: test
kind: quartz-at
samples:
  - id: A1
    sweeps:
${sweep}`;

const errors = (text: string) =>
  parsePartYaml(text, 'part.yaml')
    .issues.filter((i) => i.severity === 'error')
    .map(formatIssue);

describe('headerLine and columns in the record', () => {
  it('accept a line number and a map of column names or numbers', () => {
    const parsed = parsePartYaml(
      record(`      - file: a.csv
        fixture: impedance
        headerLine: 5
        columns:
          frequency: Freq(Hz)
          magnitude: "Trace1 |Z| (Ohm)"
          phase: 3
`),
      'part.yaml',
    );
    expect(parsed.issues).toEqual([]);
    expect(parsed.part!.samples[0].sweeps[0]).toMatchObject({
      headerLine: 5,
      columns: { frequency: 'Freq(Hz)', magnitude: 'Trace1 |Z| (Ohm)', phase: 3 },
    });
  });

  it('refuse bad values at their line', () => {
    expect(errors(record('      - file: a.csv\n        fixture: impedance\n        headerLine: 0\n'))).toEqual([
      'part.yaml:9: samples[0].sweeps[0].headerLine: expected a line number (1 = first line), got 0',
    ]);
    expect(errors(record('      - file: a.csv\n        fixture: impedance\n        headerLine: two\n'))[0]).toMatch(
      /^part\.yaml:9: samples\[0\]\.sweeps\[0\]\.headerLine: expected a number, got "two"$/,
    );
    expect(
      errors(record('      - file: a.csv\n        fixture: impedance\n        columns:\n          freq: 1\n')),
    ).toEqual([
      'part.yaml:10: samples[0].sweeps[0].columns.freq: unknown column "freq"; expected frequency, resistance, reactance, magnitude, phase',
    ]);
    expect(
      errors(record('      - file: a.csv\n        fixture: impedance\n        columns:\n          phase: 0\n')),
    ).toEqual([
      'part.yaml:10: samples[0].sweeps[0].columns.phase: expected a column name as written in the header, or its number (1 = first column), got 0',
    ]);
    expect(
      errors(
        record(
          '      - file: a.csv\n        fixture: impedance\n        columns:\n          resistance: 2\n          phase: 3\n',
        ),
      )[0],
    ).toMatch(
      /^part\.yaml:9: samples\[0\]\.sweeps\[0\]\.columns: expected resistance and reactance, or magnitude and phase, not both$/,
    );
    expect(errors(record('      - file: a.s1p\n        fixture: reflection\n        headerLine: 3\n'))).toEqual([
      'part.yaml:9: samples[0].sweeps[0].headerLine: headerLine applies to CSV/TSV files only, got "a.s1p"',
    ]);
  });

  it('reach the reader when the part is loaded', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'motional-columns-'));
    // two traces of |Z|: the names alone are ambiguous
    writeFileSync(
      join(dir, 'a.csv'),
      'Instrument,bench\nFreq(Hz),Trace1 |Z| (Ohm),Trace2 Phase (deg),Trace3 |Z| (Ohm)\n1000,10,0,99\n2000,20,90,99\n',
    );
    writeFileSync(join(dir, 'part.yaml'), record('      - file: a.csv\n        fixture: impedance\n'));
    const bad = await loadPart(dir);
    expect(bad.issues.map(formatIssue)).toEqual([
      `${join(dir, 'a.csv')}:2: columns 'Trace1 |Z| (Ohm)' and 'Trace3 |Z| (Ohm)' both read as the magnitude; say which one in the record: columns: { magnitude: "Trace1 |Z| (Ohm)" }`,
    ]);
    writeFileSync(
      join(dir, 'part.yaml'),
      record('      - file: a.csv\n        fixture: impedance\n        columns:\n          magnitude: 4\n'),
    );
    const good = await loadPart(dir);
    expect(good.issues).toEqual([]);
    // |Z| 99 at 0° and 90° (the reader turns whole quarter turns exactly)
    expect(Array.from(good.sweeps[0].impedance!.zRe)).toEqual([99, 0]);
    expect(Array.from(good.sweeps[0].impedance!.zIm)).toEqual([0, 99]);
  });
});
