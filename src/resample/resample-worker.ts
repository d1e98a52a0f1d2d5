// Worker thread entry for resampleRun: answers ResampleVolumesTask messages. Runs as compiled
// JavaScript (dist/src/resample/resample-worker.js); see resolveWorkerScript in src/core/worker-pool.ts.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { resampleVolumesTask, type ResampleVolumesTask } from './resample-volumes-task.js';

serveWorkerTasks((task: ResampleVolumesTask) => resampleVolumesTask(task));
