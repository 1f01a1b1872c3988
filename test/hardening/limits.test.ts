/**
 * Resource limits: every limit gives a clear, located error that names the limit, quickly,
 * and nothing is expanded or allocated past it. Limits are set in src/lib/io/limits.ts
 * (sweep files), src/lib/io/part-yaml.ts (records), src/lib/schema/part.ts (field lengths) and
 * src/pipeline (file sizes checked before reading). Tests use the readers' limit overrides
 * instead of 64 MB strings, plus one lazily built string at each real default.
 */
import { mkdirSync, mkdtempSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError, type Issue } from '../../src/lib/issues.ts';
import {
  MAX_ISSUES_PER_FILE,
  MAX_SWEEP_BYTES,
  MAX_SWEEP_LINE_CHARS,
  MAX_SWEEP_POINTS,
} from '../../src/lib/io/limits.ts';
import { parseTouchstone } from '../../src/lib/io/touchstone.ts';
import { parseSweepCsv } from '../../src/lib/io/sweep-csv.ts';
import {
  MAX_PART_YAML_BYTES,
  MAX_PART_YAML_DEPTH,
  MAX_PART_YAML_LINE_CHARS,
  parsePartYaml,
} from '../../src/lib/io/part-yaml.ts';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { INPUT_BUDGET_MS, timed } from './fuzz-support.ts';

/** The issues of a reader that must refuse its input, within the per-input budget. */
function refused(read: () => unknown): Issue[] {
  const r = timed(read);
  expect(r.ms).toBeLessThan(INPUT_BUDGET_MS);
  expect(r.error).toBeInstanceOf(InputError);
  return (r.error as InputError).issues;
}

const S1P_HEAD = '! limits\n# Hz S RI R 50\n';
const s1pRows = (n: number) => Array.from({ length: n }, (_, i) => `${1000 + i} 0.1 0.2`).join('\n');
const csvRows = (n: number) => Array.from({ length: n }, (_, i) => `${1000 + i},10,-5`).join('\n');

describe('sweep file limits (src/lib/io/limits.ts)', () => {
  it('the stated defaults: 64 MiB per file, 2,000,000 points, 1 MiB per line, 100 issues', () => {
    expect(MAX_SWEEP_BYTES).toBe(64 * 1024 * 1024);
    expect(MAX_SWEEP_POINTS).toBe(2_000_000);
    expect(MAX_SWEEP_LINE_CHARS).toBe(1024 * 1024);
    expect(MAX_ISSUES_PER_FILE).toBe(100);
  });

  it('refuses a file one byte over the real 64 MiB default before reading any of it', () => {
    const text = 'x'.repeat(MAX_SWEEP_BYTES + 1);
    for (const [read, name] of [
      [() => parseTouchstone(text, 'big.s2p'), 'big.s2p'],
      [() => parseSweepCsv(text, 'big.csv'), 'big.csv'],
    ] as const) {
      const issues = refused(read);
      expect(issues).toEqual([
        expect.objectContaining({
          file: name,
          code: 'size',
          message: `file is ${MAX_SWEEP_BYTES + 1} bytes, over the limit of ${MAX_SWEEP_BYTES} bytes`,
        }),
      ]);
    }
  });

  it('refuses a file over a lowered size limit, naming both sizes', () => {
    const text = `${S1P_HEAD}${s1pRows(50)}\n`;
    expect(refused(() => parseTouchstone(text, 'a.s1p', { maxBytes: 100 }))[0].message).toBe(
      `file is ${text.length} bytes, over the limit of 100 bytes`,
    );
    const csv = `f,r,x\n${csvRows(50)}\n`;
    expect(refused(() => parseSweepCsv(csv, 'a.csv', { maxBytes: 100 }))[0].message).toBe(
      `file is ${csv.length} bytes, over the limit of 100 bytes`,
    );
  });

  it('stops at the point limit on the line of the first point too many', () => {
    const ts = refused(() => parseTouchstone(`${S1P_HEAD}${s1pRows(1000)}\n`, 'a.s1p', { maxPoints: 500 }));
    expect(ts).toEqual([
      expect.objectContaining({ line: 2 + 501, code: 'size', message: 'more than 500 frequency points' }),
    ]);
    const csv = refused(() => parseSweepCsv(`f,r,x\n${csvRows(1000)}\n`, 'a.csv', { maxPoints: 500 }));
    expect(csv).toEqual([
      expect.objectContaining({ line: 1 + 501, code: 'size', message: 'more than 500 frequency points' }),
    ]);
  });

  it('does not trust a declared point count: [Number of Frequencies] 10^12 allocates nothing and is a located mismatch', () => {
    const text =
      '[Version] 2.0\n# Hz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1000000000000\n[Network Data]\n1 0.1 0.2\n2 0.1 0.2\n[End]\n';
    const issues = refused(() => parseTouchstone(text, 'a.ts'));
    expect(issues).toEqual([
      expect.objectContaining({
        line: 4,
        message: '[Number of Frequencies] is 1000000000000 but the network data has 2 frequency points',
      }),
    ]);
  });

  it('refuses a line over the real 1 MiB default and over a lowered limit, at its line', () => {
    const long = `${S1P_HEAD}1000 0.1 0.2${' '.repeat(MAX_SWEEP_LINE_CHARS)}\n2000 0.1 0.2\n`;
    expect(refused(() => parseTouchstone(long, 'a.s1p'))[0]).toMatchObject({
      line: 3,
      code: 'line-length',
      message: `line is ${MAX_SWEEP_LINE_CHARS + 12} characters long, over the limit of ${MAX_SWEEP_LINE_CHARS}`,
    });
    const csv = `f,r,x\n1,2,3\n2,2,3${'0'.repeat(80)}\n`;
    expect(refused(() => parseSweepCsv(csv, 'a.csv', { maxLineChars: 50 }))[0]).toMatchObject({
      line: 3,
      code: 'line-length',
      message: 'line is 85 characters long, over the limit of 50',
    });
  });

  it('reports at most 100 problems of a file and says it stopped', () => {
    const bad = Array.from({ length: 5000 }, (_, i) => `${1000 + i} 0.1`).join('\n');
    const ts = refused(() => parseTouchstone(`${S1P_HEAD}${bad}\n`, 'a.s1p'));
    expect(ts).toHaveLength(MAX_ISSUES_PER_FILE + 1);
    expect(ts.at(-1)!.message).toBe(`too many problems; stopped after ${MAX_ISSUES_PER_FILE}`);
    const csv = refused(() =>
      parseSweepCsv(`f,r,x\n${Array.from({ length: 5000 }, () => '1,x,2').join('\n')}\n`, 'a.csv'),
    );
    expect(csv).toHaveLength(MAX_ISSUES_PER_FILE + 1);
    expect(csv.at(-1)!.message).toBe(`too many problems; stopped after ${MAX_ISSUES_PER_FILE}`);
  });
});

