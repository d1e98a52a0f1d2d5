import type { SweepSpec } from './spec.js';

/**
 * Initial volumes a spec drops.
 * @param spec - the sweep spec
 * @returns the drop-initial-volumes count; 0 without that step; null when the sweep varies it
 * @example specDropCount(spec) // 3
 */
export function specDropCount(spec: SweepSpec): number | null {
  if (Object.keys(spec.vary).some((k) => k.startsWith('drop-initial-volumes.'))) return null;
  const step = spec.recipe.find((s) => s.step === 'drop-initial-volumes');
  return step ? Number(step.params.count ?? 0) : 0;
}

