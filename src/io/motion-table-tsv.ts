import { readFile } from 'node:fs/promises';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';

/** Column names of a motion table file, in order: shifts in mm, rotations in degrees (about x, y, z). */
export const MOTION_TABLE_COLUMNS = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;

/**
 * The extra columns of a 12-parameter (affine) motion table, after the six above: scale factors
 * (1 = none) and shears (unitless), in the order of motionParametersAffine (src/register).
 */
export const AFFINE_MOTION_COLUMNS = ['scaleX', 'scaleY', 'scaleZ', 'shearXY', 'shearXZ', 'shearYZ'] as const;

/** A motion-table row with the six affine terms (an affine motion estimate). */
export type AffineMotionRow = MotionRow & Record<(typeof AFFINE_MOTION_COLUMNS)[number], number>;

/**
 * Parse a motion table: tab-separated, one row per volume in volume order, a header naming at least the
 * columns of {@link MOTION_TABLE_COLUMNS} (any order; other columns ignored). Shifts are mm and
 * rotations degrees, relative to the head's reference position. When the header names all six
 * {@link AFFINE_MOTION_COLUMNS} too, each row also carries them (an {@link AffineMotionRow}).
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
  // the affine columns are read when all six are there (a 12-parameter table), else ignored
  const affineAt = AFFINE_MOTION_COLUMNS.map((c) => header.indexOf(c));
  if (missing.length) fail('MOTION_TABLE_INVALID', `${source} lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} (its header must name ${MOTION_TABLE_COLUMNS.join(', ')}, tab-separated)`);
  return lines.slice(1).map((line, r) => {
    const cells = line.split('\t');
    const value = (i: number): number => {
      const text = (cells[at[i]] ?? '').trim();
      const x = Number(text);
      if (text === '' || !Number.isFinite(x)) fail('MOTION_TABLE_INVALID', `${source} row ${r + 1} (volume ${r}): ${MOTION_TABLE_COLUMNS[i]} is '${text}', not a finite number`);
      return x;
    };
    const row: MotionRow = { volume: r, shiftXMm: value(0), shiftYMm: value(1), shiftZMm: value(2), rotXDeg: value(3), rotYDeg: value(4), rotZDeg: value(5) };
    if (affineAt.every((i) => i >= 0)) {
      AFFINE_MOTION_COLUMNS.forEach((c, q) => {
        const text = (cells[affineAt[q]] ?? '').trim();
        const x = Number(text);
        if (text === '' || !Number.isFinite(x)) fail('MOTION_TABLE_INVALID', `${source} row ${r + 1} (volume ${r}): ${c} is '${text}', not a finite number`);
        (row as AffineMotionRow)[c] = x;
      });
    }
    return row;
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
 * A motion table as the text of a file {@link parseMotionTable} reads (with the twelve columns of
 * an affine table when every row has the affine terms).
 * @param rows - one row per volume
 * @returns tab-separated text with a header line
 * @example motionTableToTsv(simulatedMotionTable(...))
 */
export function motionTableToTsv(rows: readonly MotionRow[]): string {
  // twelve columns when every row has the affine terms, else the six
  const affine = rows.length > 0 && rows.every((r) => AFFINE_MOTION_COLUMNS.every((c) => typeof (r as Partial<AffineMotionRow>)[c] === 'number'));
  const columns: readonly string[] = affine ? [...MOTION_TABLE_COLUMNS, ...AFFINE_MOTION_COLUMNS] : MOTION_TABLE_COLUMNS;
  return [columns.join('\t'), ...rows.map((r) => columns.map((c) => String((r as unknown as Record<string, number>)[c])).join('\t'))].join('\n') + '\n';
}
