import { fail } from '../core/fail.js';
import { svdJacobi } from './svd-jacobi.js';

/** What a design column models; used to pick columns for contrasts and effect sizes. */
export type DesignColumnKind = 'condition' | 'derivative' | 'drift' | 'nuisance' | 'intercept';

/**
 * A GLM design: `nt` rows (one per volume) by `p` columns, stored row-major, so the value of
 * column j at volume t is `x[t * p + j]` (the layout numpy uses for an (nt, p) array).
 */
export interface DesignMatrix {
  /** Column names, length p. */
  readonly columns: readonly string[];
  /** What each column models, length p. */
  readonly kinds: readonly DesignColumnKind[];
  /** Row-major nt x p values. */
  readonly x: Float64Array;
  /** Rows (volumes). */
  readonly nt: number;
  /** Columns. */
  readonly p: number;
  /**
   * Condition number of the design after scaling each column to unit length (ratio of largest to
   * smallest singular value), so regressor units do not affect it. Above ~1e3 estimates of the
   * affected columns are unstable (common practice, no source).
   */
  readonly conditionNumber: number;
}

/**
 * Validate and wrap columns into a {@link DesignMatrix}, computing its condition number; throws
 * RANK_DEFICIENT (naming the columns) when some columns are linear combinations of others.
 * @param columns - column names (unique)
 * @param values - one array of length nt per column
 * @param kinds - what each column models (default 'nuisance' for every column)
 * @returns the design
 * @throws BoldsweepError INVALID_ARGUMENT (lengths, names, non-finite values) or RANK_DEFICIENT
 * @example const d = makeDesignMatrix(['task', 'intercept'], [task, ones], ['condition', 'intercept'])
 */
export function makeDesignMatrix(columns: readonly string[], values: ReadonlyArray<ArrayLike<number>>, kinds?: readonly DesignColumnKind[]): DesignMatrix {
  const p = columns.length;
  if (p === 0) fail('INVALID_ARGUMENT', 'a design needs at least one column');
  if (values.length !== p) fail('INVALID_ARGUMENT', `${p} column names but ${values.length} columns of values`);
  if (kinds && kinds.length !== p) fail('INVALID_ARGUMENT', `${p} column names but ${kinds.length} column kinds`);
  const seen = new Set<string>();
  for (const c of columns) {
    if (seen.has(c)) fail('INVALID_ARGUMENT', `design column name '${c}' appears twice`);
    seen.add(c);
  }
  const nt = values[0].length;
  if (nt < p) fail('INVALID_ARGUMENT', `a design with ${p} columns needs at least ${p} volumes, got ${nt}`);
  const x = new Float64Array(nt * p);
  for (let j = 0; j < p; j++) {
    const col = values[j];
    if (col.length !== nt) fail('INVALID_ARGUMENT', `design column '${columns[j]}' has ${col.length} values, expected ${nt}`);
    for (let t = 0; t < nt; t++) {
      const val = col[t];
      if (!Number.isFinite(val)) fail('INVALID_ARGUMENT', `design column '${columns[j]}' has a non-finite value at volume ${t}`);
      x[t * p + j] = val;
    }
  }
  const partial = { columns: [...columns], kinds: kinds ? [...kinds] : columns.map(() => 'nuisance' as const), x, nt, p };
  const { conditionNumber } = designPseudoInverse(partial);
  return { ...partial, conditionNumber };
}

/** The pieces of an OLS solve that every voxel shares. */
export interface DesignSolve {
  /** Pseudo-inverse (X'X)^-1 X', row-major p x nt. */
  pinv: Float64Array;
  /** (X'X)^-1, row-major p x p. */
  xtxInv: Float64Array;
  /** Condition number of the unit-length-column design. */
  conditionNumber: number;
  /** Rank (= p; deficient designs throw). */
  rank: number;
}

