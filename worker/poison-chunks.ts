/**
 * Chunks that kill their thread, exhaust its memory or hang. A chunk gets a few attempts (BullMQ's); every
 * attempt runs under a watchdog at a large multiple of its expected time (this worker's own measure of the
 * sweep's time per point), so a hung model costs minutes, not the sweep. On the last attempt a failing chunk is
 * split in halves, down to single points, so its healthy points still get their results; a point that fails
 * alone is reported as an infrastructure failure with its reason and the sweep goes on (`resume` runs such
 * points again).
 */
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../shared/job-payload.js';
import { crashedOutcome, type ChunkPool } from './chunk-pool.js';

/** A chunk may take this many times its expected time before its thread is terminated. */
export const WATCHDOG_MULTIPLE = 20;

export interface WatchdogOptions {
  /** The shortest limit, ms (default 60 000). */
  readonly minMs?: number;
}

export interface PoisonAwareRunner {
  /** Run a chunk under the watchdog; on `lastAttempt`, split a failing chunk instead of rejecting. */
  run(task: ChunkTaskPayload, lastAttempt: boolean): Promise<ChunkOutcomePayload>;
}

/** Mean model wall time per point of a chunk (the models' own timing: no thread start-up or JIT of the module). */
function modelMsPerPoint(outcome: ChunkOutcomePayload): number | null {
  let sum = 0;
  let n = 0;
  for (const p of outcome.points) {
    if (p.outcome.kind !== 'model') continue;
    sum += p.outcome.result.timing.wall_ms;
    n++;
  }
  return n > 0 ? sum / n : null;
}

export function poisonAwareRunner(pool: ChunkPool, options: WatchdogOptions = {}): PoisonAwareRunner {
  const minMs = options.minMs ?? 60_000;
  /** Measured ms per point, per sweep (the slowest chunk seen: the watchdog must not fire on a slow region). */
  const msPerPoint = new Map<string, number>();

  /** Before any chunk of the sweep was timed here, the limit is ten minimum limits. */
  const limitMs = (task: ChunkTaskPayload): number => {
    const known = msPerPoint.get(task.sweep_id);
    return known === undefined ? 10 * minMs : Math.max(minMs, Math.round(WATCHDOG_MULTIPLE * known * task.points.length));
  };

  async function watched(task: ChunkTaskPayload): Promise<ChunkOutcomePayload> {
    const limit = limitMs(task);
    const controller = new AbortController();
    const timer = setTimeout(() => controller.abort(new Error(`watchdog: ${task.points.length === 1 ? 'the point' : `the chunk of ${task.points.length} points`} ran longer than ${limit} ms`)), limit);
    try {
      const outcome = await pool.run(task, controller.signal);
      const perPoint = modelMsPerPoint(outcome);
      if (perPoint !== null) msPerPoint.set(task.sweep_id, Math.max(perPoint, msPerPoint.get(task.sweep_id) ?? 0));
      return outcome;
    } catch (error) {
      throw controller.signal.aborted ? controller.signal.reason : error;
    } finally {
      clearTimeout(timer);
    }
  }

  async function splitting(task: ChunkTaskPayload): Promise<ChunkOutcomePayload> {
    try {
      return await watched(task);
    } catch (error) {
      if (task.points.length === 1) return crashedOutcome(task, error, 'failed alone after every attempt of its chunk');
      // One half after the other: a half queued behind a hung one must not spend its watchdog time waiting.
      const mid = Math.ceil(task.points.length / 2);
      const first = await splitting({ ...task, points: task.points.slice(0, mid) });
      const second = await splitting({ ...task, points: task.points.slice(mid) });
      return { ...first, points: [...first.points, ...second.points] };
    }
  }

  return {
    run: (task, lastAttempt) => (lastAttempt ? splitting(task) : watched(task)),
  };
}
