/**
 * The records stage of a catalogue build: the oscillator circuits file, then every record —
 * cache lookups in the main thread, the rest through the main thread and worker threads from
 * one queue — and the duplicate-id check over the results.
 */
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Issue } from '../lib/issues.ts';
import { parseOscillatorsYaml } from '../lib/osc/oscillators-yaml.ts';
import { BuildFailure } from './build-failure.ts';
import {
  createBuildTaskRunner,
  createRecordLookup,
  type BuildTask,
  type BuildTaskContext,
  type BuildTaskResult,
} from './build-task.ts';
import { loadFingerprintMemo, sha256 } from './cache.ts';
import { createProgress, type ProgressStream } from './progress.ts';
import { PROJECT_ROOT } from './project-root.ts';
import { createWorkerPool, runLanes } from './worker-pool.ts';
import { bundledWorker } from './worker-bundle.ts';

/** The circuits file: `<content>/oscillators.yaml`, else the project's demo one, else none. */
export async function readOscillators(contentDir: string, issues: Issue[]): Promise<BuildTaskContext['oscillators']> {
  const candidates = [join(contentDir, 'oscillators.yaml'), join(PROJECT_ROOT, 'content', 'oscillators.yaml')];
  const file = candidates.find((f) => existsSync(f));
  if (!file) return undefined;
  const text = await readFile(file, 'utf8');
  const parsed = parseOscillatorsYaml(text, file);
  issues.push(...parsed.issues);
  return { file, text, hash: sha256(text) };
}

/** Below this many records to extract, no threads are started (their start-up costs more). */
const MIN_RECORDS_FOR_THREADS = 4;
/** Cache lookups (hash + link) running at once in the main thread. */
const LOOKUP_CONCURRENCY = 8;

/**
 * Every record, in two passes: cache lookups in the main thread (hits are finished there),
 * then the rest through the main thread and the worker threads, taking tasks from one queue.
 */
export async function runRecords(
  records: string[],
  context: BuildTaskContext,
  jobs: number,
  validateOnly: boolean,
  progressStream: ProgressStream | undefined,
  signal: AbortSignal | undefined,
  memoFile: string | undefined,
  /** Process every record in full even after an invalid one (preview: the others are still shown). */
  keepGoing = false,
): Promise<{ results: BuildTaskResult[]; threads: number }> {
  const progress = createProgress({
    label: 'records',
    total: records.length,
    stream: progressStream,
    silent: !progressStream,
  });
  const results = new Array<BuildTaskResult>(records.length);
  let failed = validateOnly;
  let invalidFound = false;
  let hits = 0;
  const note = () => (hits > 0 ? `${hits} cached` : undefined);

  const todo: BuildTask[] = [];
  const memo = memoFile ? await loadFingerprintMemo(memoFile) : undefined;
  const lookup = createRecordLookup(context, memo);
  let nextLookup = 0;
  const lookupLane = async (stopped: () => boolean) => {
    while (nextLookup < records.length && !stopped()) {
      if (signal?.aborted) throw new BuildFailure('build stopped');
      const index = nextLookup++;
      const outcome = await lookup.lookup(index, records[index]);
      if ('done' in outcome) {
        results[index] = outcome.done;
        hits++;
        progress.tick(1, note());
      } else {
        todo.push(outcome.task);
      }
    }
  };
  await runLanes(Math.min(records.length, LOOKUP_CONCURRENCY), lookupLane);
  await memo?.save().catch(() => undefined);
  todo.sort((a, b) => a.index - b.index);

  // The main thread always takes tasks too, plus jobs − 1 worker threads when there is enough
  // to do; the threads load the worker code bundled into one file (worker-bundle.ts).
  const threads = jobs > 1 && todo.length >= MIN_RECORDS_FOR_THREADS ? Math.min(jobs - 1, todo.length - 1) : 0;
  const pool =
    threads > 0
      ? createWorkerPool<BuildTask, BuildTaskResult>({
          moduleUrl: await bundledWorker(new URL('./build-worker.ts', import.meta.url)),
          size: threads,
          workerData: context,
        })
      : undefined;
  let next = 0;
  let halted = false; // a lane failed: the others stop after their current task
  const lane = (run: (task: BuildTask) => Promise<BuildTaskResult>) => async (stopped: () => boolean) => {
    try {
      while (next < todo.length && !stopped() && !halted) {
        if (signal?.aborted) throw new BuildFailure('build stopped');
        const task = todo[next++];
        const result = await run({ ...task, validateOnly: failed });
        if (!result.valid) {
          invalidFound = true;
          if (!keepGoing) failed = true;
        }
        results[task.index] = result;
        progress.tick(1, note());
      }
    } catch (err) {
      halted = true;
      throw err;
    }
  };
  try {
    const lanes: Array<Promise<void>> = [];
    // two tasks per worker keep it busy while results travel back
    if (pool)
      lanes.push(
        runLanes(
          Math.min(todo.length, threads * 2),
          lane((task) => pool.run(task)),
        ),
      );
    if (todo.length > 0) {
      const runner = await createBuildTaskRunner(context);
      lanes.push(
        runLanes(
          1,
          lane((task) => runner.run(task)),
        ),
      );
    }
    const settled = await Promise.allSettled(lanes);
    const rejected = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (rejected) throw rejected.reason;
  } finally {
    await pool?.close();
  }
  progress.done(`${hits} cached, ${todo.length} processed${failed || invalidFound ? ', invalid records found' : ''}`);
  return { results, threads };
}

/** Errors for every record whose id an earlier record (in path order) already uses. */
export function duplicateIds(results: BuildTaskResult[]): Issue[] {
  const first = new Map<string, string>();
  const issues: Issue[] = [];
  for (const r of results) {
    if (r.id === undefined) continue;
    const seen = first.get(r.id);
    if (seen === undefined) first.set(r.id, r.yamlFile);
    else
      issues.push({
        severity: 'error',
        file: r.yamlFile,
        line: r.idLine,
        path: 'id',
        message: `duplicate part id "${r.id}" (also in ${seen})`,
        code: 'duplicate-id',
      });
  }
  return issues;
}
