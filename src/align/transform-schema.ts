import { z } from 'zod';

/** Version of boldsweep's transform file format (the `boldsweepTransform` field). */
export const TRANSFORM_FORMAT_VERSION = 1;

/** One row of a 4x4 matrix. */
const row = z.tuple([z.number(), z.number(), z.number(), z.number()]);
const rows = z.tuple([row, row, row, row]);
const space = z.object({ name: z.string(), dims: z.tuple([z.number().int(), z.number().int(), z.number().int()]), voxelToWorld: rows }).strict();
/** Schema of the transform file (zod; unknown keys refused). */
export const transformFileSchema = z.object({
  boldsweepTransform: z.literal(TRANSFORM_FORMAT_VERSION),
  about: z.string().optional(),
  from: space,
  to: space,
  matrix: rows,
}).strict();

/** boldsweep's transform file, as JSON (see transformToJson). */
export type TransformJson = z.infer<typeof transformFileSchema>;

