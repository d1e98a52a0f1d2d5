import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, join } from 'node:path';

/**
 * The first executable file called `name` in the folders of PATH.
 * @param name - e.g. "sbatch"
 * @param pathList - the search path (default: this process's PATH)
 * @returns its absolute path, or null when there is none
 * @example findExecutable('sbatch') // '/usr/bin/sbatch'
 */
export function findExecutable(name: string, pathList: string = process.env.PATH ?? ''): string | null {
  for (const dir of pathList.split(delimiter)) {
    if (!dir) continue;
    const p = join(dir, name);
    try {
      if (!statSync(p).isFile()) continue;
      accessSync(p, constants.X_OK);
      return p;
    } catch {
      // not here
    }
  }
  return null;
}
