/**
 * Bad sweep files: every one is refused with an InputError whose issues name the file and
 * the line, and say what was wrong. Fixtures: test/fixtures/bad-sweeps/ (hand-written,
 * see test/fixtures/README.md). Rules checked: Touchstone 1.1/2.0 specification (IBIS
 * Open Forum) and README: The part record ("Sweep files") for CSV; message wording is the
 * project's (DEVELOPERS.md: Reading an issue line).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { formatIssue, InputError } from '../../../src/lib/issues.ts';
import { parseTouchstone } from '../../../src/lib/io/touchstone.ts';
import { parseSweepCsv } from '../../../src/lib/io/sweep-csv.ts';
import type { SweepReadOptions } from '../../../src/lib/io/limits.ts';

const dir = new URL('../../fixtures/bad-sweeps/', import.meta.url);
const read = (name: string) => readFileSync(new URL(name, dir), 'latin1');

interface Case {
  file: string;
  line: number;
  message: RegExp;
  opts?: SweepReadOptions;
  /** Use this text instead of the fixture file (limit cases built from a good file). */
  text?: string;
}

const GOOD_S1P = '! fine file\n# Hz S RI R 50\n1000 0.1 0.2\n2000 0.1 0.2\n3000 0.1 0.2\n';

const cases: Case[] = [
  { file: 'row-short.s2p', line: 4, message: /^expected 9 numbers per row \(2-port RI\), got 7$/ },
  { file: 'row-long.s1p', line: 3, message: /^expected 3 numbers per row \(1-port RI\), got 4$/ },
  { file: 'nan-value.s1p', line: 3, message: /^value 'NaN' is not a finite number$/ },
  { file: 'inf-value.s1p', line: 3, message: /^value '1e400' is not a finite number$/ },
  { file: 'not-a-number.s1p', line: 2, message: /^expected a number, got '0,1'$/ },
  { file: 'negative-frequency.s1p', line: 2, message: /^negative frequency -1000 Hz$/ },
  {
    file: 'non-rising.s1p',
    line: 4,
    message: /^frequency 2000 Hz is not above the previous one \(2000 Hz\); frequencies must rise$/,
  },
  { file: 'no-data.s1p', line: 1, message: /^no network data/ },
  { file: 'binary.s2p', line: 3, message: /^binary data \(character U\+0000\), expected a text file$/ },
  {
    file: 'bad-option-line.s1p',
    line: 2,
    message: /^unknown option 'XY' \(expected Hz, kHz, MHz, GHz, S, Y, Z, RI, MA, DB or R <ohm>\)$/,
  },
  { file: 'h-parameters.s2p', line: 1, message: /^H-parameter data is not supported \(expected S, Z or Y\)$/ },
  {
    file: 'three-port.s3p',
    line: 1,
    message: /^3-port data is not supported \(at most 2 ports; the name ends in \.s3p\)$/,
  },
  {
    file: 'v2-three-port.txt',
    line: 3,
    message: /^3-port data is not supported \(at most 2 ports; \[Number of Ports\] is 3\)$/,
  },
  {
    file: 'v2-missing-number-of-frequencies.s1p',
    line: 4,
    message: /^missing \[Number of Frequencies\] before \[Network Data\]/,
  },
  {
    file: 'v2-count-mismatch.s1p',
    line: 4,
    message: /^\[Number of Frequencies\] is 3 but the network data has 2 frequency points$/,
  },
  {
    file: 'v2-missing-two-port-order.s2p',
    line: 5,
    message: /^missing \[Two-Port Data Order\] before \[Network Data\]/,
  },
  { file: 'v1-keyword.s1p', line: 2, message: /^keyword \[Number of Ports\] in a Touchstone 1 file/ },
  {
    file: 'oversize.s1p',
    text: GOOD_S1P,
    opts: { maxBytes: 40 },
    line: 1,
    message: /^file is 66 bytes, over the limit of 40 bytes$/,
  },
  {
    file: 'many-points.s1p',
    text: GOOD_S1P,
    opts: { maxPoints: 2 },
    line: 5,
    message: /^more than 2 frequency points$/,
  },
  {
    file: 'long-line.s1p',
    text: '# Hz S RI R 50\n1000 0.1 0.2\n2000 0.1 0.2 ! a longer comment here\n',
    opts: { maxLineChars: 30 },
    line: 3,
    message: /^line is 36 characters long, over the limit of 30$/,
  },
  {
    file: 'csv-missing-reactance.csv',
    line: 1,
    message:
      /^expected resistance and reactance columns \(r, x\) or magnitude and phase columns \(\|z\|, phase\); found only 'r \(ohm\)'; if a column holds the reactance, say which in the record: columns: \{ reactance: "notes" \}$/,
  },
  { file: 'csv-no-frequency.csv', line: 2, message: /^no frequency column \(f, freq or frequency\) in the header/ },
  {
    file: 'csv-wrong-unit.csv',
    line: 1,
    message: /^column 'frequency \(pF\)': expected a frequency unit \(Hz, kHz, MHz, GHz\), got pF$/,
  },
  {
    file: 'csv-wrong-impedance-unit.csv',
    line: 1,
    message: /^column '\|Z\| \(dB\)': expected an impedance unit \(ohm, mohm, kohm, Mohm\), got dB$/,
  },
  { file: 'csv-non-numeric.csv', line: 3, message: /^column 'r \(ohm\)': expected a number, got 'abc'$/ },
  { file: 'csv-nan.csv', line: 3, message: /^column 'r \(ohm\)': value 'NaN' is not a finite number$/ },
  { file: 'csv-field-count.csv', line: 3, message: /^expected 3 fields \(as in the header, line 1\), got 2$/ },
  { file: 'csv-negative-frequency.csv', line: 2, message: /^negative frequency -1000 Hz$/ },
  {
    file: 'csv-non-rising.csv',
    line: 4,
    message: /^frequency 1500 Hz is not above the previous one \(2000 Hz\); frequencies must rise$/,
  },
  { file: 'csv-no-header.csv', line: 1, message: /^expected a header row naming the columns .*got data '1000,20,3'$/ },
  { file: 'csv-empty.csv', line: 2, message: /^no data rows after the header$/ },
  { file: 'csv-binary.csv', line: 3, message: /^binary data/ },
  { file: 'csv-negative-magnitude.csv', line: 2, message: /^column '\|z\| \[ohm\]': negative magnitude -5$/ },
];

