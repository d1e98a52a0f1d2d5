import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readEvents } from '../../src/io/events.js';
import { readNifti } from '../../src/io/nifti-read.js';
import { readSidecar } from '../../src/io/sidecar.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { writePhantomRun } from '../../src/simulate/write-phantom-run.js';
import { quietSpec } from './phantom-helpers.js';

describe('writing a phantom run', () => {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-phantom-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const run = simulatePhantomRun(quietSpec({ nVolumes: 3, thermalNoiseSd: 11, rician: true, motion: { jerk: { volume: 2, shiftMm: [1, 0, 0], rotationDeg: [0, 0, 0] } }, spikes: [{ volume: 1, amplitude: 1500 }] }));
  const before = Float32Array.from(run.volume.data);

  it('writes the run, sidecar, events and truth files that read back as written', async () => {
    const files = await writePhantomRun(join(dir, 'new-folder'), run, 'sub-test_task-flicker');
    expect(Array.from(run.volume.data)).toEqual(Array.from(before));
    const bold = await readNifti(files.bold);
    expect(bold.info.datatype).toBe('int16');
    expect(bold.volume.dims).toEqual(run.volume.dims);
    expect(bold.volume.trSec).toBe(2);
    // stored as whole units: each value is the simulated one rounded
    let worst = 0;
    bold.volume.data.forEach((v, i) => { worst = Math.max(worst, Math.abs(v - Math.round(run.volume.data[i]))); });
    expect(worst).toBe(0);
    const sidecar = await readSidecar(files.sidecar);
    expect(sidecar.RepetitionTime).toBe(2);
    expect(sidecar.SliceTiming).toEqual(run.sidecar.SliceTiming);
    expect(sidecar.PhaseEncodingDirection).toBe('j');
    expect(sidecar.TotalReadoutTime).toBeCloseTo(0.00035 * 25, 12);
    expect(await readEvents(files.events)).toEqual(run.events);
    const labels = await readNifti(files.tissue);
    expect(Array.from(labels.volume.data)).toEqual(Array.from(run.truth.tissueLabels.data));
    const fractions = await readNifti(files.fractions);
    expect(fractions.volume.dims[3]).toBe(5);
    const truth = JSON.parse(readFileSync(files.truth, 'utf8'));
    expect(truth.motionTable.rows).toHaveLength(3);
    expect(truth.motionTable.rows).toEqual(run.truth.motionTable);
    expect(truth.spikes.list).toEqual(run.truth.spikes);
    expect(truth.steadyState.firstSteadyVolume).toBe(4);
    expect(truth.tissues['grey-matter'].source).toMatch(/Wansapura/);
  });

  it('rejects a base name with a folder in it', async () => {
    await expect(writePhantomRun(dir, run, '../escape')).rejects.toThrow(/baseName/);
  });
});
