import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { framewiseDisplacement } from '../../src/model/framewise-displacement.js';
import { writeLookFolder } from '../../src/report/write-look-folder.js';
import { withLookMotion } from '../../src/look/with-look-motion.js';
import { motionEdgeSignature } from '../../src/look/motion-edge-signature.js';
import { edgeSides } from '../../src/look/edge-sides.js';
import { estimateLookMotion } from '../../src/look/estimate-look-motion.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { movingPhantom } from '../sweep/sweep-test-runs.js';

// The look's head motion on a phantom whose head wanders slowly and coughs once: a 2 mm, 1.5 degree
// jerk at volume 40 lasting one volume (so the head moves away at 40 and back at 41).
const motion = { wanderStepMm: 0.03, wanderStepDeg: 0.03, jerk: { volume: 40, durationVolumes: 1, shiftMm: [2, -1, 0.5] as [number, number, number], rotationDeg: [1.5, 0, -1] as [number, number, number] } };
const run = movingPhantom(motion);

describe('the look and head motion', () => {
  it('with a motion table: framewise displacement, one head-motion finding for the volumes above 0.5 mm, ranked with the volume events', () => {
    const look = lookAtRun({ volume: run.volume, sidecar: run.sidecar, events: run.events, files: { image: null, sidecar: null, events: null } } as never, { motionTable: run.motionTable, motionTableMethod: 'the phantom\'s own' });
    expect(Array.from(look.motion.fdMm!)).toEqual(Array.from(framewiseDisplacement(run.motionTable)));
    expect(look.motion.aboveThreshold).toEqual([40, 41]);
    const f = look.findings.find((x) => x.kind === 'head-motion')!;
    expect(f.volumes).toEqual([40, 41]);
    expect(f.verdict).toMatch(/^2 volumes above 0.5 mm FD \(max 5\.\d\d mm\)/);
    expect(f.consequence).toMatch(/2 of \d+ kept volumes censored when the model censors above 0.5 mm FD/);
    expect(f.evidence.thresholdMm).toBe(0.5);
    // ranked before every finding of a lower tier (single-voxel spikes and unstable voxels)
    const at = look.findings.indexOf(f);
    expect(look.findings.slice(0, at).every((x) => ['non-finite', 'empty-slices', 'non-steady-start', 'volume-jump', 'head-motion'].includes(x.kind))).toBe(true);
    // the edge signature swings at the cough: its largest value over the axes at 40 and 41 is far
    // above the wander's (median over the other volumes)
    const sig = look.motion.edgeSignature!;
    const size = (t: number) => Math.max(...sig.axes.map((a) => Math.abs(a[t])));
    const others = Array.from({ length: 78 }, (_, i) => i + 2).filter((t) => t !== 40 && t !== 41).map(size).sort((a, b) => a - b);
    expect(size(40)).toBeGreaterThan(5 * others[Math.floor(others.length / 2)]);
    expect(size(41)).toBeGreaterThan(5 * others[Math.floor(others.length / 2)]);
  });

  it('without a motion table: the edge signature only, no finding; a table of another length is refused', () => {
    const look = lookAtRun(run.volume);
    expect(look.motion.fdMm).toBeNull();
    expect(look.motion.source).toBeNull();
    expect(look.motion.edgeSignature).not.toBeNull();
    expect(look.findings.some((x) => x.kind === 'head-motion')).toBe(false);
    expect(() => lookAtRun(run.volume, { motionTable: run.motionTable.slice(1) })).toThrow(expect.objectContaining({ code: 'MOTION_TABLE_LENGTH' }));
  });

  it('the edge signature the look takes from its mask-series pass is motionEdgeSignature\'s, to the bit; a voxel near zero in two volumes in a row falls back to it', () => {
    const look = lookAtRun(run.volume);
    expect(look.motion.edgeSignature).toEqual(motionEdgeSignature(run.volume, look.mask.mask));
    // an edge voxel at 0 in volumes 30 and 31: its level there is below its floor, which the pass
    // knows only approximately, so the look computes the signature from the run instead
    const [nx, ny, nz] = run.volume.dims;
    const n = nx * ny * nz;
    const edge = edgeSides(look.mask.mask, [nx, ny, nz]).edge[100];
    const data = Float32Array.from(run.volume.data);
    data[30 * n + edge] = 0;
    data[31 * n + edge] = 0;
    const dropped = { ...run.volume, data };
    const lookDropped = lookAtRun(dropped);
    const direct = motionEdgeSignature(dropped, lookDropped.mask.mask);
    expect(lookDropped.motion.edgeSignature).toEqual(direct);
    expect(direct.axes.some((a) => a[31] !== 0)).toBe(true);
  });

  it('writes the motion figures, the FD and edge-signature columns and the motion summary', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'look-motion-'));
    try {
      const look = lookAtRun(run.volume, { motionTable: run.motionTable, fdThresholdMm: 1 });
      const files = await writeLookFolder(run.volume, look, join(dir, 'look'), { source: 'phantom' });
      expect(files).toEqual(expect.arrayContaining(['motion-table.svg', 'framewise-displacement.svg', 'edge-signature.svg']));
      const fdSvg = readFileSync(join(dir, 'look', 'framewise-displacement.svg'), 'utf8');
      expect(fdSvg).toContain('dashed: 1 mm');
      const series = readFileSync(join(dir, 'look', 'series.tsv'), 'utf8').trim().split('\n');
      const header = series[0].split('\t');
      expect(header.slice(-4)).toEqual(['fd_mm', 'edge_signature_i_pct', 'edge_signature_j_pct', 'edge_signature_k_pct']);
      expect(Number(series[41].split('\t')[header.indexOf('fd_mm')])).toBeGreaterThan(1);
      const json = JSON.parse(readFileSync(join(dir, 'look', 'findings.json'), 'utf8'));
      expect(json.motion.volumesAboveThreshold).toEqual([40, 41]);
      expect(json.motion.fdThresholdMm).toBe(1);
      const page = readFileSync(join(dir, 'look', 'look.html'), 'utf8');
      expect(page).toMatch(/Head motion:<\/b> motion table given/);
      expect(page).toContain('volumes 40-41');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});

