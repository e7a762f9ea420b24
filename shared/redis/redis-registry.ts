/**
 * What the orchestrator writes about a running sweep for workers to find, and the options of the jobs on its
 * queues. Entries hold ids and names only (no URLs, no passwords).
 */
import { z } from 'zod';

export const registryEntrySchema = z.object({
  sweep_id: z.string().regex(/^[0-9a-f]{64}$/),
  model_version: z.string(),
  chunk_queue: z.string(),
  results_queue: z.string(),
  since: z.number(),
});
export type RegistryEntry = z.infer<typeof registryEntrySchema>;

export const heartbeatSchema = z.object({
  host: z.string(),
  pid: z.number(),
  model_version: z.string(),
  threads: z.number(),
  chunks_done: z.number(),
  sweeps: z.number(),
  at: z.number(),
});
export type Heartbeat = z.infer<typeof heartbeatSchema>;

/** Chunk attempts before a chunk is split (in the worker, on its last attempt). */
export const CHUNK_ATTEMPTS = 3;

/** A result job lives until the orchestrator has committed it; a failed commit is retried, never dropped. */
export const RESULT_JOB_OPTIONS = {
  removeOnComplete: true,
  removeOnFail: false,
  attempts: 1000,
  backoff: { type: 'fixed', delay: 1000 },
} as const;

/** Chunk jobs keep a short completed history and a longer failed one. */
export const CHUNK_JOB_OPTIONS = {
  attempts: CHUNK_ATTEMPTS,
  removeOnComplete: { count: 200 },
  removeOnFail: { count: 5000 },
} as const;
