import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../scripts/motional.ts';

// The expected behaviour is in README: Commands: `check PATH...` prints each problem as
// `FILE:LINE: message` on stderr; exit 0 all valid, 1 any problem (2 for a usage error).

const BAD = 'test/fixtures/bad-records';
const GOOD = 'test/fixtures/good-records';

async function runInProcess(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

function runProcess(args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(join('node_modules', '.bin', 'tsx'), ['scripts/motional.ts', ...args], {
    encoding: 'utf8',
    timeout: 60_000,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/**
 * Every bad record, with the file and line its problem must be reported at (a number, or a
 * text whose first line in that file is meant) and what the message must say.
 */
const CASES: Record<string, { file: string; line: number | string; message: RegExp }> = {
  'yaml-syntax-error': { file: 'part.yaml', line: 5, message: /yaml syntax: flow map in block collection/ },
  'missing-id': { file: 'part.yaml', line: 1, message: /id: missing required field "id"/ },
  'bad-id-chars': {
    file: 'part.yaml',
    line: 'id: XO 12/3',
    message: /id: expected a part id of letters, digits, '\.', '_' or '-', got "XO 12\/3"/,
  },
  'missing-samples': { file: 'part.yaml', line: 1, message: /samples: missing required field "samples"/ },
  'empty-sweeps': {
    file: 'part.yaml',
    line: 'sweeps: []',
    message: /samples\[0\]\.sweeps: expected at least one sweep, got an empty list/,
  },
  'unknown-kind': { file: 'part.yaml', line: 'kind:', message: /kind: expected one of quartz-at, .*got "quartz-bt"/ },
  'unknown-fixture': {
    file: 'part.yaml',
    line: 'fixture:',
    message: /samples\[0\]\.sweeps\[0\]\.fixture: expected one of reflection, .*got "transmission"/,
  },
  'wrong-unit': {
    file: 'part.yaml',
    line: 'esrMax:',
    message: /datasheet\.esrMax: expected a resistance such as "80 ohm", got "8 pF" \(a capacitance\)/,
  },
  'bare-number': {
    file: 'part.yaml',
    line: 'frequency:',
    message: /datasheet\.frequency: expected a frequency such as "12 MHz", got "16000000" with no unit/,
  },
  'negative-capacitance': {
    file: 'part.yaml',
    line: 'c0Max:',
    message: /datasheet\.c0Max: expected a positive value, got "-3 pF"/,
  },
  'bad-date': {
    file: 'part.yaml',
    line: 'measured:',
    message: /samples\[0\]\.measured: expected an ISO date such as 2026-05-02, got "2026-13-45"/,
  },
  'even-overtone': {
    file: 'part.yaml',
    line: 'overtone:',
    message: /datasheet\.overtone: expected an odd overtone order \(1, 3, 5, \.\.\.\), got 2/,
  },
  'duplicate-sample-id': {
    file: 'part.yaml',
    line: 9,
    message: /samples\[1\]\.id: duplicate sample id "A1" \(also samples\[0\]\)/,
  },
  'duplicate-part-id': {
    file: 'second/part.yaml',
    line: 1,
    message:
      /id: duplicate part id "XO-SAME" \(also in test\/fixtures\/bad-records\/duplicate-part-id\/first\/part\.yaml\)/,
  },
  'missing-sweep-file': {
    file: 'part.yaml',
    line: 'file:',
    message: /samples\[0\]\.sweeps\[0\]\.file: file "a1\.s1p" not found in the part folder/,
  },
  'absolute-path': {
    file: 'part.yaml',
    line: 'file:',
    message: /samples\[0\]\.sweeps\[0\]\.file: absolute path "\/tmp\/a1\.s1p" not allowed/,
  },
  'dotdot-path': { file: 'part.yaml', line: 'file:', message: /'\.\.' in "\.\.\/missing-id\/a1\.s1p" not allowed/ },
  'symlink-escape': {
    file: 'part.yaml',
    line: 'file:',
    message: /samples\[0\]\.sweeps\[0\]\.file: "link\.s1p" is a link that leads outside the part folder/,
  },
  'bad-extension': {
    file: 'part.yaml',
    line: 'file:',
    message: /samples\[0\]\.sweeps\[0\]\.file: expected a sweep file ending in \.s1p, .*got "a1\.s3p"/,
  },
  'csv-series-thru': {
    file: 'part.yaml',
    line: 'fixture:',
    message: /fixture: a1\.csv is a CSV impedance sweep; expected fixture "impedance", got "series-thru"/,
  },
  'one-port-series-thru': {
    file: 'part.yaml',
    line: 'fixture:',
    message: /samples\[0\]\.sweeps\[0\]\.fixture: a1\.s1p: fixture 'series-thru' needs 2-port data/,
  },
  'corrupt-touchstone-row': { file: 'a1.s1p', line: 7, message: /expected 3 numbers per row \(1-port RI\), got 2/ },
  'binary-sweep': { file: 'a1.s1p', line: -1, message: /binary data \(character U\+0000\), expected a text file/ },
  'added-connection-without-capacitance': {
    file: 'part.yaml',
    line: 'addedConnection:',
    message: /samples\[0\]\.sweeps\[0\]\.addedConnection: addedConnection needs addedCapacitance/,
  },
  'open-without-short': {
    file: 'part.yaml',
    line: 'compensation:',
    message: /samples\[0\]\.compensation\.short: open and short compensation sweeps go together/,
  },
  'yaml-alias-bomb': {
    file: 'part.yaml',
    line: 'b: &b',
    message: /b\[0\]: yaml alias \*a not allowed in a part record; write the value out/,
  },
  'deeply-nested': { file: 'part.yaml', line: 'notes:', message: /nesting deeper than 20 levels/ },
  'non-mapping-top-level': {
    file: 'part.yaml',
    line: 1,
    message: /expected a mapping of fields \(id, title, kind, samples\) at the top level, got a list/,
  },
  'empty-file': { file: 'part.yaml', line: 1, message: /empty file, expected a part record/ },
  'backslash-path': { file: 'part.yaml', line: 'file:', message: /file name "data\\\\a1\.s1p" contains a backslash/ },
  'case-colliding-names': {
    file: 'part.yaml',
    line: 'file: A1.s1p',
    message: /samples\[0\]\.sweeps\[1\]\.file: "A1\.s1p" and "a1\.s1p" differ only by letter case/,
  },
  'bidi-file-name': {
    file: 'part.yaml',
    line: 'file:',
    message: /contains invisible or direction-changing character U\+202E/,
  },
  'sweep-is-folder': { file: 'part.yaml', line: 'file:', message: /"sub\.s1p" is a folder, expected a file/ },
  'compensation-too-narrow': {
    file: 'part.yaml',
    line: 'compensation:',
    message:
      /samples\[0\]\.compensation: sweep .*a1\.s1p spans .* but compensation .*open\.s1p spans .*; the compensation must cover the sweep/,
  },
  'csv-no-frequency-column': { file: 'a1.csv', line: 1, message: /no frequency column \(f, freq or frequency\)/ },
  'long-line': { file: 'part.yaml', line: 'notes:', message: /line is 20007 characters long, over the limit of 10000/ },
};

/** The expected line: a number, the first line containing a text, or (-1) the line of the first NUL byte. */
function expectedLine(caseDir: string, file: string, line: number | string): number {
  if (typeof line === 'number' && line > 0) return line;
  const bytes = readFileSync(join(caseDir, file));
  if (line === -1) return bytes.subarray(0, bytes.indexOf(0)).filter((b) => b === 10).length + 1;
  const index = bytes
    .toString('utf8')
    .split('\n')
    .findIndex((l) => l.includes(line as string));
  if (index < 0) throw new Error(`fixture ${caseDir}/${file} has no line with "${line}"`);
  return index + 1;
}

describe('motional check: bad-input suite (test/fixtures/bad-records)', () => {
  const dirs = readdirSync(BAD)
    .filter((d) => statSync(join(BAD, d)).isDirectory())
    .sort();

  it('has an expectation for every bad record, and at least 25 of them', () => {
    expect(dirs).toEqual(Object.keys(CASES).sort());
    expect(dirs.length).toBeGreaterThanOrEqual(25);
  });

  it.each(Object.entries(CASES))('%s: exit 1, the problem named at its file and line', async (name, c) => {
    const dir = join(BAD, name);
    const r = await runInProcess(['check', dir]);
    expect(r.code).toBe(1);
    const lines = r.err.trimEnd().split('\n');
    const prefix = `${dir}/${c.file}:${expectedLine(dir, c.file, c.line)}: `;
    const hit = lines.find((l) => l.startsWith(prefix) && c.message.test(l));
    expect(hit, `stderr was:\n${r.err}\nexpected a line starting ${prefix} matching ${c.message}`).toBeDefined();
    // Every printed line names a file of this case, compiler-style; no stack traces.
    for (const l of lines) expect(l).toMatch(new RegExp(`^${dir.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}/[^:]+:\\d+: `));
    expect(r.out).toMatch(/^\d+ parts?, [1-9]\d* problems?(, \d+ warnings?)?\n$/);
  });

  it('reports every bad record when given their common folder', async () => {
    const r = await runInProcess(['check', BAD]);
    expect(r.code).toBe(1);
    for (const name of Object.keys(CASES)) expect(r.err).toContain(`${BAD}/${name}/`);
    const problems = Number(/(\d+) problems/.exec(r.out)?.[1]);
    expect(problems).toBeGreaterThanOrEqual(Object.keys(CASES).length);
  });
});

describe('motional check: valid records', () => {
  it('passes the good records with exit 0 and a summary line, printing the one warning', async () => {
    const r = await runInProcess(['check', GOOD]);
    expect(r.err).toBe(
      `${GOOD}/nested/xo-good-warn/part.yaml:4: warning: suplier: unknown field "suplier" is ignored; did you mean "supplier"?\n`,
    );
    expect(r.out).toBe('3 parts, 0 problems, 1 warning\n');
    expect(r.code).toBe(0);
  });

  it('hides warnings with --no-warnings', async () => {
    const r = await runInProcess(['check', '--no-warnings', GOOD]);
    expect(r).toEqual({ code: 0, out: '3 parts, 0 problems, 1 warning\n', err: '' });
  });

  it('accepts a single part.yaml and a single part folder', async () => {
    expect(await runInProcess(['check', `${GOOD}/xo-good-a/part.yaml`])).toEqual({
      code: 0,
      out: '1 part, 0 problems\n',
      err: '',
    });
    expect(await runInProcess(['check', `${GOOD}/xo-good-a`, `${GOOD}/nested/xo-good-b`])).toEqual({
      code: 0,
      out: '2 parts, 0 problems\n',
      err: '',
    });
  });
});

describe('motional: usage', () => {
  it('exits 2 with usage on stderr for no command, an unknown command, an unknown option or no PATH', async () => {
    for (const args of [[], ['frobnicate'], ['check', '--frobnicate', GOOD], ['check']]) {
      const r = await runInProcess(args);
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err).toMatch(/usage: motional/);
    }
  });

  it('prints help on stdout with exit 0', async () => {
    const r = await runInProcess(['--help']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^usage: motional <command>/);
    expect(r.out).toMatch(/check PATH\.\.\./);
    const c = await runInProcess(['check', '--help']);
    expect(c).toMatchObject({ code: 0, err: '' });
    expect(c.out).toMatch(/^usage: motional check/);
  });

  it('reports a path that does not exist as a problem (exit 1), not a crash', async () => {
    const r = await runInProcess(['check', 'test/fixtures/no-such-folder']);
    expect(r).toEqual({
      code: 1,
      out: '0 parts, 1 problem\n',
      err: 'test/fixtures/no-such-folder:1: no such file or folder\n',
    });
  });
});

describe('motional check as a real process', () => {
  it('exits 1 and prints each located problem on stderr, with no stack trace', () => {
    // One process for several cases keeps the suite fast; each case's problem must appear.
    const names = [
      'yaml-syntax-error',
      'symlink-escape',
      'corrupt-touchstone-row',
      'duplicate-part-id',
      'yaml-alias-bomb',
      'one-port-series-thru',
    ];
    const r = runProcess(['check', ...names.map((n) => join(BAD, n))]);
    expect(r.code).toBe(1);
    for (const name of names) {
      const c = CASES[name];
      const dir = join(BAD, name);
      const line = r.err
        .split('\n')
        .find((l) => l.startsWith(`${dir}/${c.file}:${expectedLine(dir, c.file, c.line)}: `));
      expect(line, `stderr was:\n${r.err}`).toMatch(c.message);
    }
    expect(r.err).not.toMatch(/\n\s+at /);
    expect(r.out).toMatch(/^7 parts, \d+ problems\n$/);
  });

  it('passes the good records with exit 0', () => {
    const r = runProcess(['check', GOOD]);
    expect(r).toMatchObject({ code: 0, out: '3 parts, 0 problems, 1 warning\n' });
  });

  it('runs through the npm script of README: Commands', () => {
    const r = spawnSync('npm', ['run', '-s', 'motional', '--', 'check', join(BAD, 'wrong-unit')], {
      encoding: 'utf8',
      timeout: 60_000,
    });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`${BAD}/wrong-unit/part.yaml:5: datasheet.esrMax: expected a resistance`);
  });
});
