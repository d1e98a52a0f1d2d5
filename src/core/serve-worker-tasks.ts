import { parentPort, type Transferable } from 'node:worker_threads';
import { fail } from './fail.js';
import type { WorkerReply, WorkerRequest } from './worker-pool.js';

const TRANSFER = Symbol('transfer');

/** A worker result that should move these buffers to the main thread instead of copying them. */
export interface WithTransfer<R> { [TRANSFER]: true; value: R; transfer: Transferable[] }

/**
 * Mark a worker result whose buffers should be transferred (moved) rather than copied.
 * @param value - the result
 * @param transfer - buffers inside it to move
 * @returns a wrapper {@link serveWorkerTasks} understands
 * @example return withTransfer({ map }, [map.buffer])
 */
export function withTransfer<R>(value: R, transfer: Transferable[]): WithTransfer<R> {
  return { [TRANSFER]: true, value, transfer };
}

function isWithTransfer(x: unknown): x is WithTransfer<unknown> {
  return typeof x === 'object' && x !== null && (x as Record<symbol, unknown>)[TRANSFER] === true;
}

/**
 * Inside a worker script: answer tasks from a {@link WorkerPool} with `handler`, one at a time.
 * Errors are sent back with name, message and (for BoldsweepError) code and details.
 * @param handler - computes one task's result (may be async; may return {@link withTransfer})
 * @returns nothing; the worker stays alive until the pool terminates it
 * @example
 * // my-worker.ts
 * serveWorkerTasks((task: Task) => compute(task));
 */
export function serveWorkerTasks<T, R>(handler: (task: T) => R | WithTransfer<R> | Promise<R | WithTransfer<R>>): void {
  const port = parentPort;
  if (!port) fail('INVALID_ARGUMENT', 'serveWorkerTasks was called in the main thread; call it only inside a worker script');
  port.on('message', async (msg: WorkerRequest<T>) => {
    try {
      const out = await handler(msg.task);
      if (isWithTransfer(out)) {
        const reply: WorkerReply<R> = { id: msg.id, ok: true, result: out.value as R };
        port.postMessage(reply, out.transfer);
      } else {
        const reply: WorkerReply<R> = { id: msg.id, ok: true, result: out };
        port.postMessage(reply);
      }
    } catch (e) {
      const err = e as { name?: string; message?: string; code?: string; details?: Record<string, unknown> };
      const reply: WorkerReply<R> = {
        id: msg.id,
        ok: false,
        error: { name: err?.name ?? 'Error', message: err?.message ?? String(e), code: err?.code, details: err?.details ? { ...err.details } : undefined },
      };
      port.postMessage(reply);
    }
  });
}
