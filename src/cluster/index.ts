// Running a sweep on a cluster scheduler: scripts for a Slurm job array of shards and their gathering.
export { taskMemory, MAIN_BASELINE_MIB, WORKER_BASELINE_MIB, MODEL_BYTES_PER_VOXEL, MEMORY_MARGIN, type TaskMemory, type TaskMemoryInput, type StudyMemoryInput } from './slurm-task-memory.js';
export { slurmScripts, type SlurmScriptInput, type SlurmScripts } from './slurm-scripts.js';
export { shellQuote } from './shell-quote.js';
export { findExecutable } from './find-executable.js';
export { submitSlurmJobs, type SubmittedJobs } from './submit-slurm-jobs.js';
