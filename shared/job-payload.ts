/**
 * What travels between the orchestrator and workers, whichever transport carries it: a chunk of points to
 * run, and the chunk's outcomes. Both are validated with zod where they arrive.
 */
import { z } from 'zod';
import { modelResultSchema } from './model-result.js';

export const pointTaskSchema = z.object({
  point_index: z.number().int().nonnegative(),
  point_id: z.string().regex(/^[0-9a-f]{32}$/),
  params: z.record(z.string(), z.unknown()),
});

export const chunkTaskSchema = z.object({
  sweep_id: z.string().regex(/^[0-9a-f]{64}$/),
  chunk_index: z.number().int().nonnegative(),
  points: z.array(pointTaskSchema).min(1),
});
export type ChunkTaskPayload = z.infer<typeof chunkTaskSchema>;

/**
 * A model that ran reports its result (whatever its numerical status); `infrastructure` means it could not
 * run to a result (an exception, a crashed thread) and is retried by `resume`.
 */
export const pointOutcomeSchema = z.object({
  point_index: z.number().int().nonnegative(),
  point_id: z.string(),
  outcome: z.discriminatedUnion('kind', [
    z.object({ kind: z.literal('model'), result: modelResultSchema }),
    z.object({ kind: z.literal('infrastructure'), reason: z.string() }),
  ]),
});
export type PointOutcome = z.infer<typeof pointOutcomeSchema>;

export const chunkOutcomeSchema = z.object({
  sweep_id: z.string(),
  chunk_index: z.number().int().nonnegative(),
  worker_host: z.string(),
  points: z.array(pointOutcomeSchema),
});
export type ChunkOutcomePayload = z.infer<typeof chunkOutcomeSchema>;
