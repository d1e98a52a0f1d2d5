// resample: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { trilinearAt, trilinearResample } from './trilinear-resample.js';
export type { TrilinearMode, TrilinearOptions } from './trilinear-resample.js';