describe('a motion table added to a finished look', () => {
  it('withLookMotion gives the look the table\'s FD and finding, ranked, and keeps the rest', () => {
    const plain = lookAtRun(run.volume);
    const moved = withLookMotion(plain, run.volume, run.motionTable, 'estimated', 'a test table');
    const direct = lookAtRun(run.volume, { motionTable: run.motionTable });
    expect(moved.motion.source).toBe('estimated');
    expect(moved.motion.aboveThreshold).toEqual(direct.motion.aboveThreshold);
    expect(moved.findings.map((f) => f.kind)).toEqual(direct.findings.map((f) => f.kind));
    expect(moved.verdicts).toEqual(moved.findings.map((f) => f.verdict));
    expect(moved.findings.find((f) => f.kind === 'head-motion')!.reason).toContain('estimated motion table (a test table)');
    expect(moved.maps).toBe(plain.maps);
    expect(plain.findings.some((f) => f.kind === 'head-motion')).toBe(false); // not modified
  });
});

describe('the look\'s own motion estimate (asked for)', () => {
  it('estimateLookMotion at the coarse levels finds the cough, and the look says how the table was made', async () => {
    const plain = lookAtRun(run.volume);
    const { table, method } = await estimateLookMotion(run.volume, plain.mask.mask, plain.recommendation.dropInitialVolumes);
    await closeSharedWorkerPools();
    expect(table).toHaveLength(80);
    expect(method).toMatch(/quick screen: rigid, least squares.*coarse levels 4 and 2 only/);
    const look = withLookMotion(plain, run.volume, table, 'estimated', method);
    // the cough moved the head by 5.7 mm (FD, true table) out and back: both volumes are above 0.5 mm
    expect(look.motion.aboveThreshold).toEqual(expect.arrayContaining([40, 41]));
    // and the wander alone (FD at most 0.25 mm in truth) flags nothing else
    expect(look.motion.aboveThreshold).toEqual([40, 41]);
  }, 120_000);
});
