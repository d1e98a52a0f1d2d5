import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import type { PlantTruth } from '../../src/plant/plant-activations.js';
import { readGroupStage, writeGroupStage, type GroupStage } from '../../src/sweep/stage-cache.js';

const dir = mkdtempSync(join(tmpdir(), 'boldsweep-stage-cache-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('group stage cache', () => {
  const data = new Float32Array(4 * 3 * 2 * 5);
  createRng(9).fillNormal(data, 100, 10);
  const truth = { dims: [4, 3, 2], mask: new Uint8Array(24), profile: new Float32Array(24), timeCourse: new Float64Array(5), seed: 3 } as unknown as PlantTruth;
  const stage: GroupStage = {
    volume: makeVolume({ dims: [4, 3, 2, 5], spacingMm: [2, 2, 3], trSec: 1.5, affine: identityAffine(), data }),
    truth, context: { sidecar: null, events: [], mask: null }, notes: [],
  };

  it('reads a stage back into a new array or into the array a caller gives', async () => {
    await writeGroupStage(dir, 'g1', stage);
    const fresh = readGroupStage(dir, 'g1')!;
    expect(Array.from(fresh.volume.data)).toEqual(Array.from(data));
    expect(fresh.volume.dims).toEqual([4, 3, 2, 5]);
    expect(fresh.truth.seed).toBe(3);
    const mine = new Float32Array(120);
    const asked: number[] = [];
    const into = readGroupStage(dir, 'g1', (length) => { asked.push(length); return mine; })!;
    expect(asked).toEqual([120]);
    expect(into.volume.data).toBe(mine);
    expect(Array.from(mine)).toEqual(Array.from(data));
    expect(Array.from(into.volume.affine)).toEqual(Array.from(identityAffine()));
  });
  it('gives null for a missing stage or voxel data of the wrong size', async () => {
    expect(readGroupStage(dir, 'nothing', (n) => new Float32Array(n))).toBeNull();
    await writeGroupStage(dir, 'g2', stage);
    writeFileSync(join(dir, 'groups', 'g2.f32'), new Uint8Array(16));
    expect(readGroupStage(dir, 'g2')).toBeNull();
    expect(readGroupStage(dir, 'g2', (n) => new Float32Array(n))).toBeNull();
  });
});
