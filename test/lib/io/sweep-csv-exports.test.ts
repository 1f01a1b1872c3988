/**
 * CSV/TSV exports in the shapes instruments write them (README: The part record, "Sweep files"):
 * preambles of 0–20 lines, units in the header or in a second header row, trace-numbered column
 * names, `;` with decimal commas, tab-separated files, a trailing summary line. Each is read to the
 * values it was written from, or refused with a located message that says which mapping to add
 * to the record (`columns:`, `headerLine:`), and the mapping then reads it.
 */
import { describe, expect, it } from 'vitest';
import { readSweepCsv, parseSweepCsv, type SweepCsvOptions } from '../../../src/lib/io/sweep-csv.ts';
import { InputError, formatIssue } from '../../../src/lib/issues.ts';

/** The values every export below is written from: frequency Hz, |Z| ohm, phase deg (plain test data). */
const ROWS = [
  { fHz: 15_999_000, mag: 812.5, deg: -89.25 },
  { fHz: 16_000_000, mag: 20.125, deg: 3.5 },
  { fHz: 16_001_000, mag: 644.75, deg: 88.5 },
  { fHz: 16_002_000, mag: 1500.5, deg: 89.75 },
];
const rad = (deg: number) => (deg * Math.PI) / 180;

function expectRows(text: string, name: string, opts: SweepCsvOptions = {}) {
  const read = readSweepCsv(text, name, opts);
  const s = read.sweep;
  expect(Array.from(s.freqHz)).toEqual(ROWS.map((r) => r.fHz));
  ROWS.forEach((r, i) => {
    // Z = |Z|·e^{jφ}; relative error of the polar conversion in double precision (common practice)
    expect(Math.abs(s.zRe[i] - r.mag * Math.cos(rad(r.deg)))).toBeLessThan(1e-12 * r.mag);
    expect(Math.abs(s.zIm[i] - r.mag * Math.sin(rad(r.deg)))).toBeLessThan(1e-12 * r.mag);
  });
  return read;
}

function refused(text: string, name: string, opts: SweepCsvOptions = {}): string[] {
  try {
    parseSweepCsv(text, name, opts);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).issues.map(formatIssue);
  }
  throw new Error(`${name} was read, expected a refusal`);
}

const PREAMBLE_SHAPES = [
  'Bench analyser export',
  'Date: 2026-05-02 10:14:03',
  'Start,15999000',
  'Stop,16002000',
  'Points,4,IFBW 100 Hz',
  'Start;Stop;Points',
  '15999000;16002000;4',
  'Calibration: open/short/load, user set 2',
  'sep=,',
  'Operator,JK',
];

function preamble(lines: number): string[] {
  return Array.from({ length: lines }, (_, i) => PREAMBLE_SHAPES[i % PREAMBLE_SHAPES.length]);
}