function parseAny(c: Case): unknown {
  const text = c.text ?? read(c.file);
  return c.file.endsWith('.csv') ? parseSweepCsv(text, c.file, c.opts) : parseTouchstone(text, c.file, c.opts);
}

describe('bad sweep files', () => {
  it('cover at least fifteen distinct problems', () => {
    expect(new Set(cases.map((c) => c.message.source)).size).toBeGreaterThanOrEqual(15);
  });

  for (const c of cases) {
    it(`${c.file} is refused with a message naming the file and line ${c.line}`, () => {
      let caught: unknown;
      try {
        parseAny(c);
      } catch (e) {
        caught = e;
      }
      expect(caught).toBeInstanceOf(InputError);
      const issues = (caught as InputError).issues;
      const hit = issues.find((i) => c.message.test(i.message));
      expect(hit, `issues were:\n${issues.map(formatIssue).join('\n')}`).toBeDefined();
      expect(hit!.file).toBe(c.file);
      expect(formatIssue(hit!).startsWith(`${c.file}:${c.line}: `)).toBe(true);
      expect((caught as Error).message).toContain(`${c.file}:${c.line}: `);
    });
  }

  it('reports every bad row of a file, not only the first', () => {
    const text = '# Hz S RI R 50\n1 0.1 0.2\n2 x 0.2\n3 0.1\n4 0.1 0.2 0.3\n5 0.1 0.2\n';
    try {
      parseTouchstone(text, 'several.s1p');
      expect.unreachable();
    } catch (e) {
      expect((e as InputError).issues.map(formatIssue)).toEqual([
        "several.s1p:3: expected a number, got 'x'",
        'several.s1p:4: expected 3 numbers per row (1-port RI), got 2',
        'several.s1p:5: expected 3 numbers per row (1-port RI), got 4',
      ]);
    }
  });

  it('stops after a hundred issues and says so', () => {
    const rows = Array.from({ length: 300 }, (_, i) => `${i + 1} bad 0`).join('\n');
    try {
      parseTouchstone(`# Hz S RI\n${rows}\n`, 'garbage.s1p');
      expect.unreachable();
    } catch (e) {
      const issues = (e as InputError).issues;
      expect(issues.length).toBe(101);
      expect(issues[100].message).toBe('too many problems; stopped after 100');
    }
  });
});
