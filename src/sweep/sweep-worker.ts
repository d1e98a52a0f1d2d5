// Worker thread of a sweep: runs tasks (one group's cells, one setting's tSNR, or one step's estimate)
// with the same code as the main thread. Before a task it imports the modules that register the
// recipe's user steps (registerStep's `module`), once each, so those steps exist in this thread too.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { runEstimateTask, runNullTask, runSweepTask, runTsnrTask } from './cell-pipeline.js';
import { importStepModules } from './import-step-modules.js';
import type { CellResult, EstimateResult, NullResult, SweepJob, TsnrResult } from './sweep-task.js';

serveWorkerTasks<SweepJob, CellResult[] | TsnrResult | EstimateResult | NullResult>(async (job) => {
  await importStepModules(job.context.stepModules);
  return job.kind === 'tsnr' ? runTsnrTask(job) : job.kind === 'estimate' ? runEstimateTask(job) : job.kind === 'null' ? runNullTask(job) : runSweepTask(job);
});