describe('preambles before the header', () => {
  for (const lines of [0, 1, 2, 4, 7, 10, 15, 20]) {
    it(`skips ${lines} preamble lines and says which line it took as the header`, () => {
      const body = [
        'Freq(Hz);Trace1 |Z| (Ohm);Trace2 Phase (deg)',
        ...ROWS.map((r) => `${r.fHz};${String(r.mag).replace('.', ',')};${String(r.deg).replace('.', ',')}`),
      ];
      const read = expectRows([...preamble(lines), ...body].join('\r\n'), 'pre.csv');
      expect(read.headerLine).toBe(lines + 1);
      expect(read.preambleLines).toBe(lines);
      expect(read.columns.magnitude).toEqual({ name: 'Trace1 |Z| (Ohm)', number: 2, unit: 'Ohm' });
    });
  }

  it('blank and comment lines among the preamble do not count as preamble lines', () => {
    const text = [
      '# exported',
      '',
      'Instrument,bench analyser',
      '! note',
      'frequency (Hz),|Z| (ohm),phase (deg)',
      ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`),
    ].join('\n');
    const read = expectRows(text, 'c.csv');
    expect([read.headerLine, read.preambleLines]).toEqual([5, 1]);
  });

  it('a preamble longer than the search refuses with the line to give as headerLine, and headerLine then reads it', () => {
    const lines = [
      ...Array.from({ length: 40 }, (_, i) => `Setting ${i},value ${i}`),
      'f (Hz),|z| (ohm),phase (deg)',
      ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`),
    ];
    const text = lines.join('\n');
    const issues = refused(text, 'long.csv');
    expect(issues).toEqual([
      expect.stringMatching(
        /^long\.csv:1: no header row followed by rows of numbers in the first 31 lines .*say which line in the record: headerLine: LINE$/,
      ),
    ]);
    expect(expectRows(text, 'long.csv', { headerLine: 41 }).headerLine).toBe(41);
  });

  it('headerLine may point at a commented header', () => {
    const text = ['! Freq [Hz]\t|Z| [Ohm]\tPhase [deg]', ...ROWS.map((r) => `${r.fHz}\t${r.mag}\t${r.deg}`)].join('\n');
    expect(refused(text, 'c.tsv')[0]).toMatch(/^c\.tsv:2: expected a header row naming the columns .*got data/);
    expectRows(text, 'c.tsv', { headerLine: 1 });
  });

  it('headerLine on a blank line or a data row is refused at that line', () => {
    const text = ['', 'f,|z|,phase', ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`)].join('\n');
    expect(refused(text, 'h.csv', { headerLine: 1 })).toEqual([
      'h.csv:1: headerLine 1 in the record: that line is blank, a comment or past the end of the file',
    ]);
    expect(refused(text, 'h.csv', { headerLine: 3 })[0]).toMatch(/^h\.csv:3: expected a header row naming the columns/);
  });
});

describe('units', () => {
  it('reads units in any bracket style, after a slash or as a trailing word', () => {
    for (const [f, m, p] of [
      ['Frequency [MHz]', '|Z| [Ω]', 'Phase [°]'],
      ['Frequency {MHz}', 'Impedance {Ohm}', 'Phase {deg}'],
      ['Frequency <MHz>', 'Z Magnitude <ohm>', 'Z Phase <deg>'],
      ['f / MHz', '|Z| / Ω', 'θ / deg'],
      ['Frequency MHz', 'Impedance Ohm', 'Phase deg'],
    ]) {
      const text = [[f, m, p].join(','), ...ROWS.map((r) => `${r.fHz / 1e6},${r.mag},${r.deg}`)].join('\n');
      expectRows(text, 'u.csv');
    }
  });

  it('reads units from a second header row', () => {
    const text = ['Frequency\t|Z|\tPhase', 'Hz\tOhm\tdeg', ...ROWS.map((r) => `${r.fHz}\t${r.mag}\t${r.deg}`)].join(
      '\n',
    );
    const read = expectRows(text, 'two-rows.tsv');
    expect(read.unitsLine).toBe(2);
    const khz = [
      'Frequency;Z;Theta',
      '[kHz];[kOhm];[rad]',
      ...ROWS.map(
        (r) =>
          `${String(r.fHz / 1e3).replace('.', ',')};${String(r.mag / 1e3).replace('.', ',')};${String(rad(r.deg)).replace('.', ',')}`,
      ),
    ].join('\n');
    expectRows(khz, 'two-rows.csv');
  });

  it('a wrong unit in the units row is refused at that row', () => {
    const text = ['Frequency,|Z|,Phase', 'Hz,dB,deg', '1,2,3'].join('\n');
    expect(refused(text, 'w.csv')).toEqual([
      "w.csv:2: column '|Z|': expected an impedance unit (ohm, mohm, kohm, Mohm), got dB",
    ]);
  });
});

describe('column names as instruments write them', () => {
  it('reads the trace-numbered header that the exact-word reader refused', () => {
    const text = [
      'Freq(Hz);Trace1 |Z| (Ohm);Trace2 Phase (deg)',
      ...ROWS.map((r) => `${r.fHz};${r.mag};${r.deg}`),
    ].join('\n');
    const read = expectRows(text, 't.csv');
    expect(read.columns.frequency).toEqual({ name: 'Freq(Hz)', number: 1, unit: 'Hz' });
    expect(read.columns.phase).toEqual({ name: 'Trace2 Phase (deg)', number: 3, unit: 'deg' });
  });

  it('reads real and imaginary parts under instrument names, ignoring C, D, Q and admittance columns', () => {
    const rx = ROWS.map((r) => [r.fHz, r.mag * Math.cos(rad(r.deg)), r.mag * Math.sin(rad(r.deg))]);
    for (const [f, re, im] of [
      ['Freq [Hz]', 'Re(Z) [Ohm]', 'Im(Z) [Ohm]'],
      ['Frequency (Hz)', 'Z Real (Ohm)', 'Z Imag (Ohm)'],
      ['Tr1 Frequency', 'Tr1 Rs', 'Tr1 Xs'],
      ['F', 'Resistance', 'Reactance'],
    ]) {
      const text = [
        [f, 'Cs (F)', re, 'D', im, 'Q', '|Y| (S)', 'S11 Log Mag (dB)'].join(','),
        ...rx.map(([a, b, c]) => `${a},1e-12,${b},0.1,${c},10,0.01,-3`),
      ].join('\n');
      expectRows(text, 'rx.csv');
    }
  });

  it('reads a semicolon export with decimal commas and a tab-separated export', () => {
    const semi = [
      '"Frequenz (Hz)";"Betrag (Ohm)";"Phase (°)"',
      ...ROWS.map((r) => `${r.fHz};${String(r.mag).replace('.', ',')};${String(r.deg).replace('.', ',')}`),
    ].join('\n');
    expect(expectRows(semi, 'eu.csv').delimiter).toBe(';');
    const tab = [
      'Frequency [Hz]\tImpedance Magnitude [Ohm]\tImpedance Phase [deg]',
      ...ROWS.map((r) => `${r.fHz}\t${r.mag}\t${r.deg}`),
    ].join('\n');
    expect(expectRows(tab, 'a.tsv').delimiter).toBe('\t');
  });

  it('two traces of one quantity are refused with the mapping to add, which then reads the file', () => {
    const text = [
      'Freq(Hz),Trace1 |Z| (Ohm),Trace2 Phase (deg),Trace3 |Z| (Ohm)',
      ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg},999`),
    ].join('\n');
    expect(refused(text, 'two.csv')).toEqual([
      `two.csv:1: columns 'Trace1 |Z| (Ohm)' and 'Trace3 |Z| (Ohm)' both read as the magnitude; say which one in the record: columns: { magnitude: "Trace1 |Z| (Ohm)" }`,
    ]);
    expectRows(text, 'two.csv', { columns: { magnitude: 'Trace1 |Z| (Ohm)' } });
    expectRows(text, 'two.csv', { columns: { magnitude: 2 } });
    // names compare without case or extra spaces, and without the unit
    expectRows(text, 'two.csv', { columns: { magnitude: 'trace1  |z|' } });
  });

  it('columns named by letters only are refused with the mapping to add, which then reads the file', () => {
    const text = ['A,B,C', ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`)].join('\n');
    const issues = refused(text, 'abc.csv');
    expect(issues[0]).toBe(
      `abc.csv:1: no frequency column (f, freq or frequency) in the header 'A,B,C'; if a column holds the frequency, say which in the record: columns: { frequency: "A" }`,
    );
    expect(issues[1]).toMatch(
      /^abc\.csv:1: expected resistance and reactance columns .*columns: \{ magnitude: "A" \}$/,
    );
    expectRows(text, 'abc.csv', { columns: { frequency: 'A', magnitude: 'B', phase: 'C' } });
    expectRows(text, 'abc.csv', { columns: { frequency: 1, magnitude: 2, phase: 3 } });
  });

  it('a name that fits two roles is named in the message', () => {
    const text = ['f (Hz),Z,Z phase mag', '1,2,3', '2,2,3'].join('\n');
    expect(refused(text, 'amb.csv')[0]).toMatch(
      /column 'Z phase mag' could be the magnitude or the phase; if a column holds the phase, say which in the record: columns: \{ phase: "Z phase mag" \}$/,
    );
  });

  it('a mapping that names no column of the header is refused, naming the columns', () => {
    const text = ['f,|z|,phase', '1,2,3'].join('\n');
    expect(refused(text, 'm.csv', { columns: { magnitude: 'Trace9' } })).toEqual([
      `m.csv:1: columns.magnitude in the record: no column named 'Trace9' in the header; its columns are 'f', '|z|', 'phase'`,
    ]);
    expect(refused(text, 'm.csv', { columns: { phase: 4 } })).toEqual([
      'm.csv:1: columns.phase in the record: column 4 does not exist; the header has 3 columns',
    ]);
    expect(refused(text, 'm.csv', { columns: { magnitude: 2, phase: '|z|' } })).toEqual([
      `m.csv:1: columns.magnitude and columns.phase in the record name the same column '|z|'`,
    ]);
  });
});

describe('trailing summary lines', () => {
  it('ends the data at summary lines after the last row', () => {
    const text = [
      'frequency (Hz),|Z| (ohm),phase (deg)',
      ...ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`),
      'Average,744.47,22.6',
      'END',
    ].join('\n');
    const read = expectRows(`${text}\n`, 's.csv');
    expect(read.summaryLines).toEqual([6, 7]);
  });

  it('the same line between data rows is an error at its line', () => {
    const rows = ROWS.map((r) => `${r.fHz},${r.mag},${r.deg}`);
    const text = ['frequency (Hz),|Z| (ohm),phase (deg)', rows[0], rows[1], 'Average,1,2', rows[2]].join('\n');
    expect(refused(text, 's.csv')).toEqual(["s.csv:4: column 'frequency (Hz)': expected a number, got 'Average'"]);
  });

  it('a file of a header and summary lines only is refused at the summary line', () => {
    expect(refused('f,r,x\nTotal,0,0\n', 'e.csv')).toEqual(["e.csv:2: column 'f': expected a number, got 'Total'"]);
  });
});
