import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

let gcFn: (() => void) | null | undefined;

/**
 * Run a full garbage collection now, when the runtime allows it. A sweep's worker drops two or three
 * run-sized arrays per cell; V8 collects such external memory lazily, so without this a worker can
 * hold several dead copies of the run at once. Exposing `gc` this way is V8's documented
 * --expose-gc flag set at run time; it is a no-op where that fails.
 * @returns nothing
 * @example collectGarbage() // after each cell in a worker thread
 */
export function collectGarbage(): void {
  if (gcFn === undefined) {
    try {
      setFlagsFromString('--expose-gc');
      gcFn = runInNewContext('gc') as () => void;
    } catch {
      gcFn = null;
    }
  }
  gcFn?.();
}
