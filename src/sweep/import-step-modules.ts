import { fail } from '../core/fail.js';

const imported = new Map<string, Promise<unknown>>();

/**
 * Import (once per thread) the modules that register a sweep's user steps, so a worker thread knows
 * the steps the main thread registered with `registerStep(name, definition, { module })`.
 * @param modules - module URLs (file: URLs as recorded by registerStep)
 * @returns when every module has been imported
 * @throws BoldsweepError STEP_MODULE_MISSING when a module cannot be imported (the cause is attached)
 * @example await importStepModules(task.context.stepModules)
 */
export async function importStepModules(modules: readonly string[]): Promise<void> {
  for (const m of modules) {
    let p = imported.get(m);
    if (!p) {
      p = import(m);
      imported.set(m, p);
    }
    try {
      await p;
    } catch (e) {
      imported.delete(m);
      fail('STEP_MODULE_MISSING', `the step module ${m} could not be imported in a worker thread: ${e instanceof Error ? e.message : String(e)}`, { cause: e });
    }
  }
}
