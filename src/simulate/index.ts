// simulate: public exports of this module (re-exports only; src/index.ts re-exports this file).
export {};
