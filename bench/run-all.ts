/**
 * Runs every benchmark in bench/ (each file exports `async function main()`) one after another, each
 * in its own Node process, and lets each print its own lines: `bench NAME VALUE UNIT` or `ratio NAME VALUE` (ours / reference).
 * Benchmarks run on generated data; nothing here is a pass/fail test.
 * Usage: npm run bench [-- name ...]   (names filter by file name, e.g. `npm run bench -- smooth`)
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { cpus } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.js') && f !== 'run-all.js' && f !== 'run-one.js' && f !== 'bench-kit.js')
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

console.log(`bench cores ${cpus().length} count`);
let failures = 0;
for (const file of files) {
  // Each benchmark runs in a fresh Node process: one benchmark's heap, compiled code and
  // WebAssembly memories must not slow the next one (measured: a ratio moved from 0.38 to 0.58
  // when run after the others in one process).
  const result = spawnSync(process.execPath, [join(here, 'run-one.js'), file], { stdio: 'inherit' });
  if (result.status !== 0) {
    failures += 1;
    console.error(`bench ${file} failed (exit ${result.status ?? result.signal})`);
  }
}
process.exit(failures > 0 ? 1 : 0);
