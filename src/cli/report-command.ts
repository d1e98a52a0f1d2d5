import type { Command } from 'commander';
import { readSweepFolder } from '../report/sweep-folder.js';
import { writeReport } from '../report/write-report.js';
import { RESEARCH_CAUTION } from '../report/caution.js';
import { positiveNumber, withExitCodes } from './cli-common.js';

interface ReportCliOptions {
  metric: string;
  targetSize?: number;
  prefer?: 'smallest' | 'largest';
}

/**
 * `boldsweep report <dir>`: recommend a setting from a sweep folder and write report.html, methods.md
 * and decision-record.json into it.
 * @param program - the root command
 * @returns the new command
 * @example registerReportCommand(program)
 */
export function registerReportCommand(program: Command): Command {
  return withExitCodes(program.command('report'))
    .description('Write the report of a sweep folder: recommendation with its evidence, charts, methods text and decision record.')
    .argument('<dir>', 'a folder written by "boldsweep sweep" or "boldsweep gather"')
    .option('--metric <name>', 'detection metric to maximise (a scorecard column, e.g. hitRate, rocAuc, blobHitRate)', 'hitRate')
    .option('--target-size <mm>', 'planted size the choice is made for (default: the median planted size)', positiveNumber)
    .option('--prefer <end>', 'which end of the parameter range is simpler: smallest or largest (default: as the varied step defines it, else smallest)')
    .action(async (dir: string, o: ReportCliOptions) => {
      const folder = readSweepFolder(dir);
      const prefer = o.prefer === undefined ? undefined : o.prefer === 'largest' ? 'largest' : 'smallest';
      const { recommendation, files } = await writeReport(dir, folder, { metric: o.metric, targetSizeMm: o.targetSize, prefer });
      console.log(recommendation.summary);
      console.log(`wrote ${files.report}, ${files.methods}, ${files.record}`);
      console.log(RESEARCH_CAUTION);
    });
}
