import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';
import { makeDesignMatrix, type DesignColumnKind, type DesignMatrix } from './design-matrix.js';
import { dctBasis, polynomialBasis } from './drift-basis.js';
import { eventRegressors, type EventRegressorOptions } from './event-regressors.js';

/** Slow-drift model: a DCT high-pass set, Legendre polynomials, or nothing. */
export type DriftModel = { kind: 'dct'; cutoffSec: number } | { kind: 'polynomial'; order: number } | { kind: 'none' };

/** A named extra regressor, e.g. one column of a motion table. */
export interface NuisanceRegressor {
  name: string;
  /** One value per volume. */
  values: ArrayLike<number>;
}

/** Options for {@link buildDesign}. */
export interface DesignOptions extends EventRegressorOptions {
  /** Number of volumes. */
  nt: number;
  /** Repetition time, seconds. */
  trSec: number;
  /**
   * Drift columns (never including a constant; see `intercept`). The 128 s DCT cutoff is a common
   * default (common practice, no source). __Default value:__ `{ kind: 'dct', cutoffSec: 128 }`
   */
  drift?: DriftModel;
  /** Extra regressors (motion table columns, outlier spikes, ...), added as given. */
  nuisance?: readonly NuisanceRegressor[];
  /** Add a constant column named 'intercept'. __Default value:__ true */
  intercept?: boolean;
}

/**
 * Build a GLM design from an events table: columns in the order conditions (each followed by its
 * derivative when asked), drift, nuisance, intercept. Drift columns are named `drift_cos1..K`
 * (DCT, orthonormal) or `drift_poly1..order` (Legendre), so the constant appears once, as 'intercept'.
 * @param events - rows of the events table (not modified)
 * @param options - nt, trSec, HRF and sampling options, drift model, nuisance columns, intercept
 * @returns the design, with its condition number
 * @throws BoldsweepError EVENTS_BEYOND_RUN, EVENTS_INVALID, INVALID_ARGUMENT, RANK_DEFICIENT (naming
 *   the columns that are linear combinations of others)
 * @example const design = buildDesign(run.events!, { nt: 200, trSec: 2, drift: { kind: 'dct', cutoffSec: 128 } })
 */
export function buildDesign(events: readonly BoldEvent[], options: DesignOptions): DesignMatrix {
  const { nt, trSec } = options;
  const ev = eventRegressors(events, nt, trSec, options);
  const names: string[] = [...ev.names];
  const kinds: DesignColumnKind[] = [...ev.kinds];
  const cols: ArrayLike<number>[] = [...ev.columns];
  const drift = options.drift ?? { kind: 'dct', cutoffSec: 128 };
  if (drift.kind === 'dct') {
    dctBasis(nt, trSec, drift.cutoffSec, { includeConstant: false }).forEach((c, k) => {
      names.push(`drift_cos${k + 1}`);
      kinds.push('drift');
      cols.push(c);
    });
  } else if (drift.kind === 'polynomial') {
    polynomialBasis(nt, drift.order).slice(1).forEach((c, k) => {
      names.push(`drift_poly${k + 1}`);
      kinds.push('drift');
      cols.push(c);
    });
  } else if (drift.kind !== 'none') {
    fail('INVALID_ARGUMENT', `drift.kind must be 'dct', 'polynomial' or 'none', got '${String((drift as { kind: unknown }).kind)}'`);
  }
  for (const r of options.nuisance ?? []) {
    if (r.values.length !== nt) fail('INVALID_ARGUMENT', `nuisance regressor '${r.name}' has ${r.values.length} values, expected one per volume (${nt})`);
    names.push(r.name);
    kinds.push('nuisance');
    cols.push(r.values);
  }
  if (options.intercept ?? true) {
    names.push('intercept');
    kinds.push('intercept');
    cols.push(new Float64Array(nt).fill(1));
  }
  return makeDesignMatrix(names, cols, kinds);
}
