import type { LookResult } from './look-at-run.js';

/** Most findings a console summary lists; the rest are counted (all are in findings.json and look.html). */
export const CONSOLE_FINDINGS = 10;

/**
 * The look's findings for a terminal: a count, the most consequential findings first (at most
 * `max`, each with what it does to the analysis), how many more there are, and the checks skipped
 * for want of information with how to supply it.
 * @param look - the look (findings already ranked)
 * @param label - what was looked at (a path)
 * @param max - most findings listed (default {@link CONSOLE_FINDINGS})
 * @returns lines of text
 * @example console.log(lookConsoleLines(look, 'sub-01_bold.nii.gz').join('\n'))
 */
export function lookConsoleLines(look: Pick<LookResult, 'findings' | 'skipped'>, label: string, max = CONSOLE_FINDINGS): string[] {
  const n = look.findings.length;
  const lines = [`look at ${label}: ${n} finding${n === 1 ? '' : 's'}${n > max ? `, the ${max} of most consequence first` : n > 1 ? ', most consequential first' : ''}`];
  for (const f of look.findings.slice(0, max)) lines.push(`  - ${f.verdict}`);
  if (n > max) lines.push(`  ... and ${n - max} more of less consequence (all in findings.json and look.html)`);
  for (const s of look.skipped) lines.push(`skipped: ${s.check}: ${s.why}. To run it: ${s.how}.`);
  return lines;
}
