import { existsSync, readFileSync, statSync } from 'node:fs';
import type { Command } from 'commander';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { readLookFolder } from '../report/read-look-folder.js';
import { STARTER_SPEC_HEADER, starterSpecYaml } from '../report/starter-spec-yaml.js';
import { withExitCodes } from './cli-common.js';

/**
 * `boldsweep spec <look> --out <file>`: write a commented starting sweep spec (YAML) from a look
 * folder, with the look's bright first volumes dropped and its abrupt changes censored.
 * @param program - the root command
 * @returns the new command
 * @example registerSpecCommand(program)
 */
export function registerSpecCommand(program: Command): Command {
  return withExitCodes(program.command('spec'))
    .description('Step 2. Write a commented starting sweep spec (YAML) from a look folder: the look\'s bright first volumes dropped and abrupt changes censored, the planted size and amplitude as defaults to edit.')
    .argument('<look>', 'a folder written by "boldsweep look"')
    .requiredOption('--out <file>', 'the spec file to write (.yaml)')
    .option('--force', 'replace a spec that "boldsweep spec" wrote earlier (any other file is never replaced)')
    .addHelpText('after', `
Example:
  boldsweep spec look-sub-01 --out smoothing.yaml
  (edit smoothing.yaml: the planted size and amplitude, marked EDIT; then)
  boldsweep sweep sub-01/func/sub-01_task-motor_bold.nii.gz --spec smoothing.yaml --look look-sub-01 --out sweep-sub-01`)
    .action(async (lookDir: string, o: { out: string; force?: boolean }) => {
      const look = readLookFolder(lookDir);
      if (existsSync(o.out)) {
        const ours = statSync(o.out).isFile() && readFileSync(o.out, 'utf8').startsWith(STARTER_SPEC_HEADER);
        if (!ours) fail('SPEC_FILE_EXISTS', `${o.out} exists and was not written by "boldsweep spec"; it is left as it is`);
        if (!o.force) fail('SPEC_FILE_EXISTS', `${o.out} exists (a spec written by "boldsweep spec", perhaps edited since)`);
      }
      await writeFileAtomic(o.out, starterSpecYaml(look));
      console.log(`wrote ${o.out}: smoothing widths 0-14 mm on ${look.runFile ?? 'the run'}${look.dropInitialVolumes ? `, first ${look.dropInitialVolumes} volume(s) dropped` : ''}${look.censorVolumes.length ? `, volume(s) ${look.censorVolumes.join(', ')} censored` : ''}`);
      console.log('edit the planted size and amplitude (lines marked EDIT) to the activation you expect, then:');
      console.log(`next: boldsweep sweep <run> --spec ${o.out} --look ${lookDir} --out <sweep folder>`);
    });
}
