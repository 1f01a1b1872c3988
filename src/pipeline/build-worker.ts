/**
 * Worker-thread entry of the catalogue build: runs the tasks the main thread sends (see
 * worker-pool.ts) with {@link createBuildTaskRunner}; `workerData` is the {@link BuildTaskContext}.
 */
import { workerData } from 'node:worker_threads';
import { createBuildTaskRunner, type BuildTask, type BuildTaskContext, type BuildTaskResult } from './build-task.ts';
import { serveTasks } from './worker-pool.ts';

const runner = createBuildTaskRunner(workerData as BuildTaskContext);
serveTasks<BuildTask, BuildTaskResult>(async (task) => (await runner).run(task));
