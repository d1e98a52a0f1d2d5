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
import { diagonalAffine } from '../src/core/affine.js';
import { createRng } from '../src/core/random.js';
import { makeVolume, type Volume } from '../src/core/volume.js';
import { readNifti } from '../src/io/nifti-read.js';
import { writeNifti } from '../src/io/nifti-write.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const REPEATS = 5;

function makeBenchRun(): Volume {
  const [nx, ny, nz, nt] = DIMS;
  const n = nx * ny * nz;
  const base = new Float32Array(n);
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const r2 = ((i - 31.5) / 26) ** 2 + ((j - 31.5) / 30) ** 2 + ((k - 17.5) / 16) ** 2;
    base[i + nx * (j + ny * k)] = r2 <= 1 ? 1000 * (1 - 0.3 * r2) : 20;
  }
  const data = new Float32Array(n * nt);
  createRng(20240612).fillNormal(data, 0, 20);
  for (let t = 0; t < nt; t++) for (let v = 0; v < n; v++) data[t * n + v] += base[v];
  return makeVolume({ dims: DIMS, spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data });
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Median seconds of `REPEATS` calls after one warm-up call. */
async function timeIt(fn: () => Promise<unknown> | unknown): Promise<number> {
  await fn();
  const times: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    const t0 = process.hrtime.bigint();
    await fn();
    times.push(Number(process.hrtime.bigint() - t0) / 1e9);
  }
  return median(times);
}

const fmt = (x: number) => x.toFixed(3);

/**
 * Run the NIfTI read/write benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const run = makeBenchRun();
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
