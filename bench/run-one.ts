/**
 * Runs one benchmark file's `main()` in this process: `node dist/bench/run-one.js <file.js>`.
 * bench/run-all.ts starts one such process per benchmark so they cannot slow each other.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const file = process.argv[2];
if (!file) throw new Error('usage: node dist/bench/run-one.js <bench file .js>');
const here = dirname(fileURLToPath(import.meta.url));
const mod = (await import(pathToFileURL(join(here, file)).href)) as { main?: () => Promise<void> };
if (typeof mod.main !== 'function') throw new Error(`${file} exports no main()`);
await mod.main();
process.exit(0);
