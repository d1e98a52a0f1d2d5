import { progressLine, type SweepProgress } from './progress.js';

/** Plain progress lines come at least every this many seconds (a cluster log shows the job is alive)... */
const PLAIN_LINE_EVERY_SEC = 10;
/** ...and at every this many percent of the cells. */
const PLAIN_LINE_EVERY_PCT = 10;

/**
 * Progress as plain lines: one whenever another 10 % of the cells is done or 10 s have passed since
 * the last line, and one when the last cell is done.
 * @param write - receives each line
 * @param now - clock in milliseconds (a parameter so a test can drive it). __Default value:__ Date.now
 * @returns the callback and a no-op `stop`
 * @example const p = plainProgressLines(console.error); p.update({ done: 1, total: 10, fromCache: 0, elapsedSec: 1, etaSec: 9 })
 */
export function plainProgressLines(write: (line: string) => void, now: () => number = Date.now): { update: (p: SweepProgress) => void; stop: () => void } {
  let lastStep = -1;
  let lastAt = -Infinity;
  let ended = false;
  return {
    update(p) {
      if (ended) return;
      const step = p.total ? Math.floor((100 * p.done) / p.total / PLAIN_LINE_EVERY_PCT) : 0;
      const t = now();
      const end = p.done >= p.total;
      if (end || step > lastStep || t - lastAt >= PLAIN_LINE_EVERY_SEC * 1000) {
        lastStep = step;
        lastAt = t;
        ended = end;
        write(progressLine(p));
      }
    },
    stop() { /* lines need no clean-up */ },
  };
}