const RECORD =
  'id: XO-1\ntitle: t\nkind: quartz-at\nsamples:\n  - id: A1\n    sweeps:\n      - file: a1.s1p\n        fixture: reflection\n';

function yamlIssues(text: string, opts?: Parameters<typeof parsePartYaml>[2]): Issue[] {
  const r = timed(() => parsePartYaml(text, 'part.yaml', opts));
  expect(r.ms).toBeLessThan(INPUT_BUDGET_MS);
  expect(r.error).toBeUndefined();
  expect(r.value!.part).toBeUndefined();
  return r.value!.issues.filter((i) => i.severity === 'error');
}

describe('part record limits (src/lib/io/part-yaml.ts, src/lib/schema/part.ts)', () => {
  it('the stated defaults: 1 MiB per record, 10,000 characters per line, nesting 20 deep', () => {
    expect(MAX_PART_YAML_BYTES).toBe(1024 * 1024);
    expect(MAX_PART_YAML_LINE_CHARS).toBe(10_000);
    expect(MAX_PART_YAML_DEPTH).toBe(20);
  });

  it('refuses a record one byte over the real 1 MiB default, and over a lowered one', () => {
    const big = RECORD + '#'.repeat(MAX_PART_YAML_BYTES + 1 - RECORD.length);
    expect(yamlIssues(big)).toEqual([
      expect.objectContaining({
        file: 'part.yaml',
        code: 'size',
        message: `file is ${MAX_PART_YAML_BYTES + 1} bytes, over the limit of ${MAX_PART_YAML_BYTES} bytes for a part record`,
      }),
    ]);
    expect(yamlIssues(RECORD, { maxBytes: 50 })[0].message).toBe(
      `file is ${RECORD.length} bytes, over the limit of 50 bytes for a part record`,
    );
  });

  it('refuses a line over 10,000 characters at its line', () => {
    const text = RECORD.replace('title: t', `title: ${'t'.repeat(MAX_PART_YAML_LINE_CHARS)}`);
    expect(yamlIssues(text)[0]).toMatchObject({
      line: 2,
      message: `line is ${MAX_PART_YAML_LINE_CHARS + 7} characters long, over the limit of ${MAX_PART_YAML_LINE_CHARS}`,
    });
  });

  it('refuses flow nesting deeper than 20 at the bracket that goes too deep', () => {
    const text = `${RECORD}notes: ${'['.repeat(25)}${']'.repeat(25)}\n`;
    expect(yamlIssues(text)[0]).toMatchObject({
      line: 9,
      col: 7 + 21,
      message: `nesting deeper than ${MAX_PART_YAML_DEPTH} levels`,
    });
  });

  it('refuses block nesting deeper than 20 with a located error', () => {
    let deep = 'datasheet:\n';
    for (let d = 1; d < 30; d++) deep += `${'  '.repeat(d)}k${d}:\n`;
    const issues = yamlIssues(RECORD + deep);
    expect(issues.some((i) => i.message === `nesting deeper than ${MAX_PART_YAML_DEPTH} levels` && i.line! > 9)).toBe(
      true,
    );
  });

  it('never expands aliases: a billion-laughs record is one located error, read in milliseconds', () => {
    const lines = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol","lol"]'];
    for (let i = 1; i < 10; i++)
      lines.push(
        `${String.fromCharCode(97 + i)}: &${String.fromCharCode(97 + i)} [${Array(10)
          .fill(`*${String.fromCharCode(96 + i)}`)
          .join(',')}]`,
      );
    const before = process.memoryUsage().heapUsed;
    const issues = yamlIssues(`${RECORD}${lines.join('\n')}\n`);
    expect(process.memoryUsage().heapUsed - before).toBeLessThan(50e6);
    expect(issues).toEqual([
      expect.objectContaining({
        line: 10,
        code: 'yaml-alias',
        message: 'yaml alias *a not allowed in a part record; write the value out (89 more aliases in the file)',
      }),
    ]);
  });

  it('refuses merge keys, which are aliases too', () => {
    const text = `${RECORD}datasheet: &d\n  frequency: 12 MHz\nextra:\n  <<: *d\n`;
    expect(yamlIssues(text)).toEqual([expect.objectContaining({ line: 12, code: 'yaml-alias' })]);
  });

  it('reports at most 200 problems of a record and says how many more there were', () => {
    const text = `${RECORD.replace('samples:\n', 'samples:\n')}${Array.from({ length: 500 }, (_, i) => `  - id: B${i}\n    sweeps: 3`).join('\n')}\n`;
    const r = parsePartYaml(text, 'part.yaml');
    expect(r.issues).toHaveLength(201);
    expect(r.issues.at(-1)!.message).toBe('300 more issues not shown');
  });

  it.each([
    ['title', 'title: t', `title: ${'x'.repeat(201)}`, 'title:', 'expected at most 200 characters'],
    ['package', 'title: t', `title: t\npackage: ${'x'.repeat(101)}`, 'package:', 'expected at most 100 characters'],
    [
      'notes',
      'title: t',
      `title: t\nnotes: |\n${Array.from({ length: 3 }, () => `  ${'n'.repeat(8000)}`).join('\n')}`,
      'notes:',
      'expected at most 20000 characters',
    ],
    ['id', 'id: XO-1', `id: ${'X'.repeat(65)}`, 'id:', 'expected a part id of at most 64 characters'],
    [
      'samples[0].sweeps[0].file',
      'file: a1.s1p',
      `file: ${'a'.repeat(300)}.s1p`,
      'file:',
      'expected a file name of at most 255 characters',
    ],
  ])('limits the length of %s with a located error', (path, from, to, lineText, message) => {
    const text = RECORD.replace(from, to);
    const issue = yamlIssues(text).find((i) => i.path === path);
    expect(issue, JSON.stringify(yamlIssues(text))).toBeDefined();
    expect(issue!.message).toContain(message);
    expect(issue!.line).toBe(text.split('\n').findIndex((l) => l.includes(lineText)) + 1);
  });
});

