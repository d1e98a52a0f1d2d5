import { fail } from '../core/fail.js';

/**
 * The frequency a periodic signal of `frequencyHz` appears at when sampled once every `trSec`
 * seconds (the sampling theorem: sampling at fs = 1/TR cannot tell f from |f - k fs| for any
 * integer k, so it shows as the one of those in [0, fs/2]).
 * @param frequencyHz - the signal's frequency, Hz (>= 0)
 * @param trSec - sampling interval, seconds (> 0)
 * @returns the aliased frequency in [0, 1 / (2 trSec)], Hz
 * @throws BoldsweepError INVALID_ARGUMENT for a negative or non-finite frequency or TR
 * @example aliasedFrequencyHz(1.1, 2) // 0.1 (1.1 Hz - 2 x 0.5 Hz)
 */
export function aliasedFrequencyHz(frequencyHz: number, trSec: number): number {
  if (!(frequencyHz >= 0) || !Number.isFinite(frequencyHz)) fail('INVALID_ARGUMENT', `frequency must be finite and >= 0 Hz, got ${frequencyHz}`);
  if (!(trSec > 0) || !Number.isFinite(trSec)) fail('INVALID_ARGUMENT', `TR must be positive, got ${trSec}`);
  const fs = 1 / trSec;
  const r = frequencyHz - fs * Math.floor(frequencyHz / fs);
  return r > fs / 2 ? fs - r : r;
}
