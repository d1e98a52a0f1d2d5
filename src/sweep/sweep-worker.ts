// Worker thread of a sweep: runs tasks (one group's cells, or one setting's tSNR) with the same code as the main thread.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { runSweepTask, runTsnrTask } from './cell-pipeline.js';
import type { CellResult, SweepJob, TsnrResult } from './sweep-task.js';

serveWorkerTasks<SweepJob, CellResult[] | TsnrResult>((job) => (job.kind === 'tsnr' ? runTsnrTask(job) : runSweepTask(job)));
