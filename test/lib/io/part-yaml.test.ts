import { describe, expect, it } from 'vitest';
import { formatFieldPath, parsePartYaml } from '../../../src/lib/io/part-yaml.ts';
import { formatIssue, type Issue } from '../../../src/lib/issues.ts';

const FILE = 'parts/XO-0012/part.yaml';

/**
 * A full example record: the example of README: The part record with every optional field filled
 * in (invented supplier and part names).
 */
const FULL_EXAMPLE = `id: XO-0012
title: 12 MHz crystal, 3225 SMD
kind: quartz-at
package: "3225"
supplier: Example Components
supplierPart: EC-12M-3225
notes: |
  Second source for the sensor board clock.
datasheet:
  frequency: 12 MHz
  tolerance: 10 ppm
  stability: 20 ppm
  loadCapacitance: 8 pF
  esrMax: 80 ohm
  c0Max: 3 pF
  driveMax: 100 uW
  overtone: 1
  operatingRange: -40 to 85 C
samples:
  - id: A1
    lot: 2026-W14
    measured: 2026-05-02
    by: JK
    instrument: bench analyser
    instrumentMaxFrequency: 10 MHz
    temperature: 25 C
    compensation:
      open: open.s2p
      short: short.s2p
    sweeps:
      - file: a1-narrow.s2p
        fixture: series-thru
        referenceImpedance: 50 ohm
      - file: a1-narrow-cl10.s2p
        fixture: series-thru
        addedCapacitance: 10 pF
        addedConnection: parallel
      - file: a1-wide.csv
        fixture: impedance
        temperature: 85 C
        drive: 10 uW
`;

const MINIMAL = `id: XO-1
title: t
kind: quartz-at
samples:
  - id: A1
    sweeps:
      - file: a1.s1p
        fixture: reflection
`;

function errors(issues: Issue[]): Issue[] {
  return issues.filter((i) => i.severity === 'error');
}

function only(text: string): Issue {
  const r = parsePartYaml(text, FILE);
  expect(r.issues).toHaveLength(1);
  return r.issues[0];
}

describe('parsePartYaml: valid records', () => {
  it('reads the full example record into SI base units with no issue', () => {
    const r = parsePartYaml(FULL_EXAMPLE, FILE);
    expect(r.issues).toEqual([]);
    const part = r.part!;
    expect(part.id).toBe('XO-0012');
    expect(part.datasheet?.frequencyHz).toBe(12e6);
    expect(part.datasheet?.loadCapacitanceF).toBe(8e-12);
    expect(part.datasheet?.driveMaxW).toBe(1e-4);
    expect(part.datasheet?.operatingRangeC).toEqual({ min: -40, max: 85 });
    expect(part.samples[0].measured).toBe('2026-05-02');
    expect(part.samples[0].sweeps[1]).toMatchObject({
      file: 'a1-narrow-cl10.s2p',
      addedCapacitanceF: 1e-11,
      addedConnection: 'parallel',
    });
    expect(part.samples[0].sweeps[2].driveW).toBe(1e-5);
  });

  it('keeps text fields as written even when they look like numbers', () => {
    const r = parsePartYaml(
      MINIMAL.replace('id: XO-1', 'id: 0012')
        .replace('title: t', 'title: t\npackage: 3225')
        .replace('  - id: A1', '  - id: 007'),
      FILE,
    );
    expect(r.issues).toEqual([]);
    expect(r.part?.id).toBe('0012');
    expect(r.part?.package).toBe('3225');
    expect(r.part?.samples[0].id).toBe('007');
  });

  it('accepts a YAML timestamp for the measurement date', () => {
    const r = parsePartYaml(
      MINIMAL.replace('  - id: A1\n', '  - id: A1\n    measured: !!timestamp 2026-05-02\n'),
      FILE,
    );
    expect(r.issues).toEqual([]);
    expect(r.part?.samples[0].measured).toBe('2026-05-02');
  });

  it('accepts a byte-order mark and CRLF line ends', () => {
    const r = parsePartYaml(`\ufeff${MINIMAL.replace(/\n/g, '\r\n')}`, FILE);
    expect(r.issues).toEqual([]);
    expect(r.part?.samples[0].sweeps[0].file).toBe('a1.s1p');
  });

  it('locates any field of the record for later checks', () => {
    const r = parsePartYaml(FULL_EXAMPLE, FILE);
    expect(r.locate(['samples', 0, 'sweeps', 1, 'file'])).toEqual({ line: 34, col: 15 });
    expect(r.locate(['samples', 0, 'compensation', 'open'])).toEqual({ line: 28, col: 13 });
    expect(r.locate(['id'])).toEqual({ line: 1, col: 5 });
  });
});

