/**
 * A small pool of worker threads running one TypeScript module, tasks handed out one at a time
 * to whichever thread is free.
 *
 * TypeScript workers: on Node 20 a `new Worker('x.ts', { execArgv: ['--import', 'tsx'] })`
 * fails with ERR_UNKNOWN_FILE_EXTENSION (the loader hooks are not in place before the entry
 * module loads). So each thread starts from a tiny JavaScript bootstrap (worker-bootstrap.mjs)
 * that registers tsx's ESM hooks through its public API and then imports the real module.
 *
 * The worker module calls {@link serveTasks} with its handler.
 */
import { availableParallelism } from 'node:os';
import { Worker, parentPort, workerData as threadData } from 'node:worker_threads';

export interface WorkerPoolOptions {
  /** URL of the worker module (`.ts` modules are loaded through tsx). */
  moduleUrl: URL;
  /** Number of threads, ≥ 1. Default: available parallelism. */
  size?: number;
  /** Passed to every thread as `workerData` (structured-clonable). */
  workerData?: unknown;
}

export interface WorkerPool<T, R> {
  /** Queue a task; resolves with the worker's result, rejects with its error. */
  run(task: T): Promise<R>;
  /** Stop all threads (pending tasks are rejected). */
  close(): Promise<void>;
  /** Number of threads. */
  readonly size: number;
  /** Thread ids (for memory sampling and diagnostics). */
  readonly threadIds: number[];
}

interface Pending<R> {
  id: number;
  task: unknown;
  resolve: (value: R) => void;
  reject: (err: Error) => void;
}

type Reply = { id: number; ok: true; result: unknown } | { id: number; ok: false; error: string };

/** Default number of worker threads: every core the process may use. */
export function defaultJobs(): number {
  return Math.max(1, availableParallelism());
}

/** The thread entry: registers tsx for `.ts` modules, then imports the worker module. */
const BOOTSTRAP_URL = new URL('./worker-bootstrap.mjs', import.meta.url);

/** Start a pool of threads running `moduleUrl`. */
export function createWorkerPool<T, R>(options: WorkerPoolOptions): WorkerPool<T, R> {
  const size = Math.max(1, Math.floor(options.size ?? defaultJobs()));
  const queue: Array<Pending<R>> = [];
  const busy = new Map<Worker, Pending<R>>();
  const idle: Worker[] = [];
  const workers: Worker[] = [];
  let nextId = 1;
  let closed = false;
  let fatal: Error | undefined;

  const failAll = (err: Error): void => {
    fatal ??= err;
    for (const p of busy.values()) p.reject(err);
    busy.clear();
    for (const p of queue.splice(0)) p.reject(err);
  };

  const pump = (): void => {
    while (idle.length > 0 && queue.length > 0) {
      const worker = idle.shift()!;
      const job = queue.shift()!;
      busy.set(worker, job);
      worker.postMessage({ id: job.id, task: job.task });
    }
  };

  for (let i = 0; i < size; i++) {
    const worker = new Worker(BOOTSTRAP_URL, {
      argv: [options.moduleUrl.href],
      workerData: options.workerData,
      execArgv: [],
    });
    worker.on('message', (reply: Reply) => {
      const job = busy.get(worker);
      if (!job || job.id !== reply.id) return;
      busy.delete(worker);
      idle.push(worker);
      if (reply.ok) job.resolve(reply.result as R);
      else job.reject(new Error(reply.error));
      pump();
    });
    worker.on('error', (err) => failAll(err instanceof Error ? err : new Error(String(err))));
    worker.on('exit', (code) => {
      if (!closed) failAll(new Error(`worker thread ${worker.threadId} stopped (exit code ${code})`));
    });
    workers.push(worker);
    idle.push(worker);
  }

  return {
    size,
    threadIds: workers.map((w) => w.threadId),
    run(task) {
      if (fatal) return Promise.reject(fatal);
      if (closed) return Promise.reject(new Error('worker pool is closed'));
      return new Promise<R>((resolve, reject) => {
        queue.push({ id: nextId++, task, resolve, reject });
        pump();
      });
    },
    async close() {
      if (closed) return;
      closed = true;
      failAll(new Error('worker pool is closed'));
      await Promise.all(workers.map((w) => w.terminate()));
    },
  };
}

/**
 * Worker side: answer every task message with `handler(task)`. Errors are sent back as
 * messages; the thread stays up. Call once at the top of the worker module.
 */
export function serveTasks<T, R>(handler: (task: T, data: unknown) => Promise<R> | R): void {
  const port = parentPort;
  if (!port) throw new Error('serveTasks must run in a worker thread');
  port.on('message', async (msg: { id: number; task: T }) => {
    try {
      const result = await handler(msg.task, threadData);
      port.postMessage({ id: msg.id, ok: true, result } satisfies Reply);
    } catch (err) {
      const error = err instanceof Error ? (err.stack ?? err.message) : String(err);
      port.postMessage({ id: msg.id, ok: false, error } satisfies Reply);
    }
  });
}

/**
 * Run `lanes` copies of an async loop at once and wait until every one has stopped. After the
 * first failure `stopped()` turns true so the others finish their current item and return;
 * then the first error is thrown. (Promise.all would return while the others still write into
 * a folder the caller is about to remove.)
 */
export async function runLanes(lanes: number, lane: (stopped: () => boolean) => Promise<void>): Promise<void> {
  let failed = false;
  const stopped = () => failed;
  const settled = await Promise.allSettled(
    Array.from({ length: Math.max(0, lanes) }, () =>
      lane(stopped).catch((err: unknown) => {
        failed = true;
        throw err;
      }),
    ),
  );
  const rejected = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
  if (rejected) throw rejected.reason;
}
