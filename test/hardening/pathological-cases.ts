/**
 * Worst-case inputs for the readers, each at the size the readers' own limits still allow:
 * long runs of digits or spaces that make backtracking regular expressions quadratic or cubic,
 * many mapping keys, deep nesting, alias bombs. Run by pathological.test.ts in a child process
 * (`node --import tsx test/hardening/pathological-cases.ts NAME...`), so a hang is killed and
 * reported instead of stalling the suite. Each case prints one JSON line: name, ms, outcome.
 */
import { resolve } from 'node:path';
import { InputError } from '../../src/lib/issues.ts';
import { parsePartYaml, MAX_PART_YAML_BYTES, MAX_PART_YAML_LINE_CHARS } from '../../src/lib/io/part-yaml.ts';
import { parseSweepCsv } from '../../src/lib/io/sweep-csv.ts';
import { parseTouchstone } from '../../src/lib/io/touchstone.ts';
import { MAX_SWEEP_LINE_CHARS } from '../../src/lib/io/limits.ts';
import { parseQuantity, parseQuantityRange } from '../../src/lib/units/si.ts';

export interface PathologicalCase {
  /** What the input is. */
  what: string;
  /** Time the reader may take, ms. */
  budgetMs: number;
  /** Build the input and read it; returns a short outcome (first message or "ok"). */
  run(): { input: () => unknown; outcome: (result: unknown) => string };
}

/** Largest line a sweep file may have, minus room for the rest of the line. */
const LINE = MAX_SWEEP_LINE_CHARS - 100;
/** Largest part.yaml line. */
const YLINE = MAX_PART_YAML_LINE_CHARS - 20;

function sweepOutcome(e: unknown): string {
  if (e instanceof InputError)
    return `InputError ${e.issues.length}: ${e.issues[0].file}:${e.issues[0].line ?? '-'}: ${e.issues[0].message.slice(0, 120)}`;
  if (e instanceof Error) return `EXCEPTION ${e.name}: ${e.message.slice(0, 120)}`;
  return 'ok';
}

function sweep(read: () => unknown): () => unknown {
  return () => {
    try {
      read();
      return undefined;
    } catch (e) {
      return e;
    }
  };
}

function yamlOutcome(r: unknown): string {
  const res = r as ReturnType<typeof parsePartYaml>;
  const first = res.issues.find((i) => i.severity === 'error');
  return first
    ? `issues ${res.issues.length}: ${first.file}:${first.line ?? '-'}: ${first.message.slice(0, 120)}`
    : 'ok';
}

function quantityOutcome(r: unknown): string {
  const q = r as { ok: boolean; message?: string };
  return q.ok ? 'ok' : `message: ${q.message!.slice(0, 120)}`;
}

