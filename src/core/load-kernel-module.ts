import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { fail } from './fail.js';

/** The part of WebAssembly.Memory the kernels' callers use (the project's TypeScript lib has no WebAssembly types). */
export interface KernelMemory {
  readonly buffer: ArrayBuffer;
}

/** A compiled kernel module and what is needed to instantiate it with a fresh memory. */
export interface KernelModule {
  /**
   * A new instance working in a new memory of `pages` 64 KiB pages (made at that size and never grown:
   * growing a WebAssembly memory detaches its ArrayBuffer, and in V8 the first detach in a thread
   * switches every typed-array access of all later optimised code to a slower checked form).
   */
  instantiate(pages: number): { memory: KernelMemory; exports: Record<string, unknown> };
}

interface WasmApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: Record<string, Record<string, unknown>>) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => KernelMemory;
}
const wasm = (globalThis as unknown as { WebAssembly: WasmApi }).WebAssembly;

const compiled = new Map<string, KernelModule>();

/**
 * The WebAssembly kernel `name`, compiled from kernels/<name>.ts by `npm run build`
 * (scripts/build-kernels.mjs) into dist/kernels/<name>.wasm. Found from this file whether it runs from
 * src/ (vitest) or dist/src/; read and compiled once per thread.
 * @param name - kernel file name without extension, e.g. 'gaussian-conv'
 * @returns the compiled module
 * @throws BoldsweepError KERNEL_MISSING when the .wasm file is absent or older than its source
 * @example const k = loadKernelModule('gaussian-conv').instantiate(16); (k.exports.conv as Function)(...)
 */
export function loadKernelModule(name: string): KernelModule {
  const known = compiled.get(name);
  if (known) return known;
  let root = dirname(fileURLToPath(import.meta.url));
  while (!existsSync(join(root, 'package.json'))) {
    const up = dirname(root);
    if (up === root) fail('KERNEL_MISSING', `no package.json above ${fileURLToPath(import.meta.url)}, so dist/kernels/${name}.wasm cannot be found`);
    root = up;
  }
  const file = join(root, 'dist', 'kernels', `${name}.wasm`);
  if (!existsSync(file)) fail('KERNEL_MISSING', `WebAssembly kernel ${file} does not exist`);
  const source = join(root, 'kernels', `${name}.ts`);
  // the published package has no kernels/ folder: only a checkout can hold a newer source
  if (existsSync(source) && statSync(source).mtimeMs > statSync(file).mtimeMs) fail('KERNEL_MISSING', `WebAssembly kernel ${file} is older than its source kernels/${name}.ts`);
  const module = new wasm.Module(readFileSync(file));
  const kernel: KernelModule = {
    instantiate(pages: number) {
      const memory = new wasm.Memory({ initial: pages });
      const instance = new wasm.Instance(module, { env: { memory } });
      return { memory, exports: instance.exports };
    },
  };
  compiled.set(name, kernel);
  return kernel;
}
