/** Where a sweep stands. */
export interface SweepProgress {
  /** Cells finished (computed or read from the cache). */
  done: number;
  /** Cells in this sweep (or shard). */
  total: number;
  /** Of the finished cells, how many came from the cache. */
  fromCache: number;
  /** Seconds since the sweep started. */
  elapsedSec: number;
  /** Estimated seconds left (NaN until something was computed). */
  etaSec: number;
}

/**
 * One line describing progress, for a notebook or a log.
 * @param p - progress
 * @returns e.g. "sweep 48/160 cells (30 %), 8 from cache, 21 s elapsed, about 49 s left"
 * @example progressLine({ done: 1, total: 4, fromCache: 0, elapsedSec: 2, etaSec: 6 })
 */
export function progressLine(p: SweepProgress): string {
  const pct = p.total ? Math.floor((100 * p.done) / p.total) : 100;
  const eta = Number.isFinite(p.etaSec) && p.done < p.total ? `, about ${Math.ceil(p.etaSec)} s left` : '';
  return `sweep ${p.done}/${p.total} cells (${pct} %)${p.fromCache ? `, ${p.fromCache} from cache` : ''}, ${p.elapsedSec.toFixed(0)} s elapsed${eta}`;
}

/**
 * A progress callback that rewrites one line at most every `intervalMs` (and always at the end),
 * for a notebook: pass a function that replaces the line, e.g. a tslab display from `newDisplay()`.
 * @param write - receives the new line
 * @param intervalMs - smallest time between updates. __Default value:__ 500
 * @returns the callback for `runSweep`'s `onProgress`
 * @example const line = tslab.newDisplay(); await runSweep(run, spec, { onProgress: lineProgress((s) => line.text(s)) })
 */
export function lineProgress(write: (line: string) => void, intervalMs = 500): (p: SweepProgress) => void {
  let last = -Infinity;
  return (p) => {
    const now = Date.now();
    if (p.done >= p.total || now - last >= intervalMs) {
      last = now;
      write(progressLine(p));
    }
  };
}
