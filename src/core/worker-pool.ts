import { existsSync, statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join, relative, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, type ResourceLimits, type Transferable } from 'node:worker_threads';
import { BoldsweepError } from './errors.js';
import { fail } from './fail.js';
import { ERROR_ADVICE, messageFor, type ErrorCode } from './messages.js';

/**
 * A fixed set of worker threads running one script; tasks queue and go to the next idle worker.
 * Pair with {@link serveWorkerTasks} (src/core/serve-worker-tasks.ts) inside the worker script.
 * Large inputs should travel as SharedArrayBuffer views (shared, not copied) or be transferred.
 */
export interface WorkerPool<T, R> {
  /** Number of worker threads. */
  readonly size: number;
  /**
   * Queue a task; resolves with the worker's result, rejects with its error (a BoldsweepError keeps its code).
   * @param task - structured-cloneable task (SharedArrayBuffer views are shared, not copied)
   * @param transfer - buffers to move instead of copy
   */
  run(task: T, transfer?: readonly Transferable[]): Promise<R>;
  /** Stop all workers; queued tasks are rejected. */
  close(): Promise<void>;
}

/** Message from pool to worker. */
export interface WorkerRequest<T> { id: number; task: T }
/** Message from worker to pool. */
export type WorkerReply<R> =
  | { id: number; ok: true; result: R }
  | { id: number; ok: false; error: { name: string; message: string; code?: string; details?: Record<string, unknown> } };

interface Pending<T, R> { id: number; task: T; transfer: readonly Transferable[]; resolve: (r: R) => void; reject: (e: unknown) => void }
interface Slot<T, R> { worker: Worker; busy: Pending<T, R> | null }

/**
 * Default number of workers: the cores Node may use (os.availableParallelism()).
 * @returns a positive integer
 * @example const pool = createWorkerPool(script, { size: defaultWorkerCount() })
 */
export function defaultWorkerCount(): number {
  return Math.max(1, availableParallelism());
}

/**
 * Find the JavaScript file a worker should run. Worker threads need compiled JavaScript, but under
 * vitest (or any TypeScript runner) `new URL('./x-worker.js', import.meta.url)` points at src/,
 * where only x-worker.ts exists. When the sibling .js is missing, the same path under the package's
 * dist/ folder (what `npm run build` writes) is used instead, provided it is not older than the .ts
 * beside the requested path (a stale build would run old code).
 * @param script - URL of the worker script as seen from the calling module
 * @returns URL of an existing .js file
 * @throws BoldsweepError WORKER_SCRIPT_MISSING when neither exists (or the build is stale)
 * @example new Worker(resolveWorkerScript(new URL('./smooth-worker.js', import.meta.url)))
 */
export function resolveWorkerScript(script: URL): URL {
  const path = fileURLToPath(script);
  if (existsSync(path)) return script;
  let root = dirname(path);
  while (!existsSync(join(root, 'package.json'))) {
    const up = dirname(root);
    if (up === root) fail('WORKER_SCRIPT_MISSING', `worker script ${path} does not exist and no package.json was found above it`);
    root = up;
  }
  const rel = relative(root, path);
  const compiled = join(root, 'dist', rel);
  if (rel.startsWith('..') || !existsSync(compiled)) fail('WORKER_SCRIPT_MISSING', `worker script ${path} does not exist, nor its compiled form ${compiled}`);
  const source = path.replace(/\.js$/, '.ts');
  if (existsSync(source) && statSync(source).mtimeMs > statSync(compiled).mtimeMs) {
    fail('WORKER_SCRIPT_MISSING', `compiled worker ${compiled} is older than its source ${source.split(sep).slice(-3).join('/')}`);
  }
  return pathToFileURL(compiled);
}

/** Rebuild an error sent by a worker; BoldsweepErrors keep their code and details. */
function reviveError(e: { name: string; message: string; code?: string; details?: Record<string, unknown> }): Error {
  if (e.name === 'BoldsweepError' && e.code !== undefined && e.code in ERROR_ADVICE) {
    return new BoldsweepError(e.code as ErrorCode, e.message, { details: e.details ?? {} });
  }
  const err = new Error(e.message);
  err.name = e.name;
  return err;
}

/**
 * Start a pool of worker threads running `script` (resolved with {@link resolveWorkerScript}).
 * Idle workers are unref'd, so a pool left open never keeps the process alive.
 * @param script - worker script URL, e.g. new URL('./smooth-worker.js', import.meta.url)
 * @param options - size: number of threads (default {@link defaultWorkerCount}); resourceLimits:
 *   passed to each Worker (e.g. a small young generation for threads whose data are typed arrays)
 * @returns the pool
 * @throws BoldsweepError INVALID_ARGUMENT for a bad size, WORKER_SCRIPT_MISSING when the script is not built
 * @example
 * const pool = createWorkerPool<Task, Out>(new URL('./my-worker.js', import.meta.url), { size: 2 });
 * const out = await pool.run(task); await pool.close();
 */
