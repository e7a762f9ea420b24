/**
 * What goes into the store and what comes back out: zod schemas (validated where data enters the
 * orchestrator, e.g. a results job from a queue, and on every row read back) and the types inferred from them.
 */
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { issuesToDetails } from '../../shared/model-params.js';
import { MODEL_STATUSES, modelResultSchema } from '../../shared/model-result.js';

/** Status of a point whose model never returned (an exception, a crashed thread, a lost worker). */
export const INFRASTRUCTURE_ERROR = 'infrastructure_error';
/** Every status a results row can hold: the model's own statuses and the infrastructure failure. */
export const STORED_STATUSES = [...MODEL_STATUSES, INFRASTRUCTURE_ERROR] as const;
export type StoredStatus = (typeof STORED_STATUSES)[number];

/** One resolved model parameter: a number, a choice, or a list of numbers. */
export const paramValueSchema = z.union([z.number(), z.string(), z.array(z.number())]);
export type ParamValue = z.infer<typeof paramValueSchema>;

export const outcomeSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('model'), result: modelResultSchema }).strict(),
  z.object({ kind: z.literal('infrastructure'), reason: z.string().min(1) }).strict(),
]);
export type Outcome = z.infer<typeof outcomeSchema>;

/** One point's outcome as the store receives it. */
export const storedOutcomeSchema = z
  .object({
    sweepId: z.string().min(1),
    pointId: z.string().min(1),
    /** Position of the point in the sweep's expansion order (0-based). */
    pointIndex: z.number().int().nonnegative(),
    /** The fully resolved model input, one entry per parameter of the parameter table. */
    params: z.record(z.string(), paramValueSchema),
    outcome: outcomeSchema,
    /** Host name of the machine that ran (or failed to run) the model. */
    workerHost: z.string(),
    /** When the outcome was produced, ms since the Unix epoch; defaults to the time it is written. */
    finishedAt: z.number().int().nonnegative().optional(),
  })
  .strict();
export type StoredOutcome = z.infer<typeof storedOutcomeSchema>;

/** An outcome read back from the store: as written, with the time it finished. */
export type StoredRecord = StoredOutcome & { readonly finishedAt: number };

/** How a batch went: rows written (new or replacing a non-ok row) and rows skipped because an ok row exists. */
export interface WriteSummary {
  readonly written: number;
  readonly skippedOk: number;
}

/** Validate a batch of outcomes that arrived from outside the process (a queue payload, a file). */
export function parseStoredOutcomes(raw: unknown): StoredOutcome[] {
  const parsed = z.array(storedOutcomeSchema).safeParse(raw);
  if (!parsed.success) {
    throw new DisksweepError('store/invalid-outcome', 'a batch of results does not match the result schema', {
      details: issuesToDetails(parsed.error),
    });
  }
  return parsed.data;
}

const hashLike = z.string().min(1).max(200);
const epochMs = z.number().int().nonnegative();

/** A sweep as the caller registers it. */
export const newSweepSchema = z
  .object({
    sweepId: hashLike,
    name: z.string().min(1),
    description: z.string().nullable().default(null),
    /** The spec as canonical JSON text. */
    specJson: z.string().min(2),
    specHash: hashLike,
    modelVersion: z.string().min(1),
    /** Points the sweep expands to; at most 2^32 (a point's index is the low 32 bits of its key). */
    nPoints: z.number().int().nonnegative().max(2 ** 32),
    /** Points per chunk, calibrated once; a resume keeps it. */
    chunkSize: z.number().int().min(1),
  })
  .strict();
export type NewSweep = z.input<typeof newSweepSchema>;

export const sweepRecordSchema = newSweepSchema.extend({ createdAt: epochMs, updatedAt: epochMs });
export type SweepRecord = z.infer<typeof sweepRecordSchema>;

/** What registerSweep found. A model-version mismatch is reported, not resolved: the caller decides (exit 2). */
export type RegisterOutcome =
  | { readonly kind: 'created'; readonly sweep: SweepRecord }
  | { readonly kind: 'existing'; readonly sweep: SweepRecord }
  | { readonly kind: 'model-version-mismatch'; readonly sweep: SweepRecord; readonly requestedModelVersion: string };
