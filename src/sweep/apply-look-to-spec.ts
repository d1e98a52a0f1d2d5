import type { SweepSpec } from './spec.js';
import { specDropCount } from './spec-drop-count.js';
import type { LookTreatment } from './untreated-findings.js';

/**
 * A spec with a look's findings applied where the spec leaves them open: a drop-initial-volumes step
 * put first when the spec has none, the look's volumes censored when the spec censors none. A spec
 * that sets either itself keeps its own value (the note says so).
 * @param spec - the sweep spec
 * @param look - the look's recommendation
 * @returns the spec to run and one note per change or disagreement
 * @example const { spec: s, notes } = applyLookToSpec(spec, readLookFolder('out/look'))
 */
export function applyLookToSpec(spec: SweepSpec, look: LookTreatment): { spec: SweepSpec; notes: string[] } {
  const notes: string[] = [];
  let recipe = spec.recipe;
  let censorVolumes = spec.model.censorVolumes;
  const hasDrop = spec.recipe.some((s) => s.step === 'drop-initial-volumes');
  if (!hasDrop && look.dropInitialVolumes > 0) {
    recipe = [{ step: 'drop-initial-volumes', params: { count: look.dropInitialVolumes } }, ...recipe];
    notes.push(`dropping the first ${look.dropInitialVolumes} volume(s), as the look recommends`);
  } else if (hasDrop && specDropCount(spec) !== look.dropInitialVolumes) {
    notes.push(`the spec's drop-initial-volumes (${specDropCount(spec) ?? 'varied'}) is kept; the look recommends ${look.dropInitialVolumes}`);
  }
  if (censorVolumes.length === 0 && look.censorVolumes.length > 0) {
    censorVolumes = [...look.censorVolumes];
    notes.push(`censoring volume(s) ${censorVolumes.join(', ')}, as the look recommends`);
  } else if (censorVolumes.length > 0 && censorVolumes.join(',') !== look.censorVolumes.join(',')) {
    notes.push(`the spec's censorVolumes (${censorVolumes.join(', ')}) are kept; the look recommends ${look.censorVolumes.join(', ') || 'none'}`);
  }
  return { spec: { ...spec, recipe, model: { ...spec.model, censorVolumes } }, notes };
}
