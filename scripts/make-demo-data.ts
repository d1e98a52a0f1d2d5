/**
 * Writes the demo run (an invented digital phantom) into a folder:
 *   node dist/scripts/make-demo-data.js data-demo
 * The output is byte-for-byte reproducible: test/simulate/demo-data.test.ts regenerates it and
 * compares every file with the committed data-demo/.
 */
import { statSync } from 'node:fs';
import { demoPhantomSpec } from '../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../src/simulate/simulate-phantom-run.js';
import { writePhantomRun } from '../src/simulate/write-phantom-run.js';
import { simulatePhaseEncodePair } from '../src/simulate/simulate-phase-encode-pair.js';
import { writePhaseEncodePair } from '../src/simulate/write-phase-encode-pair.js';
import { simulatePhantomStructural } from '../src/simulate/simulate-phantom-structural.js';
import { simulatePhantomTemplate } from '../src/simulate/simulate-phantom-template.js';
import { writePhantomAnatomy } from '../src/simulate/write-phantom-anatomy.js';

/** File name stem of the demo run (BIDS-like: subject and task entities). */
export const DEMO_BASE_NAME = 'sub-phantom01_task-flicker';
/** Subject entity of the demo run's reversed phase-encode pair (`<subject>_dir-<label>_epi`). */
export const DEMO_SUBJECT = 'sub-phantom01';

async function main(): Promise<void> {
  const dir = process.argv[2];
  if (!dir) {
    process.stderr.write('usage: node dist/scripts/make-demo-data.js OUTPUT_FOLDER\n');
    process.exitCode = 2;
    return;
  }
  const spec = demoPhantomSpec();
  const run = simulatePhantomRun(spec);
  const files = await writePhantomRun(dir, run, DEMO_BASE_NAME);
  // the reversed phase-encode pair of the same head, for unwarping (its own streams from the run's seed)
  const pairFiles = await writePhaseEncodePair(dir, simulatePhaseEncodePair(demoPhantomSpec()), DEMO_SUBJECT);
  // the structural image beside the run (BIDS naming) and boldsweep's own template
  const anatomy = await writePhantomAnatomy(dir, run.truth.spec, { structural: simulatePhantomStructural(spec), template: simulatePhantomTemplate(spec) }, DEMO_BASE_NAME.split('_')[0]);
  let total = 0;
  for (const path of [...Object.values(files), ...pairFiles, ...Object.values(anatomy)]) {
    const bytes = statSync(path).size;
    total += bytes;
    process.stdout.write(`${path}\t${bytes} bytes\n`);
  }
  process.stdout.write(`total ${(total / 2 ** 20).toFixed(2)} MiB; dims ${run.volume.dims.join(' x ')}, TR ${run.volume.trSec} s\n`);
}

await main();
