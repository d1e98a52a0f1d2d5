import { InvalidArgumentError, type Command } from 'commander';
import { readSweepFolder } from '../report/sweep-folder.js';
import { RESEARCH_CAUTION } from '../report/caution.js';
import { positiveNumber, withExitCodes } from './cli-common.js';

interface ReportCliOptions {
  metric: string;
  targetSize?: number;
  prefer?: 'smallest' | 'largest';
  force?: boolean;
}

function preferEnd(value: string): 'smallest' | 'largest' {
  if (value !== 'smallest' && value !== 'largest') throw new InvalidArgumentError('must be smallest or largest.');
  return value;
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
    .description('Step 4. Write the report of a sweep folder into it: recommendation with its evidence, charts, methods text and decision record.')
    .argument('<dir>', 'a folder written by "boldsweep sweep" or "boldsweep gather"')
    .option('--metric <name>', 'detection metric to maximise (a scorecard column, e.g. hitRate, rocAuc, blobHitRate)', 'hitRate')
    .option('--target-size <mm>', 'planted size the choice is made for (default: the median planted size)', positiveNumber)
    .option('--prefer <end>', 'which end of the parameter range is simpler: smallest or largest (default: as the varied step defines it, else smallest)', preferEnd)
    .option('--force', 'write into a sweep folder made before output folders carried boldsweep\'s marker (only the report\'s own files are written)')
    .addHelpText('after', `
Example:
  boldsweep report sweep-sub-01
  (then open sweep-sub-01/report.html; methods.md holds the methods paragraph)`)
    .action(async (dir: string, o: ReportCliOptions) => {
      const folder = readSweepFolder(dir);
      // the report and chart code (vega, vega-lite) loads only when this command runs, so the other
      // commands (a sweep above all) do not hold it
      const { writeReport } = await import('../report/write-report.js');
      const { recommendation, files } = await writeReport(dir, folder, { metric: o.metric, targetSizeMm: o.targetSize, prefer: o.prefer }, { force: o.force, inputs: [] });
      console.log(recommendation.summary);
      console.log(`wrote ${files.report}, ${files.methods}, ${files.record}`);
      console.log(RESEARCH_CAUTION);
    });
}
