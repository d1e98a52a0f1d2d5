import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { writePhantomRun } from '../../src/simulate/write-phantom-run.js';
import { simulatePhantomStructural } from '../../src/simulate/simulate-phantom-structural.js';
import { simulatePhantomTemplate } from '../../src/simulate/simulate-phantom-template.js';
import { writePhantomAnatomy } from '../../src/simulate/write-phantom-anatomy.js';

const committed = new URL('../../data-demo/', import.meta.url).pathname;
const BASE = 'sub-phantom01_task-flicker';

/**
 * SHA-256 of a file's content; for .gz files, of the decompressed bytes. The uncompressed content
 * (NIfTI header and voxels) is what the simulation fixes; the compressed bytes also depend on the
 * zlib build (Node bundles a zlib whose match finder can use CPU-specific hashing), so comparing
 * them would test the machine, not the phantom. (On the machine that made data-demo/, the .gz files
 * come out byte-identical too.)
 */
function contentHash(path: string): string {
  const bytes = readFileSync(path);
  return createHash('sha256').update(path.endsWith('.gz') ? gunzipSync(bytes) : bytes).digest('hex');
}

describe('committed demo data', () => {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-demo-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('regenerating data-demo/ gives the same content, file by file', async () => {
    expect(existsSync(committed), 'data-demo/ exists').toBe(true);
    const files = await writePhantomRun(dir, simulatePhantomRun(demoPhantomSpec()), BASE);
    const written = Object.values(files).map((p) => p.slice(dir.length + 1)).sort();
    const inRepo = readdirSync(committed).filter((f) => f.startsWith(`${BASE}_`)).sort();
    expect(inRepo).toEqual(written);
    for (const name of written) {
      expect(contentHash(join(dir, name)), name).toBe(contentHash(join(committed, name)));
    }
    const made = JSON.parse(readFileSync(join(committed, `${BASE}_truth.json`), 'utf8'));
    expect(made.steadyState.firstSteadyVolume).toBe(4);
  }, 120_000);

  it('regenerating the structural image and the template gives the same content, and data-demo/ stays under 20 MB', async () => {
    const spec = demoPhantomSpec();
    const files = await writePhantomAnatomy(dir, spec, { structural: simulatePhantomStructural(spec), template: simulatePhantomTemplate(spec) }, 'sub-phantom01');
    const names = Object.values(files).map((p) => p!.slice(dir.length + 1)).sort();
    expect(names).toEqual(['boldsweep-phantom-template_2mm.nii.gz', 'sub-phantom01_T1w.json', 'sub-phantom01_T1w.nii.gz']);
    for (const name of names) expect(contentHash(join(dir, name)), name).toBe(contentHash(join(committed, name)));
    const total = readdirSync(committed).reduce((sum, f) => sum + statSync(join(committed, f)).size, 0);
    // the repository keeps its demo data small (a limit the maintainers set: 20 MB)
    expect(total).toBeLessThan(20 * 2 ** 20);
  }, 120_000);
});
