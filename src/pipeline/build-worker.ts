/**
 * Worker-thread entry of the catalogue build: runs {@link createBuildTaskRunner}'s tasks sent
 * by the main thread (see worker-pool.ts). `workerData` is the {@link BuildTaskContext}.
 */
import { workerData } from 'node:worker_threads';
import { createBuildTaskRunner, type BuildTask, type BuildTaskContext, type BuildTaskResult } from './build-task.ts';
import { serveTasks } from './worker-pool.ts';

const runner = createBuildTaskRunner(workerData as BuildTaskContext);
serveTasks<BuildTask, BuildTaskResult>((task) => runner.run(task));
