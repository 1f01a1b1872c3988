/**
 * Worst-case inputs at the size the readers' limits allow (pathological-cases.ts): each is
 * refused with a located error (or read) within its time budget. The cases run in a child
 * process; one that runs far over its budget is killed and reported as a hang, and the
 * remaining cases go on in a fresh child.
 */
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CASES } from './pathological-cases.ts';
import { ROOT } from './fuzz-support.ts';

interface Outcome {
  ms: number;
  outcome: string;
  hung?: boolean;
}

const results = new Map<string, Outcome>();

/** Kill a case after this long: well past its budget, so only a real hang is cut short. */
const killAfter = (name: string) => Math.max(3 * CASES[name].budgetMs, 4000);

function runBatch(names: string[]): Promise<string[]> {
  return new Promise((done) => {
    const child = spawn(
      process.execPath,
      ['--import', 'tsx', join(ROOT, 'test/hardening/pathological-cases.ts'), ...names],
      { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let buffer = '';
    let stderr = '';
    let current: { name: string; t0: number; timer: NodeJS.Timeout } | undefined;
    child.stdout.on('data', (chunk: Buffer) => {
      buffer += chunk.toString('utf8');
      let nl: number;
      while ((nl = buffer.indexOf('\n')) >= 0) {
        const msg = JSON.parse(buffer.slice(0, nl)) as { start?: string; name?: string; ms?: number; outcome?: string };
        buffer = buffer.slice(nl + 1);
        if (msg.start) {
          const name = msg.start;
          current = { name, t0: Date.now(), timer: setTimeout(() => child.kill('SIGKILL'), killAfter(name)) };
        } else if (msg.name) {
          clearTimeout(current?.timer);
          current = undefined;
          results.set(msg.name, { ms: msg.ms!, outcome: msg.outcome! });
        }
      }
    });
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString('utf8')));
    child.on('close', () => {
      if (current) {
        clearTimeout(current.timer);
        results.set(current.name, {
          ms: Date.now() - current.t0,
          outcome: `killed after ${Date.now() - current.t0} ms`,
          hung: true,
        });
      }
      const left = names.filter((n) => !results.has(n));
      if (left.length > 0 && !current) {
        // the child died without a hang of its own: record why, do not retry forever
        for (const n of left) results.set(n, { ms: NaN, outcome: `child process failed: ${stderr.slice(0, 500)}` });
        done([]);
      } else done(left);
    });
  });
}

beforeAll(async () => {
  let left = Object.keys(CASES);
  while (left.length > 0) left = await runBatch(left);
  const rows = [...results].map(
    ([n, r]) =>
      `${n.padEnd(36)} ${r.hung ? 'HUNG' : `${r.ms.toFixed(0)} ms`.padStart(9)}  (budget ${CASES[n].budgetMs} ms)  ${r.outcome}`,
  );
  console.log(`worst-case reader inputs:\n${rows.join('\n')}`);
}, 300_000);

describe('readers on worst-case inputs at their size limits', () => {
  it.each(Object.entries(CASES).map(([name, c]) => [name, c.what, c.budgetMs] as const))(
    '%s (%s): a located result within %d ms',
    (name, _what, budgetMs) => {
      const r = results.get(name)!;
      expect(r, 'no result').toBeDefined();
      expect(r.hung ?? false, `${name} hung: ${r.outcome}`).toBe(false);
      expect(r.outcome).not.toMatch(/^(EXCEPTION|child process failed)/);
      // a located refusal names the file and a line (sweep files) or the record's file
      if (r.outcome !== 'ok' && !r.outcome.startsWith('message:'))
        expect(r.outcome).toMatch(/^(InputError|issues) \d+: (p\.csv|p\.s1p|p\.ts|part\.yaml):\d+: /);
      expect(r.ms, `${name} took ${r.ms.toFixed(0)} ms`).toBeLessThan(budgetMs);
    },
  );
});
