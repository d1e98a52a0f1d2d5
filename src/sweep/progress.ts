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
  /**
   * When the threshold rule fits null designs: settings whose designs are fitted, of those that need
   * them (they come before any cell, so the cell count stands still meanwhile). Absent otherwise.
   */
  nullDesigns?: { done: number; total: number };
}

/**
 * One line describing progress, for a notebook or a log.
 * @param p - progress
 * @returns e.g. "sweep 48/160 cells (30 %), 8 from cache, 21 s elapsed, about 49 s left", or while null
 *   designs are fitted "sweep 0/160 cells (0 %), null designs for 3/8 settings first, 12 s elapsed"
 * @example progressLine({ done: 1, total: 4, fromCache: 0, elapsedSec: 2, etaSec: 6 })
 */
export function progressLine(p: SweepProgress): string {
  const pct = p.total ? Math.floor((100 * p.done) / p.total) : 100;
  const eta = Number.isFinite(p.etaSec) && p.done < p.total ? `, about ${Math.ceil(p.etaSec)} s left` : '';
  return `sweep ${p.done}/${p.total} cells (${pct} %)${p.fromCache ? `, ${p.fromCache} from cache` : ''}${nullDesignsText(p)}, ${p.elapsedSec.toFixed(0)} s elapsed${eta}`;
}

/**
 * The null-design phase in words while it lasts, else ''.
 * @param p - progress
 * @returns e.g. ", null designs for 3/8 settings first"
 * @example nullDesignsText({ done: 0, total: 4, fromCache: 0, elapsedSec: 2, etaSec: NaN, nullDesigns: { done: 1, total: 2 } })
 */
export function nullDesignsText(p: SweepProgress): string {
  const n = p.nullDesigns;
  return n && n.done < n.total ? `, null designs for ${n.done}/${n.total} settings first` : '';
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
