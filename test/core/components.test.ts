import { describe, expect, it } from 'vitest';
import { labelComponents } from '../../src/core/components.js';

// Reference: scipy.ndimage.label with the default structure (6-connectivity) and generate_binary_structure(3,3)
// (26-connectivity) gives 2 and 1 components for two voxels touching at a corner (definition of the structures).
describe('connected components', () => {
  it('counts corner-touching voxels as one component only at 26-connectivity', () => {
    const mask = new Uint8Array(27);
    mask[0] = 1; mask[13] = 1; // (0,0,0) and (1,1,1)
    expect(labelComponents(mask, [3, 3, 3], 6).count).toBe(2);
    expect(labelComponents(mask, [3, 3, 3], 18).count).toBe(2);
    expect(labelComponents(mask, [3, 3, 3], 26).count).toBe(1);
  });
  it('sizes add up to the mask count and labels are in scan order', () => {
    const mask = new Uint8Array(4 * 4 * 1);
    [0, 1, 4, 10, 11, 15].forEach((i) => (mask[i] = 1));
    const c = labelComponents(mask, [4, 4, 1], 6);
    expect(c.sizes).toEqual([3, 3]);
    expect(c.labels[0]).toBe(1);
    expect(c.labels[15]).toBe(2);
  });
});