describe('file sizes checked before reading (src/pipeline/load-part.ts)', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'motional-limits-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('refuses a 65 MiB sweep file by its size alone (a sparse file: never read)', async () => {
    const part = join(dir, 'big-sweep');
    mkdirSync(part);
    writeFileSync(join(part, 'part.yaml'), RECORD);
    writeFileSync(join(part, 'a1.s1p'), '');
    truncateSync(join(part, 'a1.s1p'), 65 * 1024 * 1024);
    const t0 = performance.now();
    const loaded = await loadPart(part);
    expect(performance.now() - t0).toBeLessThan(1000);
    expect(loaded.issues).toEqual([
      expect.objectContaining({
        severity: 'error',
        file: join(part, 'a1.s1p'),
        code: 'size',
        message: `file is ${65 * 1024 * 1024} bytes, over the limit of ${MAX_SWEEP_BYTES} bytes`,
      }),
    ]);
  });

  it('refuses a 2 MiB part.yaml by its size alone', async () => {
    const part = join(dir, 'big-record');
    mkdirSync(part);
    writeFileSync(join(part, 'part.yaml'), '');
    truncateSync(join(part, 'part.yaml'), 2 * 1024 * 1024);
    const loaded = await loadPart(part);
    expect(loaded.issues).toEqual([
      expect.objectContaining({
        file: join(part, 'part.yaml'),
        code: 'size',
        message: `file is ${2 * 1024 * 1024} bytes, over the limit of ${MAX_PART_YAML_BYTES} bytes for a part record`,
      }),
    ]);
  });
});
