// Worker thread of a sweep: runs tasks (one group's cells, or one setting's tSNR) with the same code as the main thread.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { runNullTask, runSweepTask, runTsnrTask } from './cell-pipeline.js';
import type { CellResult, NullResult, SweepJob, TsnrResult } from './sweep-task.js';

serveWorkerTasks<SweepJob, CellResult[] | TsnrResult | NullResult>((job) => (job.kind === 'tsnr' ? runTsnrTask(job) : job.kind === 'null' ? runNullTask(job) : runSweepTask(job)));