export const CASES: Record<string, PathologicalCase> = {
  'quantity-digits-then-line-breaks': {
    what: 'a quantity of 10,000 digits followed by line breaks (a YAML block scalar)',
    budgetMs: 200,
    run: () => {
      const text = `${'1'.repeat(10_000)}\nx\ny`;
      return { input: () => parseQuantity(text, 'frequency'), outcome: quantityOutcome };
    },
  },
  'range-long-space-run': {
    what: 'a temperature range of one digit, 10,000 spaces and a letter',
    budgetMs: 200,
    run: () => {
      const text = `1${' '.repeat(10_000)}x`;
      return { input: () => parseQuantityRange(text, 'temperature'), outcome: quantityOutcome };
    },
  },
  'csv-field-of-digits': {
    what: 'a CSV data field of ~1 M digits ending in a letter',
    budgetMs: 1500,
    run: () => {
      const text = `f,r,x\n1,2,${'1'.repeat(LINE)}x\n`;
      return { input: sweep(() => parseSweepCsv(text, 'p.csv')), outcome: sweepOutcome };
    },
  },
  'csv-header-space-run': {
    what: 'a CSV header field of ~1 M spaces between two letters',
    budgetMs: 1500,
    run: () => {
      const text = `f,r,a${' '.repeat(LINE)}b\n1,2,3\n`;
      return { input: sweep(() => parseSweepCsv(text, 'p.csv')), outcome: sweepOutcome };
    },
  },
  'csv-header-many-columns': {
    what: 'a CSV header of ~260,000 columns',
    budgetMs: 3000,
    run: () => {
      const text = `f,r,x,${'(a),'.repeat(LINE / 4 - 10)}\n1,2,3\n`;
      return { input: sweep(() => parseSweepCsv(text, 'p.csv')), outcome: sweepOutcome };
    },
  },
  'csv-unterminated-quote': {
    what: 'a CSV line of one ~1 M character quoted field that never closes, on 60 lines',
    budgetMs: 3000,
    run: () => {
      const line = `"${'a'.repeat(LINE)}`;
      const text = `f,r,x\n${Array.from({ length: 60 }, () => line).join('\n')}\n`;
      return { input: sweep(() => parseSweepCsv(text, 'p.csv')), outcome: sweepOutcome };
    },
  },
  'touchstone-option-r-digits': {
    what: 'a Touchstone option line whose R value is ~1 M digits ending in a letter',
    budgetMs: 1500,
    run: () => {
      const text = `# Hz S RI R ${'1'.repeat(LINE)}x\n1 2 3\n`;
      return { input: sweep(() => parseTouchstone(text, 'p.s1p')), outcome: sweepOutcome };
    },
  },
  'touchstone-long-bad-token': {
    what: 'Touchstone data rows, each one ~1 M character token of digits and an exponent gone wrong, on 60 lines',
    budgetMs: 3000,
    run: () => {
      const row = `1 ${'9'.repeat(LINE)}e+x 3`;
      const text = `# Hz S RI R 50\n${Array.from({ length: 60 }, () => row).join('\n')}\n`;
      return { input: sweep(() => parseTouchstone(text, 'p.s1p')), outcome: sweepOutcome };
    },
  },
  'touchstone-unclosed-keyword': {
    what: 'a Touchstone 2 keyword line of ~1 M characters with no closing bracket, on 60 lines',
    budgetMs: 3000,
    run: () => {
      const row = `[${'Number of Ports '.repeat(LINE / 17)}`;
      const text = `[Version] 2.0\n${Array.from({ length: 60 }, () => row).join('\n')}\n`;
      return { input: sweep(() => parseTouchstone(text, 'p.ts')), outcome: sweepOutcome };
    },
  },
  'touchstone-many-columns': {
    what: 'a Touchstone row of ~300,000 numbers',
    budgetMs: 1500,
    run: () => {
      const text = `# Hz S RI R 50\n${'1 '.repeat(LINE / 2 - 10)}\n`;
      return { input: sweep(() => parseTouchstone(text, 'p.s1p')), outcome: sweepOutcome };
    },
  },
  'yaml-many-keys': {
    what: 'a part.yaml of 20,000 distinct top-level keys (190 kB, a fifth of the size limit)',
    budgetMs: 1000,
    run: () => {
      const text = `id: X\n${Array.from({ length: 20_000 }, (_, i) => `k${i}: 1`).join('\n')}\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-many-keys-at-the-size-limit': {
    what: 'a part.yaml just under the size limit, all distinct keys (~90,000)',
    budgetMs: 3000,
    run: () => {
      const keys: string[] = ['id: X'];
      let size = 6;
      for (let i = 0; size < MAX_PART_YAML_BYTES - 40; i++) {
        keys.push(`k${i}: 1`);
        size += keys[keys.length - 1].length + 1;
      }
      const text = `${keys.join('\n')}\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-many-samples': {
    what: 'a part.yaml with 60,000 sample entries, each wrong',
    // the yaml package itself reads such dense files at ~0.3 MB/s (2.2 s of the 4 s measured)
    budgetMs: 8000,
    run: () => {
      const text = `id: X\ntitle: t\nkind: quartz-at\nsamples:\n${Array.from({ length: 60_000 }, (_, i) => `  - ${i}`).join('\n')}\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-flow-nesting': {
    what: 'a part.yaml of ~1 M opening brackets',
    budgetMs: 500,
    run: () => {
      const text = `notes: ${'['.repeat(YLINE)}\n`.repeat(90);
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-block-nesting': {
    what: 'a part.yaml of mappings nested 1,400 levels deep by indentation (~1 MB)',
    budgetMs: 1500,
    run: () => {
      let text = '';
      for (let d = 0; d < 1400; d++) text += `${' '.repeat(d)}k:\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-sequence-nesting': {
    what: 'a part.yaml line of ~5,000 nested block sequence indicators',
    budgetMs: 500,
    run: () => {
      const text = `id: X\nsamples:\n  ${'- '.repeat(YLINE / 2 - 10)}x\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-billion-laughs': {
    what: 'the classic ten-level alias bomb (10^9 expansions if expanded)',
    budgetMs: 200,
    run: () => {
      const lines = ['id: X', 'a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol","lol"]'];
      for (let i = 1; i < 10; i++) {
        const prev = String.fromCharCode(96 + i);
        const cur = String.fromCharCode(97 + i);
        lines.push(`${cur}: &${cur} [${Array.from({ length: 10 }, () => `*${prev}`).join(',')}]`);
      }
      const text = `${lines.join('\n')}\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-many-aliases': {
    what: 'a part.yaml of 100,000 aliases to one anchor',
    // none is expanded; the time is the yaml package's parse (3.6 s of the 5.8 s measured)
    budgetMs: 8000,
    run: () => {
      const text = `id: X\na: &a x\nb: [${Array.from({ length: 100_000 }, () => '*a').join(',\n  ')}]\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-quantity-block-scalar': {
    what: 'a datasheet frequency written as a ~1 MB block scalar of digit lines',
    budgetMs: 1500,
    run: () => {
      const text = `id: X\ndatasheet:\n  frequency: |\n${Array.from({ length: 100 }, () => `    ${'1'.repeat(YLINE - 10)}`).join('\n')}\n    x\n    y\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
  'yaml-long-notes': {
    what: 'notes of ~1 MB in one block scalar (over the 20,000-character field limit)',
    budgetMs: 1500,
    run: () => {
      const text = `id: X\ntitle: t\nkind: quartz-at\nnotes: |\n${Array.from({ length: 100 }, () => `  ${'<b>'.repeat((YLINE - 10) / 3)}`).join('\n')}\n`;
      return { input: () => parsePartYaml(text, 'part.yaml'), outcome: yamlOutcome };
    },
  },
};

/** Run the named cases, one JSON line each on stdout. */
export function runCases(names: string[]): void {
  for (const name of names) {
    const c = CASES[name];
    const { input, outcome } = c.run();
    process.stdout.write(`${JSON.stringify({ start: name })}\n`);
    const t0 = performance.now();
    const result = input();
    const ms = performance.now() - t0;
    process.stdout.write(`${JSON.stringify({ name, ms, outcome: outcome(result) })}\n`);
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) runCases(process.argv.slice(2));
