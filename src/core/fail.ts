import { BoldsweepError } from './errors.js';
import { messageFor, type ErrorCode } from './messages.js';

/**
 * Throw a {@link BoldsweepError} whose message is the problem followed by the code's advice.
 * @param code - stable error code
 * @param problem - the specific problem, with numbers
 * @param options - file the problem is in, machine-readable details
 * @returns never
 * @example fail('INVALID_ARGUMENT', `fwhmMm must be >= 0, got ${fwhmMm}`)
 */
export function fail(code: ErrorCode, problem: string, options: { file?: string; details?: Record<string, unknown>; cause?: unknown } = {}): never {
  throw new BoldsweepError(code, messageFor(code, problem), options);
}
