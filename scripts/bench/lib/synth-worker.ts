/**
 * Worker thread that writes a slice of a synthetic catalogue (see synthetic-catalogue.ts), so
 * the benchmark's catalogues of thousands of parts are generated on every core.
 */
import { serveTasks } from '../../../src/pipeline/worker-pool.ts';
import { writeSyntheticCatalogue, type SynthSliceTask } from './synthetic-catalogue.ts';

serveTasks<SynthSliceTask, number>(
  async (task) => (await writeSyntheticCatalogue(task.dir, task.count, { ...task.options, first: task.first })).length,
);
