import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Dependencies whose versions shape the numbers or the charts. */
const RECORDED = ['nifti-reader-js', 'zod', '@stdlib/stats-base-dists-t-quantile', '@stdlib/stats-base-dists-normal-quantile', 'vega', 'vega-lite', 'danfojs'];

/**
 * The folder holding boldsweep's package.json (found from this file, in src/ or dist/src/).
 * @returns absolute path
 * @example join(packageRoot(), 'data-demo')
 */
export function packageRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const p = join(dir, 'package.json');
    if (existsSync(p) && (JSON.parse(readFileSync(p, 'utf8')) as { name?: string }).name === 'boldsweep') return dir;
    const up = dirname(dir);
    if (up === dir) throw new Error('boldsweep package.json not found above ' + fileURLToPath(import.meta.url));
    dir = up;
  }
}

/**
 * Versions of boldsweep, Node and the dependencies that shape results (installed versions when
 * found, else the declared range).
 * @returns { boldsweep, node, platform, dependencies }
 * @example softwareVersions().boldsweep // '0.1.0'
 */
export function softwareVersions(): { boldsweep: string; node: string; platform: string; dependencies: Record<string, string> } {
  const root = packageRoot();
  const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string; dependencies?: Record<string, string> };
  const dependencies: Record<string, string> = {};
  for (const name of RECORDED) {
    const installed = join(root, 'node_modules', name, 'package.json');
    if (existsSync(installed)) dependencies[name] = (JSON.parse(readFileSync(installed, 'utf8')) as { version: string }).version;
    else if (pkg.dependencies?.[name]) dependencies[name] = pkg.dependencies[name];
  }
  return { boldsweep: pkg.version, node: process.version, platform: `${process.platform}-${process.arch}`, dependencies };
}
