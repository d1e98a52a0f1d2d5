/**
 * Runs every benchmark in bench/ (each file exports `async function main()`) one after another and
 * lets each print its own lines: `bench NAME VALUE UNIT` or `ratio NAME VALUE` (ours / reference).
 * Benchmarks run on generated data; nothing here is a pass/fail test.
 * Usage: npm run bench [-- name ...]   (names filter by file name, e.g. `npm run bench -- smooth`)
 */
import { readdirSync } from 'node:fs';
import { cpus } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.js') && f !== 'run-all.js')
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

console.log(`bench cores ${cpus().length} count`);
let failures = 0;
for (const file of files) {
  const mod = (await import(pathToFileURL(join(here, file)).href)) as { main?: () => Promise<void> };
  if (typeof mod.main !== 'function') continue;
  try {
    await mod.main();
  } catch (e) {
    failures += 1;
    console.error(`bench ${file} failed: ${(e as Error).message}`);
  }
}
process.exit(failures > 0 ? 1 : 0);
