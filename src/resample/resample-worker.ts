// Worker thread entry for resampleRun: answers ResampleVolumesTask messages with the chunk's
// non-finite scan (resampleCheckedVolumes). Runs as compiled JavaScript
// (dist/src/resample/resample-worker.js); see resolveWorkerScript in src/core/worker-pool.ts.
import { serveWorkerTasks } from '../core/serve-worker-tasks.js';
import { resampleCheckedVolumes } from './resample-checked-volumes.js';
import type { ResampleVolumesTask } from './resample-volumes-task.js';

serveWorkerTasks((task: ResampleVolumesTask) => resampleCheckedVolumes(task));