/**
 * Pseudo-inverse and unscaled covariance of a design through a one-sided Jacobi SVD of the
 * column-normalised matrix (X = Xs D, D = diag of column lengths; pinv X = D^-1 V S^-1 U', and
 * (X'X)^-1 = D^-1 V S^-2 V' D^-1), which avoids forming X'X and squaring its condition number.
 * The rank tolerance is numpy.linalg.matrix_rank's default, s_max * max(nt, p) * eps, applied to
 * the column-normalised design.
 * @param design - columns, x, nt, p
 * @returns pinv, xtxInv, conditionNumber, rank
 * @throws BoldsweepError RANK_DEFICIENT naming the columns that are linear combinations of others
 * @example const { pinv } = designPseudoInverse(design); // beta = pinv * y
 */
export function designPseudoInverse(design: Pick<DesignMatrix, 'columns' | 'x' | 'nt' | 'p'>): DesignSolve {
  const { x, nt, p, columns } = design;
  const norms = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let ss = 0;
    for (let t = 0; t < nt; t++) ss += x[t * p + j] * x[t * p + j];
    norms[j] = Math.sqrt(ss);
  }
  const zero = columns.filter((_, j) => norms[j] === 0);
  if (zero.length > 0) fail('RANK_DEFICIENT', `design column${zero.length > 1 ? 's' : ''} ${zero.map((c) => `'${c}'`).join(', ')} ${zero.length > 1 ? 'are' : 'is'} zero at every volume (e.g. no event of that type falls within the run)`, { details: { columns: zero } });
  const xs = new Float64Array(nt * p);
  for (let t = 0; t < nt; t++) for (let j = 0; j < p; j++) xs[t * p + j] = x[t * p + j] / norms[j];
  const { s, u, v } = svdJacobi(xs, nt, p);
  const tol = s[0] * Math.max(nt, p) * 2.220446049250313e-16;
  let rank = 0;
  while (rank < p && s[rank] > tol) rank++;
  if (rank < p) failDependent(columns, norms, s, v, rank, p);
  const pinv = new Float64Array(p * nt);
  const xtxInv = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let t = 0; t < nt; t++) {
      let acc = 0;
      for (let k = 0; k < p; k++) acc += (v[j * p + k] * u[t * p + k]) / s[k];
      pinv[j * nt + t] = acc / norms[j];
    }
    for (let i = 0; i < p; i++) {
      let acc = 0;
      for (let k = 0; k < p; k++) acc += (v[j * p + k] * v[i * p + k]) / (s[k] * s[k]);
      xtxInv[j * p + i] = acc / (norms[j] * norms[i]);
    }
  }
  return { pinv, xtxInv, conditionNumber: s[0] / s[p - 1], rank };
}

/** Explain a rank-deficient design: name the columns in each null direction, with their weights. */
function failDependent(columns: readonly string[], norms: Float64Array, s: Float64Array, v: Float64Array, rank: number, p: number): never {
  const involved = new Set<string>();
  const relations: string[] = [];
  for (let k = rank; k < p; k++) {
    // null vector of X itself (undo the column scaling), largest weight scaled to 1
    const w = Array.from({ length: p }, (_, j) => v[j * p + k] / norms[j]);
    const big = Math.max(...w.map(Math.abs));
    const terms: string[] = [];
    w.forEach((wj, j) => {
      // weights below 1e-6 of the largest are rounding from the SVD, not part of the relation
      if (Math.abs(wj) > 1e-6 * big) {
        involved.add(columns[j]);
        const coef = wj / big;
        terms.push(`${coef < 0 ? '-' : '+'} ${Math.abs(coef).toPrecision(3)}*${columns[j]}`);
      }
    });
    relations.push(`${terms.join(' ').replace(/^\+ /, '')} = 0`);
  }
  const names = [...involved];
  fail('RANK_DEFICIENT', `design columns ${names.map((c) => `'${c}'`).join(', ')} are linearly dependent (${relations.join('; ')}); singular values of the unit-length design: ${Array.from(s, (x) => x.toExponential(2)).join(', ')}`, { details: { columns: names, relations } });
}
