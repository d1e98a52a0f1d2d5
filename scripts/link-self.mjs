// Makes node_modules/boldsweep point at this package so notebooks can `import ... from 'boldsweep'`
// with types: Node resolves a package's own name at run time, but the TypeScript compiler inside the
// notebook kernel looks the name up in node_modules. Run by `npm install` (prepare script).
import { existsSync, lstatSync, mkdirSync, symlinkSync, unlinkSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const link = join(root, 'node_modules', 'boldsweep');
if (!existsSync(join(root, 'node_modules'))) mkdirSync(join(root, 'node_modules'));
try {
  if (lstatSync(link).isSymbolicLink()) unlinkSync(link);
  else process.exit(0); // a real install of boldsweep is there: leave it alone
} catch {
  // no link yet
}
symlinkSync('..', link, 'dir');
