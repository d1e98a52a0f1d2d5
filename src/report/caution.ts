/**
 * The research-software caution shown in every report, methods file and at the end of the demo.
 * Kept in one place so the wording is the same everywhere.
 */
export const RESEARCH_CAUTION =
  'Research software. boldsweep and its reports are for research on preprocessing choices; they are not for clinical or presurgical decisions about any person. '
  + 'Every number here is an estimate from simulation on one run and can be wrong for other data. '
  + 'Defer to your local review boards and to licensed clinical practice.';
