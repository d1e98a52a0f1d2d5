import { aliasedFrequencyHz } from './aliased-frequency.js';

/**
 * TR (s) from which shifting slices in time is advised against: a slice's series then holds too few
 * samples per haemodynamic response for interpolation between them to be trusted, and the model-based
 * alternative (each slice's regressor sampled at its own time) serves better (common practice, about
 * 4 s, no source).
 */
export const LONG_TR_SEC = 4;

/** Fast physiological fluctuations a run's TR may alias (typical adult rates at rest, common practice, no source). */
export const PHYSIOLOGICAL_RATES_HZ = { cardiac: 1, respiration: 0.3 } as const;

/** One physiological rhythm at this TR. */
export interface AliasedRhythm {
  name: 'cardiac' | 'respiration';
  /** Its typical frequency, Hz. */
  frequencyHz: number;
  /** Where it shows in the sampled series, Hz, in [0, 1/(2 TR)]. */
  aliasedHz: number;
  /** True when it is above the Nyquist frequency 1/(2 TR), so it folds onto a slower frequency. */
  aliases: boolean;
}

/** What {@link sliceTimingGuidance} advises for a run's TR. */
export interface SliceTimingGuidance {
  trSec: number;
  /** Nyquist frequency 1/(2 TR), Hz. */
  nyquistHz: number;
  /** TR at or above {@link LONG_TR_SEC}. */
  longTr: boolean;
  /** 'model' (do not shift, sample each slice's regressor at its own time) at long TR, else 'shift'. */
  advised: 'shift' | 'model';
  rhythms: AliasedRhythm[];
  /** Sentences for the step note and report, each complete. */
  lines: string[];
}

/**
 * Guidance on slice-timing correction for a TR: at long TR shifting is advised against and the
 * model-based alternative offered; each fast physiological rhythm (cardiac about 1 Hz, respiration
 * about 0.3 Hz) that lies above the Nyquist frequency folds onto |f - k/TR| in [0, 1/(2 TR)]
 * ({@link aliasedFrequencyHz}), where a shift treats it as slow signal: such rhythms are flagged, to
 * be modelled later (physiological regressors), not interpolated away.
 * @param trSec - repetition time, seconds
 * @returns the advice with the aliased frequencies and its sentences
 * @example sliceTimingGuidance(2).rhythms[0].aliasedHz // 0 (1 Hz at TR 2 s folds onto 0 Hz)
 */
export function sliceTimingGuidance(trSec: number): SliceTimingGuidance {
  const nyquistHz = 1 / (2 * trSec);
  const longTr = trSec >= LONG_TR_SEC;
  const rhythms: AliasedRhythm[] = (['cardiac', 'respiration'] as const).map((name) => {
    const frequencyHz = PHYSIOLOGICAL_RATES_HZ[name];
    return { name, frequencyHz, aliasedHz: aliasedFrequencyHz(frequencyHz, trSec), aliases: frequencyHz > nyquistHz };
  });
  const fmt = (x: number): string => (Math.round(x * 1000) / 1000).toString();
  const lines: string[] = [];
  lines.push(longTr
    ? `At TR ${fmt(trSec)} s (${LONG_TR_SEC} s or longer) shifting slices in time is advised against: interpolating between samples this far apart is unreliable; use method 'model' (each slice's regressor sampled at its own acquisition time) instead.`
    : `At TR ${fmt(trSec)} s (below ${LONG_TR_SEC} s) shifting slices to one reference time is reasonable; method 'model' is the alternative that leaves the data as acquired.`);
  const folded = rhythms.filter((r) => r.aliases);
  if (folded.length > 0) {
    lines.push(`Sampled at TR ${fmt(trSec)} s (Nyquist ${fmt(nyquistHz)} Hz), ${folded.map((r) => `${r.name} fluctuations near ${fmt(r.frequencyHz)} Hz appear at ${fmt(r.aliasedHz)} Hz`).join(' and ')}: a shift interpolates them as if they were slow signal, so model them later (physiological regressors) rather than expect the shift to place them in time.`);
  } else {
    lines.push(`At TR ${fmt(trSec)} s (Nyquist ${fmt(nyquistHz)} Hz) the cardiac and respiratory rhythms are sampled without aliasing.`);
  }
  return { trSec, nyquistHz, longTr, advised: longTr ? 'model' : 'shift', rhythms, lines };
}
