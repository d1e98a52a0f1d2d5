import { readFileSync } from 'node:fs';
import YAML from 'yaml';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { listSteps } from '../../src/steps/registry.js';
import { readSweepSpec } from '../../src/sweep/read-sweep-spec.js';
import { parameterName, parameterUnit, settingSimplicity, simplerEnd, settingText, settingsGrid } from '../../src/sweep/settings-grid.js';
import { parseSweepSpecShape } from '../../src/sweep/spec.js';

describe('parameter words, units and simplicity come from the step definitions', () => {
  it('names and units of the built-in steps, the model options, and unlabelled keys', () => {
    expect(parameterName('smooth.fwhmMm')).toBe('smoothing FWHM');
    expect(parameterUnit('smooth.fwhmMm')).toBe('mm');
    expect(parameterName('highpass.cutoffSec')).toBe('high-pass cutoff');
    expect(parameterUnit('highpass.cutoffSec')).toBe('s');
    expect(parameterName('detrend.order')).toBe('detrending order');
    expect(parameterName('drop-initial-volumes.count')).toBe('initial volumes dropped');
    expect(parameterName('grand-mean-scale.target')).toBe('grand-mean target');
    expect(parameterName('smooth.mode')).toBe('smoothing boundary mode');
    expect(parameterName('model.ar1')).toBe('AR(1) noise model');
    expect(parameterUnit('model.ar1SmoothFwhmMm')).toBe('mm');
    expect(parameterName('model.highpassCutoffSec')).toBe('model drift cutoff');
    // a step nobody registered, or a parameter without a label: spelled out from the key
    expect(parameterName('warp.maxShiftMm')).toBe('warp max shift');
    expect(parameterUnit('warp.maxShiftMm')).toBe('mm');
    expect(settingText({ 'smooth.fwhmMm': 6, 'model.ar1': true })).toBe('smoothing FWHM 6 mm, AR(1) noise model true');
  });

  it('ranks settings by the steps\' simplicity orders at the recipe\'s parameters', () => {
    const recipe = [{ step: 'highpass', params: { cutoffSec: 128 } }, { step: 'smooth', params: { fwhmMm: 0 } }];
    const grid = settingsGrid({ 'highpass.cutoffSec': [64, 128], 'smooth.fwhmMm': [0, 6], 'model.ar1': [true] });
    expect(grid.map((s) => settingSimplicity(s, recipe))).toEqual([[-64, 0, null], [-64, 6, null], [-128, 0, null], [-128, 6, null]]);
    expect(settingSimplicity({ 'grand-mean-scale.target': 100 }, [{ step: 'grand-mean-scale', params: {} }])).toEqual([null]);
  });

  it('tells the recommendation which end of the values is simpler', () => {
    const smooth = { step: 'smooth', params: { fwhmMm: 0 } }, highpass = { step: 'highpass', params: { cutoffSec: 128 } };
    expect(simplerEnd({ recipe: [smooth], vary: { 'smooth.fwhmMm': [8, 0, 4] } })).toBe('smallest');
    // a longer high-pass cutoff removes less: the larger value is the simpler one
    expect(simplerEnd({ recipe: [highpass], vary: { 'highpass.cutoffSec': [64, 128, 256] } })).toBe('largest');
    expect(simplerEnd({ recipe: [highpass, smooth], vary: { 'highpass.cutoffSec': [64, 128], 'smooth.fwhmMm': [0, 6] } })).toBeNull();
    expect(simplerEnd({ recipe: [smooth], vary: { 'model.ar1': [true, false] } })).toBeNull();
    expect(simplerEnd({ recipe: [{ step: 'grand-mean-scale', params: {} }], vary: { 'grand-mean-scale.target': [100, 1000] } })).toBeNull();
    expect(simplerEnd({ recipe: [{ step: 'not-registered', params: {} }], vary: { 'not-registered.sizeMm': [1, 2] } })).toBeNull();
  });
});

describe('examples/interpolation-kernel.yaml', () => {
  const file = new URL('../../examples/interpolation-kernel.yaml', import.meta.url);
  it('is a well-formed spec varying the resample kernel and two target voxel sizes', () => {
    const spec = parseSweepSpecShape(YAML.parse(readFileSync(file, 'utf8')));
    expect(Object.keys(spec.vary)).toEqual(['resample.kernel', 'resample.voxelSizeMm']);
    expect(spec.vary['resample.voxelSizeMm']).toHaveLength(2);
  });
  it('validates against the registry once the resample step is registered (UNKNOWN_STEP until then)', () => {
    if (listSteps().includes('resample')) {
      expect(readSweepSpec(file.pathname).recipe.map((r) => r.step)).toContain('resample');
    } else {
      try { readSweepSpec(file.pathname); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'UNKNOWN_STEP')).toBe(true); }
    }
  });
});
