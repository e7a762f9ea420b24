/**
 * Group commit of chunk outcomes into the store, on the orchestrator's one thread without starving it.
 *
 * - Outcomes queue up; one writer loop takes up to BATCH_POINTS points (from one or several outcomes, or a
 *   slice of a big one) per SQLite transaction, and yields to the event loop before each, so signals, the
 *   store-lock heartbeat, BullMQ lock renewals and Redis I/O run between transactions however fast results
 *   arrive. Outcomes that arrive while a transaction is written share the next one.
 * - `commit(outcome)` resolves only after the transaction holding its last point has committed: the caller
 *   (a transport) may then forget the outcome (complete its result job). A crash between two transactions of
 *   one outcome is harmless: the outcome is delivered again and the writes are idempotent.
 * - The tasks of every chunk in flight are kept (`track`), so a point is derived once per run (zod parse and
 *   SHA-256 in `PointSource.taskAt`): its outcome is stored with the params of the task it answers, after a
 *   point-id check. Outcomes of chunks this run did not submit (a repeated delivery, results an earlier run
 *   left in Redis) are re-derived from their index.
 */
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../shared/job-payload.js';
import type { StoredOutcome, SweepStore } from '../store/index.js';
import type { PointSource } from './points.js';

/** Points per transaction: large enough to amortise a commit, small enough to keep the thread responsive. */
export const BATCH_POINTS = 500;

type TaskPoint = ChunkTaskPayload['points'][number];

interface Entry {
  readonly outcome: ChunkOutcomePayload;
  /** Points of the outcome already written. */
  written: number;
  readonly resolve: () => void;
  readonly reject: (error: unknown) => void;
}

export const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** One stored row for a point outcome, given the task it answers (or none): a mismatched id is a failure. */
function storedRow(outcome: ChunkOutcomePayload, p: ChunkOutcomePayload['points'][number], task: { pointId: string; params: StoredOutcome['params'] }): StoredOutcome {
  const mismatch = task.pointId !== p.point_id;
  return {
    sweepId: outcome.sweep_id,
    pointId: task.pointId,
    pointIndex: p.point_index,
    params: task.params,
    outcome: mismatch
      ? { kind: 'infrastructure', reason: `point id mismatch: worker ran ${p.point_id}, expected ${task.pointId} (another model version?)` }
      : p.outcome,
    workerHost: outcome.worker_host,
  };
}

/** Turn a chunk outcome into store rows, re-deriving each point from its index (and checking its id). */
export function storedOutcomes(source: PointSource, outcome: ChunkOutcomePayload): StoredOutcome[] {
  return outcome.points.map((p) => storedRow(outcome, p, source.taskAt(p.point_index)));
}

export class ResultCommitter {
  private readonly queue: Entry[] = [];
  private readonly tasks = new Map<number, Map<number, TaskPoint>>();
  private points = 0;
  private writing = false;
  private failure: unknown = null;

  constructor(
    private readonly source: PointSource,
    private readonly store: SweepStore,
    /** Called after each transaction with its rows (progress, counts). */
    private readonly onCommitted: (rows: readonly StoredOutcome[]) => void = () => undefined,
    /** Called once when a transaction fails, after the outcomes waiting for it are rejected. */
    private readonly onFailed: (error: unknown) => void = () => undefined,
  ) {}

  /** Points of tracked chunks not yet written. */
  get inFlightPoints(): number {
    return this.points;
  }

  /** Tracked chunks with a point not yet written (updated in the transaction's turn, before `onCommitted`). */
  get inFlightChunks(): number {
    return this.tasks.size;
  }

  /** True once a transaction has failed: every later commit rejects. */
  get failed(): boolean {
    return this.failure !== null;
  }

  /** Keep a submitted chunk's tasks until its outcome is written. */
  track(chunk: ChunkTaskPayload): void {
    let byIndex = this.tasks.get(chunk.chunk_index);
    if (byIndex === undefined) this.tasks.set(chunk.chunk_index, (byIndex = new Map()));
    for (const p of chunk.points) {
      if (!byIndex.has(p.point_index)) this.points++;
      byIndex.set(p.point_index, p);
    }
  }

  /** Forget a tracked chunk without an outcome (abandoned on an immediate stop). */
  forgetAll(): void {
    this.tasks.clear();
    this.points = 0;
  }

  /** Queue an outcome; resolves when all of its points are committed, rejects if the store fails. */
  commit(outcome: ChunkOutcomePayload): Promise<void> {
    if (this.failure !== null) return Promise.reject(this.failure);
    return new Promise((resolve, reject) => {
      this.queue.push({ outcome, written: 0, resolve, reject });
      if (!this.writing) void this.writeLoop();
    });
  }

  private rowFor(outcome: ChunkOutcomePayload, p: ChunkOutcomePayload['points'][number]): StoredOutcome {
    const byIndex = this.tasks.get(outcome.chunk_index);
    const kept = byIndex?.get(p.point_index);
    if (kept === undefined || byIndex === undefined) return storedRow(outcome, p, this.source.taskAt(p.point_index));
    byIndex.delete(p.point_index);
    this.points--;
    if (byIndex.size === 0) this.tasks.delete(outcome.chunk_index);
    return storedRow(outcome, p, { pointId: kept.point_id, params: kept.params as StoredOutcome['params'] });
  }

  private async writeLoop(): Promise<void> {
    this.writing = true;
    try {
      while (this.queue.length > 0) {
        await yieldToEventLoop();
        const rows: StoredOutcome[] = [];
        const finished: Entry[] = [];
        for (const entry of this.queue) {
          const take = Math.min(BATCH_POINTS - rows.length, entry.outcome.points.length - entry.written);
          for (let i = entry.written; i < entry.written + take; i++) rows.push(this.rowFor(entry.outcome, entry.outcome.points[i]));
          entry.written += take;
          if (entry.written === entry.outcome.points.length) finished.push(entry);
          if (rows.length >= BATCH_POINTS) break;
        }
        try {
          if (rows.length > 0) this.store.writeResults(rows);
        } catch (error) {
          this.failure = error;
          for (const entry of this.queue.splice(0)) entry.reject(error);
          this.onFailed(error);
          return;
        }
        this.queue.splice(0, finished.length);
        this.onCommitted(rows);
        for (const entry of finished) entry.resolve();
      }
    } finally {
      this.writing = false;
    }
  }
}