describe('parsePartYaml: located errors', () => {
  it('locates a YAML syntax error by line', () => {
    const issue = only('id: XO-1\ntitle: "unclosed\nkind: quartz-at\n');
    expect(issue).toMatchObject({ severity: 'error', file: FILE, code: 'yaml' });
    expect(issue.message).toMatch(/^yaml syntax: missing closing "quote/);
    expect(issue.line).toBeGreaterThanOrEqual(2);
  });

  it('reports a duplicate key as a syntax error at its line', () => {
    const issue = only(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\nkind: saw'));
    expect(issue).toMatchObject({ line: 4, code: 'yaml' });
    expect(issue.message).toMatch(/unique/);
  });

  it('refuses several documents in one file', () => {
    const issue = only(`${MINIMAL}---\nid: XO-2\n`);
    expect(issue.message).toMatch(/multiple documents/);
    expect(issue.line).toBe(9);
  });

  it('puts a wrong unit at the value with the field path, and prints it compiler-style', () => {
    const issue = only(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\ndatasheet:\n  esrMax: 8 pF'));
    expect(issue).toMatchObject({ line: 5, col: 11, path: 'datasheet.esrMax' });
    expect(formatIssue(issue)).toBe(
      `${FILE}:5: datasheet.esrMax: expected a resistance such as "80 ohm", got "8 pF" (a capacitance)`,
    );
  });

  it('names a missing required field at its parent', () => {
    const issue = only(MINIMAL.replace('id: XO-1\n', ''));
    expect(issue).toMatchObject({ line: 1, path: 'id', message: 'missing required field "id"' });
    const sweeps = only(MINIMAL.replace(/    sweeps:\n.*\n.*\n/, '    lot: L1\n'));
    expect(sweeps).toMatchObject({ line: 5, path: 'samples[0].sweeps', message: 'missing required field "sweeps"' });
  });

  it('uses bracket indexes in paths deep in the record', () => {
    expect(formatFieldPath(['samples', 0, 'sweeps', 1, 'file'])).toBe('samples[0].sweeps[1].file');
    const issue = only(MINIMAL.replace('fixture: reflection', 'fixture: transmission'));
    expect(issue).toMatchObject({ line: 8, col: 18, path: 'samples[0].sweeps[0].fixture' });
    expect(issue.message).toBe('expected one of reflection, series-thru, shunt-thru, impedance, got "transmission"');
  });

  it('describes a value of the wrong type', () => {
    const issue = only(MINIMAL.replace('samples:\n', 'samples: 3\nx:\n').replace(/^x:\n[\s\S]*$/m, ''));
    expect(issue).toMatchObject({ line: 4, path: 'samples', message: 'expected a list, got 3' });
  });

  it('reports the bad value of a refinement (an even overtone)', () => {
    const issue = only(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\ndatasheet:\n  overtone: 2'));
    expect(issue.message).toBe('expected an odd overtone order (1, 3, 5, ...), got 2');
  });

  it('refuses an impossible date', () => {
    const issue = only(MINIMAL.replace('  - id: A1\n', '  - id: A1\n    measured: 2026-13-45\n'));
    expect(issue).toMatchObject({ line: 6, path: 'samples[0].measured' });
    expect(issue.message).toMatch(/expected an ISO date/);
  });

  it('collects every issue of a record, including cross-field rules zod skips on objects with other issues', () => {
    const text = `id: bad id
title: t
kind: quartz-bt
datasheet:
  esrMax: 80
samples:
  - id: A1
    compensation:
      open: open.s1p
    sweeps:
      - file: a1.s1p
        fixture: transmission
        addedConnection: parallel
  - id: A1
    sweeps: []
`;
    const r = parsePartYaml(text, FILE);
    expect(r.part).toBeUndefined();
    expect(r.issues.map((i) => [i.line, i.path])).toEqual([
      [1, 'id'],
      [3, 'kind'],
      [5, 'datasheet.esrMax'],
      [8, 'samples[0].compensation.short'],
      [12, 'samples[0].sweeps[0].fixture'],
      [13, 'samples[0].sweeps[0].addedConnection'],
      [14, 'samples[1].id'],
      [15, 'samples[1].sweeps'],
    ]);
    expect(r.issues.find((i) => i.path === 'samples[1].id')?.message).toBe(
      'duplicate sample id "A1" (also samples[0])',
    );
    expect(r.issues.find((i) => i.path === 'samples[0].sweeps[0].addedConnection')?.message).toBe(
      'addedConnection needs addedCapacitance',
    );
  });

  it('reports a cross-field rule once when zod also reports it', () => {
    const r = parsePartYaml(
      MINIMAL.replace('        fixture: reflection', '        fixture: reflection\n        addedConnection: series'),
      FILE,
    );
    expect(r.issues.map((i) => i.message)).toEqual(['addedConnection needs addedCapacitance']);
  });
});

describe('parsePartYaml: unknown keys', () => {
  it('warns about an unknown key with a did-you-mean hint, and still returns the part', () => {
    const r = parsePartYaml(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\nsuplier: Example Components'), FILE);
    expect(r.part?.id).toBe('XO-1');
    expect(r.issues).toEqual([
      {
        severity: 'warning',
        file: FILE,
        line: 4,
        col: 1,
        path: 'suplier',
        message: 'unknown field "suplier" is ignored; did you mean "supplier"?',
        code: 'unknown-key',
      },
    ]);
  });

  it('matches spellings that differ by case or separators', () => {
    const r = parsePartYaml(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\ndatasheet:\n  esr_max: 80 ohm'), FILE);
    expect(r.issues[0].message).toBe('unknown field "esr_max" is ignored; did you mean "esrMax"?');
  });

  it('says where a known key belongs when it sits at the wrong level', () => {
    const r = parsePartYaml(MINIMAL.replace('kind: quartz-at', 'kind: quartz-at\nesrMax: 80 ohm'), FILE);
    expect(r.issues[0]).toMatchObject({
      severity: 'warning',
      path: 'esrMax',
      message: 'unknown field "esrMax" is ignored; it belongs in datasheet',
    });
  });

  it('treats a key named __proto__ as an ordinary unknown key', () => {
    const r = parsePartYaml(`${MINIMAL}__proto__: { polluted: true }\n`, FILE);
    expect(r.issues.map((i) => i.path)).toEqual(['__proto__']);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(r.part).toBeDefined();
  });
});

describe('parsePartYaml: hostile and degenerate files', () => {
  it('refuses YAML aliases with one issue and never expands them (billion laughs)', () => {
    const levels = 'bcdefghij'
      .split('')
      .map((c, i) => `${c}: &${c} [${Array(10).fill(`*${'abcdefghij'[i]}`).join(',')}]`);
    const text = `${MINIMAL}a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol","lol"]\n${levels.join('\n')}\n`;
    const t0 = performance.now();
    const r = parsePartYaml(text, FILE);
    expect(performance.now() - t0).toBeLessThan(1000);
    expect(errors(r.issues)).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ line: 10, col: 8, code: 'yaml-alias' });
    expect(r.issues[0].message).toBe(
      'yaml alias *a not allowed in a part record; write the value out (89 more aliases in the file)',
    );
  });

  it('refuses deep flow nesting before parsing', () => {
    const issue = only(`${MINIMAL}notes: ${'['.repeat(10_000)}${']'.repeat(10_000)}\n`);
    expect(issue).toMatchObject({ line: 9, code: 'depth', message: 'nesting deeper than 20 levels' });
  });

  it('refuses deep block nesting', () => {
    const nested = Array.from({ length: 25 }, (_, i) => `${' '.repeat(2 * i)}k:`).join('\n');
    const r = parsePartYaml(`${MINIMAL}${nested} 1\n`, FILE);
    expect(errors(r.issues)).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ code: 'depth', message: 'nesting deeper than 20 levels' });
  });

  it('refuses a file over the size limit without parsing it', () => {
    const big = parsePartYaml(`${MINIMAL}# ${'x'.repeat(300)}\n`, FILE, { maxBytes: 256 });
    expect(big.issues).toEqual([
      {
        severity: 'error',
        file: FILE,
        line: undefined,
        message: `file is ${MINIMAL.length + 303} bytes, over the limit of 256 bytes for a part record`,
        code: 'size',
      },
    ]);
  });

  it('refuses very long lines, naming the line', () => {
    const issue = only(`${MINIMAL}notes: ${'x'.repeat(20_000)}\n`);
    expect(issue).toMatchObject({
      line: 9,
      code: 'long-line',
      message: 'line is 20007 characters long, over the limit of 10000',
    });
  });

  it('refuses binary content, naming the line', () => {
    const issue = only(`${MINIMAL}notes: a\u0000b\n`);
    expect(issue).toMatchObject({ line: 9, col: 9, code: 'binary' });
    expect(issue.message).toBe('binary data (character U+0000), expected a YAML text file');
  });

  it('refuses text that is not UTF-8', () => {
    const issue = only(`${MINIMAL}notes: caf\ufffd\n`);
    expect(issue).toMatchObject({
      line: 9,
      code: 'binary',
      message: 'bytes that are not UTF-8 (decoded as U+FFFD), expected a UTF-8 text file',
    });
  });

  it('refuses an empty file and a file of comments only', () => {
    for (const text of ['', '\n\n', '# nothing here\n', '---\n']) {
      expect(only(text)).toMatchObject({
        code: 'empty',
        message: 'empty file, expected a part record (id, title, kind, samples)',
      });
    }
  });

  it('refuses a top level that is not a mapping', () => {
    expect(only('- id: XO-1\n- title: t\n').message).toBe(
      'expected a mapping of fields (id, title, kind, samples) at the top level, got a list',
    );
    expect(only('just text\n').message).toBe(
      'expected a mapping of fields (id, title, kind, samples) at the top level, got "just text"',
    );
  });

  it('warns about an unknown YAML tag', () => {
    const r = parsePartYaml(MINIMAL.replace('title: t', 'title: !custom t'), FILE);
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ severity: 'warning', line: 2, code: 'yaml' });
  });
});
