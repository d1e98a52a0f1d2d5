import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhaseEncodePair } from '../../src/simulate/simulate-phase-encode-pair.js';
import { writePhaseEncodePair } from '../../src/simulate/write-phase-encode-pair.js';

const committed = new URL('../../data-demo/', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'boldsweep-pair-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** SHA-256 of a file's content (decompressed for .gz: see demo-data.test.ts for why). */
function contentHash(path: string): string {
  const bytes = readFileSync(path);
  return createHash('sha256').update(path.endsWith('.gz') ? gunzipSync(bytes) : bytes).digest('hex');
}

describe('the demo phantom\'s reversed phase-encode pair', () => {
  it('regenerates the committed files and carries opposite directions with one readout time', async () => {
    const pair = simulatePhaseEncodePair(demoPhantomSpec());
    const files = await writePhaseEncodePair(dir, pair, 'sub-phantom01');
    expect(files.map((f) => basename(f))).toEqual(['sub-phantom01_dir-PA_epi.nii.gz', 'sub-phantom01_dir-PA_epi.json', 'sub-phantom01_dir-AP_epi.nii.gz', 'sub-phantom01_dir-AP_epi.json']);
    for (const f of files) expect(contentHash(f), basename(f)).toBe(contentHash(join(committed, basename(f))));
    const pa = JSON.parse(readFileSync(join(committed, 'sub-phantom01_dir-PA_epi.json'), 'utf8'));
    const ap = JSON.parse(readFileSync(join(committed, 'sub-phantom01_dir-AP_epi.json'), 'utf8'));
    expect([pa.PhaseEncodingDirection, ap.PhaseEncodingDirection]).toEqual(['j', 'j-']);
    expect(pa.TotalReadoutTime).toBe(ap.TotalReadoutTime);
    // same head and field, opposite shifts: the images differ only near the sinus and by noise
    expect(pair.same.volume.dims).toEqual([44, 52, 34, 3]);
    expect(Array.from(pair.same.truth.fieldMapHz.data)).toEqual(Array.from(pair.reversed.truth.fieldMapHz.data));
  }, 120_000);
});
