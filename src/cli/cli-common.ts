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
    .exitOverride((err: CommanderError) => {
      // help and version end with code 0; anything else commander rejects is bad input
      process.exit(err.exitCode === 0 ? 0 : 2);
    });
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
