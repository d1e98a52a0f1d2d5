import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { fail } from '../core/fail.js';

/**
 * SHA-256 of a file's bytes, streamed (the file is never held in memory whole), for the decision
 * record: it identifies exactly which input a result came from.
 * @param path - the file
 * @returns lowercase hex digest (64 characters)
 * @throws BoldsweepError FILE_NOT_FOUND or READ_FAILED
 * @example const digest = await hashFile('sub-01_task-rest_bold.nii.gz')
 */
export async function hashFile(path: string): Promise<string> {
  const hash = createHash('sha256');
  try {
    for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) hash.update(chunk as Buffer);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') fail('FILE_NOT_FOUND', `no file at ${path}`, { file: path, cause: e });
    fail('READ_FAILED', `cannot read ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
  return hash.digest('hex');
}
