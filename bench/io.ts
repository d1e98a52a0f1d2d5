/**
 * NIfTI input/output on a seeded 64 x 64 x 36 x 200 float32 run (113 MiB of voxels): a smooth
 * ellipsoidal "head" (~1000) plus Gaussian noise (sd 20), so gzip sees realistic, poorly
 * compressible data. Every timing is the median of 5 after one warm-up.
 *  - read: readNifti of the .nii.gz against the floor of fs.readFile + zlib.gunzipSync of the same
 *    file (the least any reader of that file must do), and of the .nii against fs.readFile alone.
 *  - write: writeNifti to .nii.gz (gzip level 6) and to .nii (both atomic, with fsync).
 * MB/s counts voxel bytes (nx*ny*nz*nt*4, 1 MB = 1e6 bytes). Prints
 *   bench io-read-MBps, bench io-write-MBps (the .nii.gz figures), ratio io-read-vs-floor (our time /
 *   floor time; 1 = no overhead), and the same for plain .nii as io-read-plain-MBps, io-write-plain-MBps,
 *   ratio io-read-plain-vs-floor.
 */
import { readFile } from 'node:fs/promises';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { readNifti } from '../src/io/nifti-read.js';
import { writeNifti } from '../src/io/nifti-write.js';
import { noisyHeadRun, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const REPEATS = 5;

/** Median seconds of `REPEATS` calls after one warm-up call. */
const timeIt = (fn: () => unknown) => timeMedianSec(fn, { repeats: REPEATS, warmUp: 1 });

const fmt = (x: number) => x.toFixed(3);

/**
 * Run the NIfTI read/write benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const run = noisyHeadRun({ dims: DIMS, spacingMm: [3, 3, 3], seed: 20240612, noiseSd: 20, trSec: 2 });
  const megabytes = run.data.byteLength / 1e6;
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-io-'));
  try {
    const gz = join(dir, 'run.nii.gz');
    const plain = join(dir, 'run.nii');
    const writeGzSec = await timeIt(() => writeNifti(gz, run));
    const writePlainSec = await timeIt(() => writeNifti(plain, run));

    const readGzSec = await timeIt(() => readNifti(gz));
    const floorGzSec = await timeIt(async () => gunzipSync(await readFile(gz)));
    const readPlainSec = await timeIt(() => readNifti(plain));
    const floorPlainSec = await timeIt(() => readFile(plain));

    // a correctness guard so a fast-but-wrong reader cannot pass unnoticed
    const back = (await readNifti(gz)).volume.data;
    for (let i = 0; i < back.length; i += 9973) if (back[i] !== run.data[i]) throw new Error(`read-back differs at voxel ${i}`);

    console.log(`bench io-read-MBps ${fmt(megabytes / readGzSec)} MB/s`);
    console.log(`bench io-write-MBps ${fmt(megabytes / writeGzSec)} MB/s`);
    console.log(`ratio io-read-vs-floor ${fmt(readGzSec / floorGzSec)}`);
    console.log(`bench io-read-plain-MBps ${fmt(megabytes / readPlainSec)} MB/s`);
    console.log(`bench io-write-plain-MBps ${fmt(megabytes / writePlainSec)} MB/s`);
    console.log(`ratio io-read-plain-vs-floor ${fmt(readPlainSec / floorPlainSec)}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
