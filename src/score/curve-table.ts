/**
 * Detection curves of a sweep, sampled at fixed false-positive rates so curves from different
 * repeats can be averaged point by point ("vertical averaging", Fawcett T 2006, Pattern Recognit
 * Lett 27(8):861-874).
 */
export interface CurveTable {
  /** False-positive rates at which every curve is sampled, ascending. */
  fprGrid: number[];
  /** Per cell: the true-positive rate at each grid point (ascending cell order, as in the scorecard). */
  rows: Array<{ cell: number; tpr: number[] }>;
}

/**
 * Default false-positive grid: roughly logarithmic from 1e-4 to 1, as voxelwise false-positive
 * rates that matter in practice are tiny.
 */
export const DEFAULT_FPR_GRID: readonly number[] = [0.0001, 0.0002, 0.0005, 0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1];

/**
 * Sample a stepwise ROC curve at given false-positive rates: the highest true-positive rate reached
 * without exceeding each rate (the conservative step reading of an empirical curve).
 * @param fpr - false-positive rates of the curve's points, ascending
 * @param tpr - true-positive rates of the same points
 * @param grid - rates to sample at, ascending
 * @returns one true-positive rate per grid point
 * @example tprAtFpr([0, 0.1, 1], [0, 0.6, 1], [0.05, 0.5]) // [0, 0.6]
 */
export function tprAtFpr(fpr: ArrayLike<number>, tpr: ArrayLike<number>, grid: ArrayLike<number>): number[] {
  const out: number[] = [];
  let i = 0;
  let best = 0;
  for (let g = 0; g < grid.length; g++) {
    while (i < fpr.length && fpr[i] <= grid[g] + 1e-12) {
      if (tpr[i] > best) best = tpr[i];
      i++;
    }
    out.push(best);
  }
  return out;
}

/**
 * Column name of the true-positive rate at one false-positive rate: a plain identifier that R and
 * pandas read unchanged (the decimal point becomes an underscore).
 * @param fpr - false-positive rate of the grid
 * @returns e.g. "tpr_at_fpr_0_01" for 0.01
 * @example curveColumnName(0.05) // 'tpr_at_fpr_0_05'
 */
export function curveColumnName(fpr: number): string {
  return `tpr_at_fpr_${String(fpr).replace('.', '_').replace('-', 'm')}`;
}

/**
 * Write a curve table as TSV: a header line (cell, then one column per grid point, see
 * {@link curveColumnName}), then cell and rates.
 * @param t - the table
 * @returns TSV text
 * @example await writeFileAtomic('roc.tsv', curveTableToTsv(result.curves))
 */
export function curveTableToTsv(t: CurveTable): string {
  return [['cell', ...t.fprGrid.map(curveColumnName)].join('\t'), ...t.rows.map((r) => [r.cell, ...r.tpr.map((x) => (Number.isFinite(x) ? String(x) : 'n/a'))].join('\t'))].join('\n') + '\n';
}

/**
 * Read a curve table written by {@link curveTableToTsv}.
 * @param text - TSV text
 * @returns the table
 * @example readCurveTableTsv(readFileSync('out/demo/roc.tsv', 'utf8'))
 */
export function readCurveTableTsv(text: string): CurveTable {
  const lines = text.split('\n').filter(Boolean);
  // "tpr_at_fpr_0_01" (or the earlier "tpr@fpr=0.01") -> 0.01
  const fprGrid = lines[0].split('\t').slice(1).map((h) => Number(h.startsWith('tpr@fpr=') ? h.slice(8) : h.replace(/^tpr_at_fpr_/, '').replace('_', '.').replace('m', '-')));
  const rows = lines.slice(1).map((l) => {
    const [cell, ...rest] = l.split('\t');
    return { cell: Number(cell), tpr: rest.map((x) => (x === 'n/a' ? NaN : Number(x))) };
  });
  return { fprGrid, rows };
}
