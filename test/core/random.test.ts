import { describe, expect, it } from 'vitest';
import { createRng, childSeed } from '../../src/core/random.js';

describe('seeded random stream', () => {
  it('same seed gives the same draws, different seeds differ', () => {
    const a = createRng(7), b = createRng(7), c = createRng(8);
    const xa = Array.from({ length: 5 }, () => a.normal());
    const xb = Array.from({ length: 5 }, () => b.normal());
    const xc = Array.from({ length: 5 }, () => c.normal());
    expect(xa).toEqual(xb);
    expect(xa).not.toEqual(xc);
  });
  it('normal draws have mean 0 and sd 1 (definition; tolerance 5 standard errors for n = 40000)', () => {
    const rng = createRng(1);
    const x = rng.fillNormal(new Float64Array(40000));
    const mean = x.reduce((s, v) => s + v, 0) / x.length;
    const sd = Math.sqrt(x.reduce((s, v) => s + (v - mean) ** 2, 0) / (x.length - 1));
    expect(Math.abs(mean)).toBeLessThan(5 / Math.sqrt(40000));
    expect(Math.abs(sd - 1)).toBeLessThan(5 * Math.SQRT1_2 / Math.sqrt(40000));
  });
  it('child seeds are stable and distinct', () => {
    expect(childSeed(1, 'plant', 3)).toBe(childSeed(1, 'plant', 3));
    expect(childSeed(1, 'plant', 3)).not.toBe(childSeed(1, 'plant', 4));
  });
});
