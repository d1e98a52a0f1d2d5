#!/usr/bin/env node
/**
 * boldsweep command line: each command lives in its own file under src/cli/ and registers itself
 * here, in the order a newcomer uses them (look -> spec -> sweep -> report). Exit codes: 0 success,
 * 1 unexpected failure, 2 bad input (a BoldsweepError, whose code is printed, or bad usage).
 */
import { Command } from 'commander';
import { isBoldsweepError } from '../core/errors.js';
import { softwareVersions } from '../report/software-versions.js';
import { EXIT_CODES_HELP, exitTwoOnUsage } from './cli-common.js';
import { registerLook } from './look-command.js';
import { registerSpecCommand } from './spec-command.js';
import { registerSweepCommand, registerGatherCommand } from './sweep-command.js';
import { registerReportCommand } from './report-command.js';
import { registerDemoCommand } from './demo-command.js';
import { registerSlurmCommand } from './slurm-command.js';

const program = new Command().exitOverride(exitTwoOnUsage);
program
  .name('boldsweep')
  .description('Choose fMRI preprocessing parameters from evidence in your own run.')
  .version(softwareVersions().boldsweep, '--version', 'print the version and exit')
  .showHelpAfterError('(boldsweep --help lists the commands and the order of work)')
  .addHelpText('after', `
The order of work:
  1. boldsweep look RUN --out LOOK                 what is in the run: findings, maps, figures
  2. boldsweep spec LOOK --out spec.yaml           a commented starting spec; edit the planted size
  3. boldsweep sweep RUN --spec spec.yaml --look LOOK --out SWEEP
  4. boldsweep report SWEEP                        recommendation, report.html, methods.md, decision record
  (boldsweep demo does all of it on the bundled demo run.)

Each command has its own help with an example: boldsweep look --help
${EXIT_CODES_HELP}`);

registerLook(program);
registerSpecCommand(program);
registerSweepCommand(program); registerGatherCommand(program);
registerReportCommand(program);
registerDemoCommand(program);
registerSlurmCommand(program);

program.parseAsync(process.argv).catch((e: unknown) => {
  if (isBoldsweepError(e)) {
    console.error(`boldsweep: ${e.code}: ${e.message}`);
    process.exit(2);
  }
  console.error(e);
  process.exit(1);
});
