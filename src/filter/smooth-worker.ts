// Worker thread entry for smoothRun: answers SmoothVolumesTask messages. Runs as compiled
// JavaScript (dist/src/filter/smooth-worker.js); see resolveWorkerScript in src/core/worker-pool.ts.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { smoothVolumesTask, type SmoothVolumesTask } from './smooth-volumes-task.js';

serveWorkerTasks((task: SmoothVolumesTask) => smoothVolumesTask(task));
