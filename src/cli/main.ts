#!/usr/bin/env node
/**
 * boldsweep command line: each command lives in its own file under src/cli/ and registers itself
 * here. Exit codes: 0 success, 1 unexpected failure, 2 bad input (a BoldsweepError; its code is printed).
 */
import { Command } from 'commander';
import { isBoldsweepError } from '../core/errors.js';
import { registerLook } from './look-command.js';
import { registerSweepCommand, registerGatherCommand } from './sweep-command.js';
import { registerReportCommand } from './report-command.js';
import { registerDemoCommand } from './demo-command.js';
import { registerSlurmCommand } from './slurm-command.js';

const program = new Command();
program
  .name('boldsweep')
  .description('Choose fMRI preprocessing parameters from evidence in your own run.')
  .showHelpAfterError();

registerLook(program);
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
