import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { open, rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { fail } from '../core/fail.js';

/** What {@link writeFileAtomic} accepts: bytes, UTF-8 text, or byte chunks written back to back (no concatenation copy). */
export type AtomicWriteData = Uint8Array | string | readonly Uint8Array[];

/** Temp file beside the target, so the final rename stays on one file system (rename is atomic there). */
function tempPathFor(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`);
}

function chunksOf(data: AtomicWriteData): readonly Uint8Array[] {
  if (typeof data === 'string') return [Buffer.from(data, 'utf8')];
  if (data instanceof Uint8Array) return [data];
  return data;
}

/**
 * Write a file so readers see either the old content or the complete new content, never a partial
 * file: the bytes go to a temp file in the same folder, are flushed to disk, then renamed over `path`.
 * On any failure the temp file is removed and nothing at `path` changes.
 * @param path - destination file
 * @param data - bytes, UTF-8 text, or a list of byte chunks written in order
 * @returns resolves once the file is in place
 * @throws BoldsweepError WRITE_FAILED when the folder is missing or not writable, or the disk is full
 * @example await writeFileAtomic('out/record.json', JSON.stringify(record, null, 2) + '\n')
 */
export async function writeFileAtomic(path: string, data: AtomicWriteData): Promise<void> {
  const tmp = tempPathFor(path);
  let created = false;
  try {
    const fh = await open(tmp, 'wx', 0o666);
    created = true;
    try {
      for (const chunk of chunksOf(data)) {
        let done = 0;
        while (done < chunk.byteLength) {
          const { bytesWritten } = await fh.write(chunk, done, chunk.byteLength - done);
          done += bytesWritten;
        }
      }
      await fh.datasync();
    } finally {
      await fh.close();
    }
    await rename(tmp, path);
  } catch (e) {
    if (created) await rm(tmp, { force: true }).catch(() => undefined);
    fail('WRITE_FAILED', `could not write ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
}

/**
 * Synchronous twin of {@link writeFileAtomic}, for exit handlers and scripts that cannot await.
 * @param path - destination file
 * @param data - bytes, UTF-8 text, or a list of byte chunks written in order
 * @throws BoldsweepError WRITE_FAILED when the folder is missing or not writable, or the disk is full
 * @example writeFileAtomicSync('out/scorecard.tsv', tsvText)
 */
export function writeFileAtomicSync(path: string, data: AtomicWriteData): void {
  const tmp = tempPathFor(path);
  let created = false;
  try {
    const fd = openSync(tmp, 'wx', 0o666);
    created = true;
    try {
      for (const chunk of chunksOf(data)) {
        let done = 0;
        while (done < chunk.byteLength) done += writeSync(fd, chunk, done, chunk.byteLength - done);
      }
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
  } catch (e) {
    if (created) {
      try { rmSync(tmp, { force: true }); } catch { /* the original error is the one to report */ }
    }
    fail('WRITE_FAILED', `could not write ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
}
