import cliProgress from 'cli-progress';
import type { SweepProgress } from './progress.js';

/**
 * A progress bar on the terminal (cli-progress) for `runSweep`'s `onProgress`. Writes to stderr, so
 * a command's stdout stays clean; when stderr is not a terminal it prints nothing.
 * @returns the callback and a `stop` to call when the sweep ends
 * @example const bar = terminalProgress(); try { await runSweep(run, spec, { onProgress: bar.update }) } finally { bar.stop() }
 */
export function terminalProgress(): { update: (p: SweepProgress) => void; stop: () => void } {
  const bar = new cliProgress.SingleBar({
    format: 'sweep [{bar}] {percentage}% | {value}/{total} cells | {cached} from cache | {duration}s elapsed | ETA {eta}s',
    stream: process.stderr,
    hideCursor: true,
    noTTYOutput: false,
    etaBuffer: 20,
  }, cliProgress.Presets.shades_classic);
  let started = false;
  return {
    update(p) {
      if (!process.stderr.isTTY) return;
      if (!started) { bar.start(p.total, p.done, { cached: p.fromCache }); started = true; }
      bar.update(p.done, { cached: p.fromCache });
    },
    stop() { if (started) bar.stop(); },
  };
}
