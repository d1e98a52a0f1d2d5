import { readFile } from 'node:fs/promises';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';

/** Column names of a motion table file, in order: shifts in mm, rotations in degrees (about x, y, z). */
export const MOTION_TABLE_COLUMNS = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;

/**
 * Parse a motion table: tab-separated, one row per volume in volume order, a header naming at least the
 * columns of {@link MOTION_TABLE_COLUMNS} (any order; other columns ignored). Shifts are mm and
 * rotations degrees, relative to the head's reference position.
 * @param text - file contents
 * @param source - name for messages
 * @returns one row per volume, `volume` = row index (0-based)
 * @throws BoldsweepError MOTION_TABLE_INVALID naming the missing column or the bad cell
 * @example parseMotionTable('shiftXMm\tshiftYMm\tshiftZMm\trotXDeg\trotYDeg\trotZDeg\n0\t0\t0\t0\t0\t0\n')
 */
export function parseMotionTable(text: string, source = 'motion table'): MotionRow[] {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  if (lines.length < 2) fail('MOTION_TABLE_INVALID', `${source} has no rows (a header line, then one row per volume)`);
  const header = lines[0].split('\t').map((h) => h.trim());
  const at = MOTION_TABLE_COLUMNS.map((c) => header.indexOf(c));
  const missing = MOTION_TABLE_COLUMNS.filter((_, i) => at[i] < 0);
  if (missing.length) fail('MOTION_TABLE_INVALID', `${source} lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} (its header must name ${MOTION_TABLE_COLUMNS.join(', ')}, tab-separated)`);
  return lines.slice(1).map((line, r) => {
    const cells = line.split('\t');
    const value = (i: number): number => {
      const text = (cells[at[i]] ?? '').trim();
      const x = Number(text);
      if (text === '' || !Number.isFinite(x)) fail('MOTION_TABLE_INVALID', `${source} row ${r + 1} (volume ${r}): ${MOTION_TABLE_COLUMNS[i]} is '${text}', not a finite number`);
      return x;
    };
    return { volume: r, shiftXMm: value(0), shiftYMm: value(1), shiftZMm: value(2), rotXDeg: value(3), rotYDeg: value(4), rotZDeg: value(5) };
  });
}

/**
 * Read a motion table file (see {@link parseMotionTable}).
 * @param path - the .tsv file
 * @returns one row per volume
 * @throws BoldsweepError FILE_NOT_FOUND, MOTION_TABLE_INVALID
 * @example const table = await readMotionTable('sub-01_motion.tsv')
 */
export async function readMotionTable(path: string): Promise<MotionRow[]> {
  const text = await readFile(path, 'utf8').catch((e: NodeJS.ErrnoException) => fail('FILE_NOT_FOUND', `cannot read the motion table ${path}: ${e.message}`, { file: path }));
  return parseMotionTable(text, path);
}

/**
 * A motion table as the text of a file {@link parseMotionTable} reads.
 * @param rows - one row per volume
 * @returns tab-separated text with a header line
 * @example motionTableToTsv(simulatedMotionTable(...))
 */
export function motionTableToTsv(rows: readonly MotionRow[]): string {
  return [MOTION_TABLE_COLUMNS.join('\t'), ...rows.map((r) => MOTION_TABLE_COLUMNS.map((c) => String(r[c])).join('\t'))].join('\n') + '\n';
}
