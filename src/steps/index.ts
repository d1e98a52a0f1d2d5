// steps: public exports of this module (re-exports only; src/index.ts re-exports this file).
export type { StepNote, StepContext, StepResult, StepFunction } from './step-types.js';
