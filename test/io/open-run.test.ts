import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import type { ErrorCode } from '../../src/core/messages.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { writeEvents } from '../../src/io/events.js';
import { writeNifti } from '../../src/io/nifti-write.js';
import { openRun } from '../../src/io/open-run.js';
import { siblingCandidates } from '../../src/io/run-siblings.js';
import { writeSidecar } from '../../src/io/sidecar.js';

const root = mkdtempSync(join(tmpdir(), 'boldsweep-open-run-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

// 4 x 4 x 3 slices x 10 volumes; the header TR (pixdim[4]) is 2.5 s
function volume(nt: number, trSec = 2.5): Volume {
  return makeVolume({ dims: [4, 4, 3, nt], spacingMm: [3, 3, 4], trSec, affine: diagonalAffine([3, 3, 4]), data: Float32Array.from({ length: 48 * nt }, (_, i) => i % 7) });
}

let n = 0;
/** A fresh folder with a BIDS-named run, optionally with sidecar and events. */
async function bidsRun(opts: { sidecar?: Record<string, unknown>; events?: string; vol?: Volume } = {}): Promise<string> {
  const dir = join(root, `r${n++}`);
  mkdirSync(dir);
  const image = join(dir, 'sub-01_task-faces_bold.nii.gz');
  await writeNifti(image, opts.vol ?? volume(10));
  if (opts.sidecar) await writeSidecar(join(dir, 'sub-01_task-faces_bold.json'), opts.sidecar);
  if (opts.events !== undefined) writeFileSync(join(dir, 'sub-01_task-faces_events.tsv'), opts.events);
  return image;
}

async function expectCode(p: Promise<unknown>, code: ErrorCode): Promise<void> {
  const err = await p.catch((e: unknown) => e);
  if (!isBoldsweepError(err)) throw new Error(`expected ${code}, got ${String(err)}`);
  expect(err.code).toBe(code);
  expect(err.file).toBeTruthy();
}

describe('sibling names', () => {
  it('BIDS: X_bold.nii.gz -> X_bold.json and X_events.tsv; plain: name.nii -> name.json, name_events.tsv', () => {
    expect(siblingCandidates('/d/sub-01_task-a_run-2_bold.nii.gz')).toEqual({ sidecar: ['/d/sub-01_task-a_run-2_bold.json'], events: ['/d/sub-01_task-a_run-2_events.tsv'] });
    expect(siblingCandidates('/d/scan.nii')).toEqual({ sidecar: ['/d/scan.json'], events: ['/d/scan_events.tsv'] });
  });
});

describe('openRun', () => {
  let image: string;
  beforeAll(async () => {
    image = await bidsRun({ sidecar: { RepetitionTime: 2, SliceTiming: [0, 1, 0.5] }, events: 'onset\tduration\ttrial_type\n0\t4\tfaces\n10\t4\thouses\n' });
  });

  it('finds the BIDS sidecar and events; the sidecar TR wins over the header and is set on the volume', async () => {
    const run = await openRun(image);
    expect(run.trSource).toBe('sidecar');
    expect(run.volume.trSec).toBe(2);
    expect(run.sidecar?.SliceTiming).toEqual([0, 1, 0.5]);
    expect(run.events?.map((e) => e.trialType)).toEqual(['faces', 'houses']);
    expect(run.files.sidecar).toMatch(/_bold\.json$/);
    expect(run.files.events).toMatch(/_events\.tsv$/);
    expect(run.info.transformSource).toBe('sform');
  });

  it('null disables the sidecar and events; the TR then comes from the header', async () => {
    const run = await openRun(image, { sidecar: null, events: null });
    expect(run.sidecar).toBeNull();
    expect(run.events).toBeNull();
    expect(run.files).toEqual({ image, sidecar: null, events: null });
    expect(run.trSource).toBe('header');
    expect(run.volume.trSec).toBe(2.5);
  });

  it('a plain name finds name.json beside name.nii', async () => {
    const dir = join(root, 'plain');
    mkdirSync(dir);
    await writeNifti(join(dir, 'scan.nii'), volume(10));
    await writeSidecar(join(dir, 'scan.json'), { RepetitionTime: 1.25 });
    const run = await openRun(join(dir, 'scan.nii'));
    expect(run.volume.trSec).toBe(1.25);
    expect(run.events).toBeNull();
  });

  it('explicit paths are used, and a missing explicit file is FILE_NOT_FOUND', async () => {
    const other = join(root, 'other.json');
    await writeSidecar(other, { RepetitionTime: 3 });
    expect((await openRun(image, { sidecar: other })).volume.trSec).toBe(3);
    await expectCode(openRun(image, { sidecar: join(root, 'nope.json') }), 'FILE_NOT_FOUND');
  });

  it('NOT_4D for a 3D image', async () => {
    await expectCode(openRun(await bidsRun({ vol: volume(1) })), 'NOT_4D');
  });

  it('TR_MISSING when neither the sidecar nor pixdim[4] gives a TR', async () => {
    await expectCode(openRun(await bidsRun({ vol: volume(10, 0), sidecar: { EchoTime: 0.03 } })), 'TR_MISSING');
  });

  it('SLICE_TIMING_LENGTH when SliceTiming does not have one entry per slice', async () => {
    await expectCode(openRun(await bidsRun({ sidecar: { RepetitionTime: 2, SliceTiming: [0, 0.5, 1, 1.5] } })), 'SLICE_TIMING_LENGTH');
  });

  it('SIDECAR_INVALID when a slice time is outside the header TR', async () => {
    await expectCode(openRun(await bidsRun({ sidecar: { SliceTiming: [0, 3, 1] } })), 'SIDECAR_INVALID');
  });

  it('EVENTS_BEYOND_RUN when an event starts at or after nt * TR (10 x 2 s = 20 s)', async () => {
    const ok = await bidsRun({ sidecar: { RepetitionTime: 2 }, events: 'onset\tduration\n19.9\t5\n' });
    expect((await openRun(ok)).events).toHaveLength(1); // starts inside the run (it may run past the end)
    const late = await bidsRun({ sidecar: { RepetitionTime: 2 }, events: 'onset\tduration\n0\t1\n20\t1\n' });
    await expectCode(openRun(late), 'EVENTS_BEYOND_RUN');
    // a TR in ms in the sidecar is caught before this (SIDECAR_INVALID), not misread as a long run
    const msImage = await bidsRun({ events: 'onset\tduration\n0\t1\n20\t1\n' });
    writeFileSync(msImage.replace('.nii.gz', '.json'), '{"RepetitionTime": 2000}'); // writeSidecar would refuse it
    await expectCode(openRun(msImage), 'SIDECAR_INVALID');
  });

  it("nonFinite: 'zero' is passed to the reader", async () => {
    const vol = volume(10);
    vol.data[5] = NaN;
    const img = await bidsRun({ vol, sidecar: { RepetitionTime: 2 } });
    await expectCode(openRun(img), 'NON_FINITE_VOXELS');
    expect((await openRun(img, { nonFinite: 'zero' })).info.nonFiniteCount).toBe(1);
  });
});

describe('writeEvents output is found by openRun', () => {
  it('round trip through a BIDS folder', async () => {
    const img = await bidsRun({ sidecar: { RepetitionTime: 2 } });
    const events = [{ onsetSec: 2, durationSec: 6, trialType: 'planted', modulation: 1 }];
    await writeEvents(img.replace('_bold.nii.gz', '_events.tsv'), events);
    expect((await openRun(img)).events).toEqual(events);
  });
});
