import type { PhantomSpecInput } from '../../src/simulate/phantom-spec.js';

/**
 * A noise-free, artefact-free spec on a coarse 7 mm grid (22 x 26 x 21 voxels holds the whole head),
 * so tests run fast and see one effect at a time. Callers switch on what they test.
 */
export function quietSpec(over: PhantomSpecInput = {}): PhantomSpecInput {
  return {
    dims: [22, 26, 21],
    spacingMm: [7, 7, 7],
    nVolumes: 6,
    thermalNoiseSd: 0,
    rician: false,
    physio: null,
    drift: null,
    smoothNoise: null,
    motion: null,
    b0: null,
    activation: null,
    spikes: [],
    dropouts: [],
    ...over,
  };
}

/** Centre of mass (voxel indices) of one volume of a run. */
export function centreOfMass(data: Float32Array, dims: readonly number[], t: number): [number, number, number] {
  const [nx, ny, nz] = dims;
  const off = t * nx * ny * nz;
  let s = 0, sx = 0, sy = 0, sz = 0, p = off;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) {
    const v = data[p];
    s += v; sx += v * i; sy += v * j; sz += v * k;
  }
  return [sx / s, sy / s, sz / s];
}