export function createWorkerPool<T, R>(script: URL, options: { size?: number; resourceLimits?: ResourceLimits } = {}): WorkerPool<T, R> {
  const size = options.size ?? defaultWorkerCount();
  if (!Number.isInteger(size) || size < 1) fail('INVALID_ARGUMENT', `worker pool size must be a positive integer, got ${size}`);
  const url = resolveWorkerScript(script);
  const slots: Slot<T, R>[] = [];
  const queue: Pending<T, R>[] = [];
  let nextId = 1;
  let closed = false;

  const spawn = (): Slot<T, R> => {
    const slot: Slot<T, R> = { worker: new Worker(url, options.resourceLimits ? { resourceLimits: options.resourceLimits } : {}), busy: null };
    slot.worker.unref();
    slot.worker.on('message', (msg: WorkerReply<R>) => {
      const job = slot.busy;
      if (!job || msg.id !== job.id) return;
      slot.busy = null;
      slot.worker.unref();
      if (msg.ok) job.resolve(msg.result);
      else job.reject(reviveError(msg.error));
      dispatch();
    });
    const lost = (why: string, cause?: unknown): void => {
      const i = slots.indexOf(slot);
      if (i >= 0) slots.splice(i, 1);
      const job = slot.busy;
      slot.busy = null;
      if (job) job.reject(new BoldsweepError('WORKER_FAILED', messageFor('WORKER_FAILED', `worker thread ${why}`), { cause }));
      if (!closed) {
        slots.push(spawn());
        dispatch();
      }
    };
    slot.worker.on('error', (e) => lost(`failed: ${e instanceof Error ? e.message : String(e)}`, e));
    slot.worker.on('exit', (code) => { if (!closed && slots.includes(slot)) lost(`exited with code ${code}`); });
    return slot;
  };

  const dispatch = (): void => {
    for (const slot of slots) {
      if (queue.length === 0) return;
      if (slot.busy) continue;
      const job = queue.shift() as Pending<T, R>;
      slot.busy = job;
      slot.worker.ref();
      const req: WorkerRequest<T> = { id: job.id, task: job.task };
      slot.worker.postMessage(req, job.transfer as Transferable[]);
    }
  };

  for (let i = 0; i < size; i++) slots.push(spawn());

  return {
    size,
    run(task: T, transfer: readonly Transferable[] = []): Promise<R> {
      if (closed) return Promise.reject(new BoldsweepError('INVALID_ARGUMENT', messageFor('INVALID_ARGUMENT', 'the worker pool is closed; create a new pool')));
      return new Promise<R>((resolve, reject) => {
        queue.push({ id: nextId++, task, transfer, resolve, reject });
        dispatch();
      });
    },
    async close(): Promise<void> {
      closed = true;
      for (const job of queue.splice(0)) job.reject(new BoldsweepError('INVALID_ARGUMENT', messageFor('INVALID_ARGUMENT', 'the worker pool was closed before this task ran')));
      await Promise.all(slots.splice(0).map((s) => s.worker.terminate()));
    },
  };
}

const shared = new Map<string, WorkerPool<unknown, unknown>>();

/**
 * A pool kept for reuse across calls (one per script and size), so repeated calls (a sweep) do not
 * pay the thread start-up each time. Its idle workers are unref'd: the process can still exit.
 * @param script - worker script URL
 * @param size - number of threads
 * @returns the cached pool (created on first use)
 * @example const pool = sharedWorkerPool<Task, Out>(new URL('./smooth-worker.js', import.meta.url), 2)
 */
export function sharedWorkerPool<T, R>(script: URL, size: number = defaultWorkerCount()): WorkerPool<T, R> {
  const key = `${script.href}|${size}`;
  let pool = shared.get(key);
  if (!pool) {
    pool = createWorkerPool<unknown, unknown>(script, { size });
    shared.set(key, pool);
  }
  return pool as WorkerPool<T, R>;
}

/**
 * Close every pool made by {@link sharedWorkerPool} (for tests and orderly shutdown).
 * @returns when all their workers have stopped
 * @example await closeSharedWorkerPools()
 */
export async function closeSharedWorkerPools(): Promise<void> {
  const pools = [...shared.values()];
  shared.clear();
  await Promise.all(pools.map((p) => p.close()));
}
