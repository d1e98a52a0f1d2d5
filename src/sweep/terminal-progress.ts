import cliProgress from 'cli-progress';
import { nullDesignsText, type SweepProgress } from './progress.js';
import { plainProgressLines } from './plain-progress-lines.js';

/**
 * Progress of a sweep on stderr for `runSweep`'s `onProgress`, so a command's stdout stays clean: a
 * bar (cli-progress) on a terminal; otherwise plain lines (a cluster job's log, a pipe) every 10 % of
 * the cells or every 10 s, whichever comes first, and one at the end.
 * @param stream - where to write. __Default value:__ process.stderr
 * @returns the callback and a `stop` to call when the sweep ends
 * @example const bar = terminalProgress(); try { await runSweep(run, spec, { onProgress: bar.update }) } finally { bar.stop() }
 */
export function terminalProgress(stream: NodeJS.WriteStream = process.stderr): { update: (p: SweepProgress) => void; stop: () => void } {
  if (!stream.isTTY) return plainProgressLines((line) => stream.write(line + '\n'));
  const bar = new cliProgress.SingleBar({
    format: 'sweep [{bar}] {percentage}% | {value}/{total} cells | {cached} from cache{phase} | {duration}s elapsed | ETA {eta}s',
    stream,
    hideCursor: true,
    noTTYOutput: false,
    etaBuffer: 20,
  }, cliProgress.Presets.shades_classic);
  let started = false;
  return {
    update(p) {
      const phase = nullDesignsText(p).replace(',', ' |');
      if (!started) { bar.start(p.total, p.done, { cached: p.fromCache, phase }); started = true; }
      bar.update(p.done, { cached: p.fromCache, phase });
    },
    stop() { if (started) bar.stop(); },
  };
}
