import { InvalidArgumentError, type Command, type CommanderError } from 'commander';

/** Text appended to every command's --help: the exit codes. */
export const EXIT_CODES_HELP = `
Exit codes:
  0  success
  1  unexpected failure (a bug or the system: please report it with the message)
  2  bad input (unreadable file, invalid spec, wrong option); the message names the problem and what to do`;

/**
 * Make a command exit 2 on usage errors (unknown option, missing argument) instead of commander's 1,
 * so scripts can tell bad input from failures, and add the exit codes to its help.
 * @param cmd - the command
 * @returns the same command
 * @example withExitCodes(program.command('sweep'))
 */
export function withExitCodes(cmd: Command): Command {
  return cmd
    .addHelpText('after', EXIT_CODES_HELP)
    .exitOverride(exitTwoOnUsage)
    .showHelpAfterError(`(boldsweep ${cmd.name()} --help shows the options and an example)`);
}

/**
 * Commander's exit hook: help and version end with 0; anything else commander rejects (unknown
 * command or option, missing argument, bad value) is bad usage and ends with 2.
 * @param err - commander's error
 * @returns never (the process exits)
 * @example new Command().exitOverride(exitTwoOnUsage)
 */
export function exitTwoOnUsage(err: CommanderError): never {
  process.exit(err.exitCode === 0 ? 0 : 2);
}

/**
 * Parse a positive integer option.
 * @param value - option text
 * @returns the integer
 * @throws InvalidArgumentError (commander prints it and exits 2)
 * @example cmd.option('--workers <n>', 'threads', positiveInt)
 */
export function positiveInt(value: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1) throw new InvalidArgumentError('must be a positive integer.');
  return n;
}

/**
 * Parse a comma-separated list of numbers.
 * @param value - e.g. "1,2"
 * @returns the numbers
 * @throws InvalidArgumentError for anything else
 * @example cmd.option('--mask-values <list>', 'labels', numberList)
 */
export function numberList(value: string): number[] {
  const xs = value.split(',').map((s) => Number(s.trim()));
  if (xs.length === 0 || xs.some((x) => !Number.isFinite(x))) throw new InvalidArgumentError('must be numbers separated by commas.');
  return xs;
}

/**
 * Parse a positive number option (mm, seconds).
 * @param value - option text
 * @returns the number
 * @throws InvalidArgumentError for anything else
 * @example cmd.option('--target-size <mm>', 'size', positiveNumber)
 */
export function positiveNumber(value: string): number {
  const n = Number(value);
  if (!(n > 0) || !Number.isFinite(n)) throw new InvalidArgumentError('must be a positive number.');
  return n;
}

/**
 * Parse a count that may be zero (volumes to drop).
 * @param value - option text
 * @returns the integer
 * @throws InvalidArgumentError for a negative or fractional number (commander prints it and exits 2)
 * @example cmd.option('--drop <n>', 'volumes', nonNegativeInt)
 */
export function nonNegativeInt(value: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0) throw new InvalidArgumentError(`must be a whole number, 0 or more (got ${value}).`);
  return n;
}

/**
 * Parse a finite number option (z cutoffs).
 * @param value - option text
 * @returns the number
 * @throws InvalidArgumentError for anything else
 * @example cmd.option('--volume-cutoff-z <z>', 'cutoff', finiteNumber, 5)
 */
export function finiteNumber(value: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n)) throw new InvalidArgumentError(`must be a number (got ${value}).`);
  return n;
}

/** Help text of every command's --force. */
export const FORCE_HELP = 'write into a non-empty folder boldsweep did not write (its files are added; nothing there is deleted or replaced)';
