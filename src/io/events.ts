import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from './atomic-write.js';
import type { BoldEvent } from './run-types.js';

/** trial_type given to events when the column is absent or 'n/a'. */
export const DEFAULT_TRIAL_TYPE = 'task';

/** Rows listed in an EVENTS_INVALID message before "and N more". */
const MAX_LISTED = 10;

/** A decimal number as text (no empty strings, no hex, no 'Infinity'). */
const NUMBER_TEXT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

const numberCell = z.string().regex(NUMBER_TEXT, 'not a number').transform(Number).pipe(z.number().finite());

/**
 * One events row as text cells -> a BoldEvent. onset may be negative (BIDS allows events before the
 * first kept volume); duration >= 0, where 'n/a' means an impulse (0 s); trial_type 'n/a' or absent
 * means 'task'; modulation absent or 'n/a' means 1.
 */
export const eventRowSchema = z
  .object({
    onset: numberCell,
    duration: z.union([z.literal('n/a').transform(() => 0), numberCell.pipe(z.number().nonnegative())]),
    trial_type: z.string().optional(),
    modulation: z.union([z.literal('n/a').transform(() => 1), numberCell]).optional(),
  })
  .transform((r): BoldEvent => ({
    onsetSec: r.onset,
    durationSec: r.duration,
    trialType: r.trial_type === undefined || r.trial_type === 'n/a' || r.trial_type === '' ? DEFAULT_TRIAL_TYPE : r.trial_type,
    modulation: r.modulation ?? 1,
  }));

/**
 * Parse the text of a BIDS events TSV (tab-separated, header row; columns onset and duration in
 * seconds required, trial_type and modulation optional, other columns ignored).
 * @param text - file contents
 * @param path - file name for messages
 * @returns the events in file order
 * @throws BoldsweepError EVENTS_INVALID naming each bad line and column
 * @example parseEvents('onset\tduration\n0\t10\n', 'events.tsv')
 */
export function parseEvents(text: string, path: string): BoldEvent[] {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  while (lines.length > 0 && lines[lines.length - 1].trim() === '') lines.pop();
  if (lines.length === 0) fail('EVENTS_INVALID', 'the file is empty (it needs a header row with onset and duration)', { file: path });
  const columns = lines[0].split('\t').map((c) => c.trim());
  const missing = ['onset', 'duration'].filter((c) => !columns.includes(c));
  if (missing.length > 0) fail('EVENTS_INVALID', `line 1 (header): missing column(s) ${missing.join(', ')}; found ${JSON.stringify(columns)} (columns must be separated by tabs)`, { file: path });
  const wanted = ['onset', 'duration', 'trial_type', 'modulation'].filter((c) => columns.includes(c));
  const events: BoldEvent[] = [];
  const problems: string[] = [];
  for (let n = 1; n < lines.length; n++) {
    const line = lines[n];
    if (line.trim() === '') continue;
    const cells = line.split('\t');
    if (cells.length !== columns.length) {
      problems.push(`line ${n + 1}: ${cells.length} cells but the header has ${columns.length}`);
      continue;
    }
    const row: Record<string, string> = {};
    for (const c of wanted) row[c] = cells[columns.indexOf(c)].trim();
    const parsed = eventRowSchema.safeParse(row);
    if (parsed.success) {
      events.push(parsed.data);
    } else {
      const what = parsed.error.issues.map((i) => `${String(i.path[0] ?? 'row')} ${JSON.stringify(row[String(i.path[0])] ?? '')}: ${i.message}`);
      problems.push(`line ${n + 1}: ${[...new Set(what)].join(', ')}`);
    }
  }
  if (problems.length > 0) {
    const listed = problems.slice(0, MAX_LISTED).join('; ');
    const more = problems.length > MAX_LISTED ? `; and ${problems.length - MAX_LISTED} more` : '';
    fail('EVENTS_INVALID', `${problems.length} bad row(s): ${listed}${more}`, { file: path, details: { problems } });
  }
  return events;
}

/**
 * Read a BIDS events TSV.
 * @param path - the .tsv file
 * @returns the events in file order
 * @throws BoldsweepError FILE_NOT_FOUND; EVENTS_INVALID naming each bad line
 * @example const events = await readEvents('sub-01_task-faces_events.tsv')
 */
export async function readEvents(path: string): Promise<BoldEvent[]> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') fail('FILE_NOT_FOUND', `no events file at ${path}`, { file: path, cause: e });
    fail('READ_FAILED', `cannot read ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
  return parseEvents(text, path);
}

/**
 * Events as BIDS TSV text: onset, duration, trial_type, and modulation only when some event has one
 * other than 1. Numbers are written in the shortest form that reads back exactly.
 * @param events - the events
 * @returns the TSV text, ending in a newline
 * @throws BoldsweepError INVALID_ARGUMENT for non-finite numbers, negative durations, or tabs/newlines in trial_type
 * @example formatEvents([{ onsetSec: 0, durationSec: 10, trialType: 'faces', modulation: 1 }])
 */
export function formatEvents(events: readonly BoldEvent[]): string {
  const withModulation = events.some((e) => e.modulation !== 1);
  const lines = [['onset', 'duration', 'trial_type', ...(withModulation ? ['modulation'] : [])].join('\t')];
  events.forEach((e, i) => {
    if (!Number.isFinite(e.onsetSec) || !Number.isFinite(e.durationSec) || e.durationSec < 0 || !Number.isFinite(e.modulation)) {
      fail('INVALID_ARGUMENT', `event ${i}: onsetSec, durationSec (>= 0) and modulation must be finite numbers, got ${JSON.stringify(e)}`);
    }
    if (/[\t\r\n]/.test(e.trialType) || e.trialType === '') fail('INVALID_ARGUMENT', `event ${i}: trialType must be non-empty without tabs or line breaks, got ${JSON.stringify(e.trialType)}`);
    lines.push([String(e.onsetSec), String(e.durationSec), e.trialType, ...(withModulation ? [String(e.modulation)] : [])].join('\t'));
  });
  return `${lines.join('\n')}\n`;
}

/**
 * Write events as a BIDS events TSV (atomic).
 * @param path - destination .tsv file
 * @param events - the events
 * @returns resolves when the file is in place
 * @throws BoldsweepError INVALID_ARGUMENT for bad events; WRITE_FAILED
 * @example await writeEvents('out/sub-01_task-faces_events.tsv', events)
 */
export async function writeEvents(path: string, events: readonly BoldEvent[]): Promise<void> {
  await writeFileAtomic(path, formatEvents(events));
}
