/** The tissue classes of the phantom, in label-map order (label = index + 1; 0 is air outside the head). */
export const PHANTOM_TISSUES = ['extracerebral', 'csf', 'grey-matter', 'white-matter', 'sinus-air'] as const;

/** One tissue class of the phantom. */
export type PhantomTissue = (typeof PHANTOM_TISSUES)[number];

/** Label value of each class in the tissue label map (0 = air outside the head). */
export const TISSUE_LABEL: Readonly<Record<PhantomTissue | 'air', number>> = Object.freeze({
  air: 0,
  extracerebral: 1,
  csf: 2,
  'grey-matter': 3,
  'white-matter': 4,
  'sinus-air': 5,
});

/** Relaxation and density of one tissue at the phantom's field strength, with where each number came from. */
export interface TissueProperties {
  /** Proton density relative to pure water (0..1). */
  protonDensity: number;
  /** Longitudinal relaxation time, seconds. */
  t1Sec: number;
  /** Effective transverse relaxation time, seconds. */
  t2StarSec: number;
  /** Where the values come from (author, year, journal) or "chosen"/"from memory". */
  source: string;
}

/**
 * Tissue parameters at 3 T used by default.
 * - T1: Wansapura JP et al. (1999) J Magn Reson Imaging 9(4):531-538 report grey matter 1331 ms and
 *   white matter 832 ms at 3 T (quoted from memory); Stanisz GJ et al. (2005) Magn Reson Med
 *   54(3):507-512 report higher values (GM 1820 ms, WM 1084 ms, in vitro at 37 C), so the T1 of
 *   real tissue is uncertain by about 30 %. CSF about 4.2-4.5 s (from memory).
 * - T2*: cortex about 45-55 ms and white matter about 40-50 ms at 3 T (from memory, cf. Wansapura
 *   1999 and Peters AM et al. (2007) Magn Reson Imaging 25:748-753); CSF T2 exceeds 1 s but its
 *   T2* is limited by field inhomogeneity: 200 ms is chosen.
 * - Proton density: GM about 0.8, WM about 0.7, CSF 1.0 relative to water (from memory).
 * - Extracerebral (scalp, fat-suppressed, and skull lumped together): chosen to give low signal.
 * - Sinus air: no protons.
 */
export const DEFAULT_TISSUE_PROPERTIES: Readonly<Record<PhantomTissue, Readonly<TissueProperties>>> = Object.freeze({
  extracerebral: { protonDensity: 0.25, t1Sec: 0.5, t2StarSec: 0.02, source: 'chosen: lumped scalp (fat-suppressed) and skull, low signal' },
  csf: { protonDensity: 1.0, t1Sec: 4.2, t2StarSec: 0.2, source: 'T1 about 4.2-4.5 s at 3 T (from memory); T2* chosen (T2 > 1 s, T2* limited by inhomogeneity); PD 1 (water)' },
  'grey-matter': { protonDensity: 0.8, t1Sec: 1.331, t2StarSec: 0.05, source: 'T1 1331 ms: Wansapura JP et al. (1999) J Magn Reson Imaging 9(4):531-538 (from memory); T2* and PD from memory' },
  'white-matter': { protonDensity: 0.7, t1Sec: 0.832, t2StarSec: 0.045, source: 'T1 832 ms: Wansapura JP et al. (1999) J Magn Reson Imaging 9(4):531-538 (from memory); T2* and PD from memory' },
  'sinus-air': { protonDensity: 0, t1Sec: 1, t2StarSec: 0.001, source: 'air: no protons' },
});
