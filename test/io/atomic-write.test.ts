import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { writeFileAtomic, writeFileAtomicSync } from '../../src/io/atomic-write.js';
import { hashFile } from '../../src/io/hash-file.js';
import { findTool } from '../find-tool.js';

const SHA256SUM = findTool('sha256sum');

const dir = mkdtempSync(join(tmpdir(), 'boldsweep-atomic-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('writeFileAtomic / writeFileAtomicSync', () => {
  for (const [label, write] of [['async', writeFileAtomic], ['sync', async (p: string, d: string | Uint8Array | Uint8Array[]) => writeFileAtomicSync(p, d)]] as const) {
    it(`${label}: writes text, bytes and chunk lists, replaces an existing file, leaves no temp file`, async () => {
      const path = join(dir, `${label}.txt`);
      writeFileSync(path, 'old content that is longer');
      await write(path, 'new ✓');
      expect(readFileSync(path, 'utf8')).toBe('new ✓');
      await write(path, [Uint8Array.of(65, 66), new Uint8Array(0), Uint8Array.of(67)]);
      expect(readFileSync(path, 'latin1')).toBe('ABC');
      expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
    });

    it(`${label}: WRITE_FAILED for a missing folder or when the target is a folder; the temp file is removed`, async () => {
      const missing = join(dir, 'missing', 'x.txt');
      const err1 = await Promise.resolve().then(() => write(missing, 'x')).catch((e: unknown) => e);
      expect(isBoldsweepError(err1, 'WRITE_FAILED')).toBe(true);
      const folder = join(dir, `${label}-folder`);
      mkdirSync(folder);
      writeFileSync(join(folder, 'inside'), 'keep'); // a non-empty folder cannot be renamed over
      const err2 = await Promise.resolve().then(() => write(folder, 'x')).catch((e: unknown) => e);
      expect(isBoldsweepError(err2, 'WRITE_FAILED')).toBe(true);
      if (isBoldsweepError(err2)) expect(err2.file).toBe(folder);
      expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
      expect(readFileSync(join(folder, 'inside'), 'utf8')).toBe('keep');
    });
  }
});

describe('hashFile (SHA-256)', () => {
  it('"abc" gives the FIPS 180-2 example digest (NIST FIPS PUB 180-2, 2002, appendix B.1)', async () => {
    const path = join(dir, 'abc.txt');
    writeFileSync(path, 'abc');
    expect(await hashFile(path)).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
  it.skipIf(!SHA256SUM.path)('agrees with coreutils sha256sum on a multi-chunk file', async () => {
    const path = join(dir, 'big.bin');
    writeFileSync(path, Buffer.from(Array.from({ length: 3 * 1024 * 1024 + 17 }, (_, i) => (i * 31) & 255)));
    const r = spawnSync(SHA256SUM.path as string, [path], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(await hashFile(path)).toBe(r.stdout.split(/\s+/)[0]);
  });
  it('FILE_NOT_FOUND for a missing file', async () => {
    const err = await hashFile(join(dir, 'none')).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'FILE_NOT_FOUND')).toBe(true);
  });
});
