import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { readSidecar, writeSidecar } from '../../src/io/sidecar.js';

const dir = mkdtempSync(join(tmpdir(), 'boldsweep-sidecar-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

async function problemsOf(path: string): Promise<string[]> {
  const err = await readSidecar(path).catch((e: unknown) => e);
  if (!isBoldsweepError(err, 'SIDECAR_INVALID')) throw new Error(`expected SIDECAR_INVALID, got ${String(err)}`);
  expect(err.file).toBe(path);
  return (err.details.problems as string[] | undefined) ?? [err.message];
}

describe('readSidecar', () => {
  it('reads the known BIDS fields and passes unknown ones through', async () => {
    const content = {
      RepetitionTime: 2, SliceTiming: [0, 1, 0.5, 1.5], PhaseEncodingDirection: 'j-', TotalReadoutTime: 0.05,
      EffectiveEchoSpacing: 0.00058, EchoTime: 0.03, FlipAngle: 77, MultibandAccelerationFactor: 1,
      Manufacturer: 'Acme', Nested: { b: 1, a: [1, 2] },
    };
    const s = await readSidecar(file('ok.json', content));
    expect(s).toEqual(content);
  });

  it('lists every bad field in one SIDECAR_INVALID error', async () => {
    const problems = await problemsOf(file('bad.json', {
      RepetitionTime: -2, SliceTiming: [0, -0.5], PhaseEncodingDirection: 'y', FlipAngle: 400, MultibandAccelerationFactor: 2.5,
    }));
    const fields = problems.map((p) => p.split(':')[0]);
    expect(fields).toEqual(expect.arrayContaining(['RepetitionTime', 'SliceTiming[1]', 'PhaseEncodingDirection', 'FlipAngle', 'MultibandAccelerationFactor']));
    expect(problems.find((p) => p.startsWith('RepetitionTime'))).toContain('got -2');
  });

  it('a RepetitionTime over 100 is taken for milliseconds and refused, advising seconds', async () => {
    const [problem] = await problemsOf(file('ms.json', { RepetitionTime: 2000 }));
    expect(problem).toContain('milliseconds');
    expect(problem).toContain('write 2');
  });

  it('slice times at or beyond the TR are refused (they look like milliseconds or another run)', async () => {
    const [problem] = await problemsOf(file('slices.json', { RepetitionTime: 2, SliceTiming: [0, 1000, 500] }));
    expect(problem).toContain('SliceTiming[1]');
  });

  it('not JSON, or not an object, is SIDECAR_INVALID; a missing file is FILE_NOT_FOUND', async () => {
    await problemsOf(file('broken.json', '{"RepetitionTime": 2,'));
    await problemsOf(file('array.json', [1, 2]));
    const err = await readSidecar(join(dir, 'none.json')).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'FILE_NOT_FOUND')).toBe(true);
  });
});

describe('writeSidecar', () => {
  it('writes known fields first in a fixed order, others alphabetically, and reads back equal', async () => {
    const path = join(dir, 'out.json');
    const sidecar = { zeta: 1, EchoTime: 0.03, alpha: { y: 2, x: 1 }, RepetitionTime: 1.5 };
    await writeSidecar(path, sidecar);
    const text = readFileSync(path, 'utf8');
    expect(Object.keys(JSON.parse(text))).toEqual(['RepetitionTime', 'EchoTime', 'alpha', 'zeta']);
    expect(text.indexOf('"x"')).toBeLessThan(text.indexOf('"y"'));
    expect(await readSidecar(path)).toEqual(sidecar);
    expect(Object.keys(sidecar)).toEqual(['zeta', 'EchoTime', 'alpha', 'RepetitionTime']); // input untouched
    // same content in another key order gives the same bytes
    await writeSidecar(join(dir, 'out2.json'), { RepetitionTime: 1.5, alpha: { x: 1, y: 2 }, EchoTime: 0.03, zeta: 1 });
    expect(readFileSync(join(dir, 'out2.json'), 'utf8')).toBe(text);
  });
  it('refuses to write an invalid sidecar', async () => {
    const err = await writeSidecar(join(dir, 'bad-out.json'), { RepetitionTime: 0 }).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'SIDECAR_INVALID')).toBe(true);
  });
});
