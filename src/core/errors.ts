import type { ErrorCode } from './messages.js';

/**
 * The one error type boldsweep throws on purpose. `code` is stable across versions so callers
 * (and tests) can branch on it; `message` says what was wrong and what to do about it.
 *
 * @example
 * try { await openRun('missing.nii') } catch (e) { if (e instanceof BoldsweepError) console.log(e.code) }
 */
export class BoldsweepError extends Error {
  /** Stable machine-readable code, one of {@link ErrorCode}. */
  readonly code: ErrorCode;
  /** The file the problem was found in, when there is one. */
  readonly file: string | undefined;
  /** Extra facts for programmatic callers (counts, offending values). */
  readonly details: Readonly<Record<string, unknown>>;

  constructor(code: ErrorCode, message: string, options: { file?: string; details?: Record<string, unknown>; cause?: unknown } = {}) {
    super(options.file ? `${options.file}: ${message}` : message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'BoldsweepError';
    this.code = code;
    this.file = options.file;
    this.details = Object.freeze({ ...(options.details ?? {}) });
  }
}

/**
 * True when `e` is a {@link BoldsweepError}, optionally with a given code.
 * @param e - anything caught
 * @param code - the code to match, if any
 * @returns whether `e` is that error
 * @example if (isBoldsweepError(e, 'NIFTI_TRUNCATED')) { ... }
 */
export function isBoldsweepError(e: unknown, code?: ErrorCode): e is BoldsweepError {
  return e instanceof BoldsweepError && (code === undefined || e.code === code);
}
