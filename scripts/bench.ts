/**
 * `npm run bench`: run every benchmark module in scripts/bench/ (each exports a function whose
 * name starts with `bench`; an optional `format<Name>(result)` export gives its report text),
 * print a readable report and write bench-results.json.
 *
 * Options:
 *   --quick        small sizes only (each module receives { quick: true })
 *   --only NAME    run only modules whose file name (without .ts) or function name contains NAME
 *                  (repeatable, or comma-separated)
 *   --out FILE     results file (default bench-results.json)
 */
import { readdir, writeFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const HERE = dirname(fileURLToPath(import.meta.url));
const BENCH_DIR = join(HERE, 'bench');

interface BenchOptions {
  quick: boolean;
  only: string[];
  out: string;
}

interface BenchRecord {
  module: string;
  fn: string;
  ok: boolean;
  seconds: number;
  result?: unknown;
  error?: string;
}

function usage(): never {
  process.stderr.write('usage: npm run bench -- [--quick] [--only NAME] [--out FILE]\n');
  process.exit(2);
}

function parseArgs(argv: string[]): BenchOptions {
  const opts: BenchOptions = { quick: false, only: [], out: 'bench-results.json' };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--quick') opts.quick = true;
    else if (a === '--only' && argv[i + 1]) opts.only.push(...argv[++i].split(',').filter(Boolean));
    else if (a.startsWith('--only=')) opts.only.push(...a.slice(7).split(',').filter(Boolean));
    else if (a === '--out' && argv[i + 1]) opts.out = argv[++i];
    else if (a === '--help' || a === '-h') usage();
    else {
      process.stderr.write(`unknown option "${a}"\n`);
      usage();
    }
  }
  return opts;
}

/** Numbers rounded for the report; nested objects shown as indented lines. */
function formatValue(value: unknown, indent: string): string {
  if (typeof value === 'number') return Number.isInteger(value) ? String(value) : String(Number(value.toPrecision(4)));
  if (Array.isArray(value) && value.every((v) => typeof v !== 'object' || v === null))
    return `[${value.map((v) => formatValue(v, '')).join(', ')}]`;
  if (value && typeof value === 'object') {
    const lines = Object.entries(value as Record<string, unknown>).map(
      ([k, v]) => `\n${indent}  ${k}: ${formatValue(v, `${indent}  `)}`,
    );
    return lines.join('');
  }
  return String(value);
}

async function main(): Promise<number> {
  const opts = parseArgs(process.argv.slice(2));
  const files = (await readdir(BENCH_DIR)).filter((f) => f.endsWith('.ts') && !f.endsWith('.d.ts')).sort();
  const records: BenchRecord[] = [];
  const want = (name: string, fn: string) =>
    opts.only.length === 0 ||
    opts.only.some((o) => name.toLowerCase().includes(o.toLowerCase()) || fn.toLowerCase().includes(o.toLowerCase()));
  for (const file of files) {
    const name = basename(file, '.ts');
    let mod: Record<string, unknown>;
    try {
      mod = (await import(pathToFileURL(join(BENCH_DIR, file)).href)) as Record<string, unknown>;
    } catch (err) {
      if (!want(name, '')) continue;
      records.push({ module: name, fn: '', ok: false, seconds: 0, error: `import failed: ${(err as Error).message}` });
      continue;
    }
    const fns = Object.entries(mod).filter(([k, v]) => /^bench[A-Z0-9]/.test(k) && typeof v === 'function');
    for (const [fnName, fn] of fns) {
      if (!want(name, fnName)) continue;
      process.stderr.write(`\n== ${name}: ${fnName}${opts.quick ? ' (quick)' : ''}\n`);
      const t0 = performance.now();
      try {
        const result = await (fn as (o: { quick: boolean }) => Promise<unknown>)({ quick: opts.quick });
        const seconds = (performance.now() - t0) / 1000;
        records.push({ module: name, fn: fnName, ok: true, seconds, result });
        // a module may export its own report: format<FunctionName>(result) → text
        const formatter = mod[`format${fnName[0].toUpperCase()}${fnName.slice(1)}`];
        const text =
          typeof formatter === 'function'
            ? `\n${String((formatter as (r: unknown) => string)(result))}`
            : formatValue(result, '');
        process.stdout.write(`\n${name}.${fnName} (${seconds.toFixed(1)} s):${text}\n`);
      } catch (err) {
        const seconds = (performance.now() - t0) / 1000;
        records.push({ module: name, fn: fnName, ok: false, seconds, error: (err as Error).stack ?? String(err) });
        process.stdout.write(`\n${name}.${fnName} FAILED after ${seconds.toFixed(1)} s: ${(err as Error).message}\n`);
      }
    }
  }
  if (records.length === 0) {
    process.stderr.write(`no benchmark matched${opts.only.length ? ` --only ${opts.only.join(',')}` : ''}\n`);
    return 1;
  }
  const report = {
    date: new Date().toISOString(),
    node: process.version,
    quick: opts.quick,
    results: records,
  };
  const out = resolve(opts.out);
  await writeFile(out, `${JSON.stringify(report, null, 2)}\n`);
  const failed = records.filter((r) => !r.ok).length;
  process.stdout.write(`\n${records.length - failed} benchmark(s) done, ${failed} failed; results in ${out}\n`);
  return failed > 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    process.stderr.write(`${(err as Error).stack ?? err}\n`);
    process.exit(1);
  },
);
