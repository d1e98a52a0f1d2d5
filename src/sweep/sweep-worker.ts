// Worker thread of a sweep: runs tasks (one group's cells) with the same code as the main thread.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { runSweepTask } from './cell-pipeline.js';
import type { CellResult, SweepTask } from './sweep-task.js';

serveWorkerTasks<SweepTask, CellResult[]>((task) => runSweepTask(task));
