// Worker thread entry for estimateRunMotion: answers RegisterVolumesTask messages with
// registerVolumesTask's result. Runs as compiled JavaScript (dist/src/register/register-worker.js);
// see resolveWorkerScript in src/core/worker-pool.ts.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { registerVolumesTask, type RegisterVolumesTask } from './register-volumes-task.js';

serveWorkerTasks((task: RegisterVolumesTask) => registerVolumesTask(task));
