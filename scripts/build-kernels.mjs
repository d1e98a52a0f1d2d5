// Compiles every WebAssembly kernel in kernels/ (AssemblyScript, one file per kernel) to
// dist/kernels/<name>.wasm. Run by `npm run build` before tsc, so `npm install` (prepare), `npm test`,
// `npm run demo` and CI all get fresh kernels. The loader is src/core/load-kernel-module.ts.
// Flags: SIMD on; no runtime (kernels allocate nothing: the caller lays out the imported memory);
// memory imported from env.memory and not exported, so the caller sizes it once and never grows it.
import asc from 'assemblyscript/asc';
import { mkdirSync, readdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const sourceDir = join(root, 'kernels');
const outDir = join(root, 'dist', 'kernels');
mkdirSync(outDir, { recursive: true });
const sources = readdirSync(sourceDir).filter((f) => f.endsWith('.ts')).sort();
for (const file of sources) {
  const out = join(outDir, file.replace(/\.ts$/, '.wasm'));
  const { error, stderr } = await asc.main([
    join(sourceDir, file),
    '-O3', '--noAssert',
    '--enable', 'simd',
    '--runtime', 'stub',
    '--importMemory', '--noExportMemory',
    '--outFile', out,
  ]);
  if (error) {
    console.error(stderr.toString());
    console.error(`build-kernels: ${file} did not compile (${error.message})`);
    process.exit(1);
  }
}
