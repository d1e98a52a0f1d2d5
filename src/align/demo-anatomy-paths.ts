import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** File names of the demo run's structural image and template in the package's data-demo/ (written by `npm run make-demo-data`). */
export const DEMO_ANATOMY_FILES = { structural: 'sub-phantom01_T1w.nii.gz', template: 'boldsweep-phantom-template_2mm.nii.gz' } as const;

/**
 * Paths of the demo run's structural image and template in this package's `data-demo/` folder
 * (found by walking up from this module to the package.json named boldsweep, from src/ or dist/src/).
 * @returns absolute paths, or null when the package folder cannot be found
 * @example demoAnatomyPaths()?.structural
 */
export function demoAnatomyPaths(): { structural: string; template: string } | null {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const p = join(dir, 'package.json');
    if (existsSync(p) && (JSON.parse(readFileSync(p, 'utf8')) as { name?: string }).name === 'boldsweep') {
      return { structural: join(dir, 'data-demo', DEMO_ANATOMY_FILES.structural), template: join(dir, 'data-demo', DEMO_ANATOMY_FILES.template) };
    }
    const up = dirname(dir);
    if (up === dir) return null;
    dir = up;
  }
}
