import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { readEvents, writeEvents } from '../../src/io/events.js';
import type { BoldEvent } from '../../src/io/run-types.js';

const dir = mkdtempSync(join(tmpdir(), 'boldsweep-events-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

describe('readEvents (BIDS events TSV)', () => {
  it('reads onset, duration, trial_type, modulation; ignores other columns; handles n/a and CRLF', async () => {
    const text = 'onset\tduration\ttrial_type\tresponse_time\tmodulation\r\n'
      + '0\t10\tfaces\t0.5\t1.5\r\n'
      + '12.5\tn/a\thouses\tn/a\tn/a\r\n'
      + '-2\t0\tn/a\t1\t-1\r\n\r\n';
    expect(await readEvents(file('full.tsv', text))).toEqual([
      { onsetSec: 0, durationSec: 10, trialType: 'faces', modulation: 1.5 },
      { onsetSec: 12.5, durationSec: 0, trialType: 'houses', modulation: 1 }, // duration n/a = impulse, modulation n/a = 1
      { onsetSec: -2, durationSec: 0, trialType: 'task', modulation: -1 }, // BIDS allows negative onsets
    ]);
  });

  it("without trial_type every event is 'task' with modulation 1", async () => {
    expect(await readEvents(file('min.tsv', 'duration\tonset\n5\t1e1\n'))).toEqual([{ onsetSec: 10, durationSec: 5, trialType: 'task', modulation: 1 }]);
  });

  it('EVENTS_INVALID names every bad line and column', async () => {
    const path = file('bad.tsv', 'onset\tduration\ttrial_type\n0\t10\tok\nabc\t5\tx\n3\t-1\tx\n\t2\tx\n4\t2\n5\tn/a\tfine\nn/a\t1\tx\n');
    const err = await readEvents(path).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'EVENTS_INVALID')).toBe(true);
    if (!isBoldsweepError(err)) return;
    expect(err.file).toBe(path);
    const problems = err.details.problems as string[];
    expect(problems.map((p) => p.split(':')[0])).toEqual(['line 3', 'line 4', 'line 5', 'line 6', 'line 8']);
    expect(problems[0]).toContain('onset "abc"');
    expect(problems[1]).toContain('duration "-1"');
    expect(problems[3]).toContain('2 cells');
  });

  it('a header without onset/duration, or with spaces instead of tabs, is refused', async () => {
    for (const text of ['trial_type\nx\n', 'onset duration\n0 1\n', '']) {
      const err = await readEvents(file('hdr.tsv', text)).catch((e: unknown) => e);
      expect(isBoldsweepError(err, 'EVENTS_INVALID')).toBe(true);
    }
  });
});

describe('writeEvents', () => {
  it('round-trips exactly, writing modulation only when needed', async () => {
    const events: BoldEvent[] = [
      { onsetSec: 0.1, durationSec: 1 / 3, trialType: 'a b', modulation: 1 },
      { onsetSec: 1e-7, durationSec: 0, trialType: 'c', modulation: 1 },
    ];
    const plain = join(dir, 'w1.tsv');
    await writeEvents(plain, events);
    expect(readFileSync(plain, 'utf8').split('\n')[0]).toBe('onset\tduration\ttrial_type');
    expect(await readEvents(plain)).toEqual(events);
    const modulated = events.map((e, i) => ({ ...e, modulation: i - 0.25 }));
    await writeEvents(join(dir, 'w2.tsv'), modulated);
    expect(await readEvents(join(dir, 'w2.tsv'))).toEqual(modulated);
  });
  it('refuses events it could not write faithfully', async () => {
    for (const bad of [{ onsetSec: NaN, durationSec: 1, trialType: 'x', modulation: 1 }, { onsetSec: 0, durationSec: 1, trialType: 'x\ty', modulation: 1 }]) {
      const err = await writeEvents(join(dir, 'w3.tsv'), [bad]).catch((e: unknown) => e);
      expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
    }
  });
});
