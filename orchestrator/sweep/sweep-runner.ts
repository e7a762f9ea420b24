/**
 * Drives one sweep through any transport: builds the chunks that still need work (chunk k is always the
 * index range [k·size, (k+1)·size); a resumed chunk holds only its missing points), keeps the transport's
 * window full (and at most MAX_IN_FLIGHT_POINTS points in flight), and commits outcomes to the store as they
 * arrive (group commit, result-committer.ts). The store is the truth: what is committed is never run again,
 * whatever happens to the process afterwards. The loop yields to the event loop after every YIELD_POINTS
 * points it builds (and whenever it waits), so a sweep of fast models never keeps signals, lock heartbeats or
 * Redis I/O waiting; the slices are counted in work, not time, so what a transport receives between two
 * yields (e.g. one `addBulk` batch) does not depend on the machine's load.
 */
import type { ChunkTaskPayload } from '../../shared/job-payload.js';
import type { SweepStore } from '../store/sweep-store.js';
import type { Transport } from '../transport/transport.js';
import type { PointSource } from './points.js';
import { ResultCommitter, yieldToEventLoop } from './result-committer.js';

/**
 * Points submitted and not yet committed, at most (a chunk bigger than this still goes alone). Bounds the
 * orchestrator's memory (each kept task holds its parameters) and what a Redis holds for one sweep.
 */
export const MAX_IN_FLIGHT_POINTS = 50_000;

/** Points built (each a zod parse and a SHA-256) between two yields to the event loop: ~10-50 ms of work. */
const YIELD_POINTS = 1000;

export interface SweepRunInput {
  readonly sweepId: string;
  readonly chunkSize: number;
  readonly source: PointSource;
  /** True for point indexes that already have a result that counts (see SweepStore.pointIndexesWithResult). */
  readonly hasResult: Uint8Array;
  readonly store: SweepStore;
  readonly transport: Transport;
  /** Called after each commit with the running counts. */
  readonly onProgress?: (counts: SweepCounts) => void;
  /** When aborted, no new chunk is submitted; chunks in flight finish and are committed. */
  readonly signal?: AbortSignal;
}

export interface SweepCounts {
  /** Points with a result (this run's plus those found already stored). */
  done: number;
  /** Of this run's results, those that are not `ok`. */
  failed: number;
  total: number;
  /** Points this run committed. */
  committed: number;
}

export function chunkCount(nPoints: number, chunkSize: number): number {
  return Math.ceil(nPoints / chunkSize);
}

/** Build chunk k from the points in its range that still need a result; null when none do. */
export function buildChunk(input: Pick<SweepRunInput, 'sweepId' | 'chunkSize' | 'source' | 'hasResult'>, k: number): ChunkTaskPayload | null {
  const { sweepId, chunkSize, source, hasResult } = input;
  const points: ChunkTaskPayload['points'] = [];
  const end = Math.min(source.size, (k + 1) * chunkSize);
  for (let i = k * chunkSize; i < end; i++) {
    if (hasResult[i] === 1) continue;
    const t = source.taskAt(i);
    points.push({ point_index: i, point_id: t.pointId, params: t.params });
  }
  return points.length > 0 ? { sweep_id: sweepId, chunk_index: k, points } : null;
}

export async function runSweep(input: SweepRunInput): Promise<SweepCounts & { interrupted: boolean }> {
  const { source, store, transport, hasResult, signal } = input;
  let already = 0;
  for (let i = 0; i < source.size; i++) already += hasResult[i];
  const counts: SweepCounts = { done: already, failed: 0, total: source.size, committed: 0 };
  let wake: (() => void) | null = null;

  const committer = new ResultCommitter(source, store, (rows) => {
    for (const r of rows) {
      if (hasResult[r.pointIndex] === 1) continue; // a repeated delivery
      hasResult[r.pointIndex] = 1;
      counts.done++;
      counts.committed++;
      if (r.outcome.kind !== 'model' || r.outcome.result.status !== 'ok') counts.failed++;
    }
    input.onProgress?.({ ...counts });
    wake?.();
  }, () => wake?.()); // a failed store halts the loop (below); the transport sees the rejected commit too, and close() reports it
  transport.onOutcome((outcome) => committer.commit(outcome));

  // The loop waits on the committer's counts, never on transport.pending(): they change in the same turn that
  // calls wake(), so a wake is never lost. pending() lags: the embedded transport forgets a chunk only after
  // its commit has resolved, a few microtasks after the wake. A transaction that committed every chunk in
  // flight then left the loop asleep on a stale "window full", with nothing left to wake it; the event loop
  // emptied and Node ended the process with exit code 13 (unsettled top-level await) halfway through a sweep.
  const halted = (): boolean => signal?.aborted === true || committer.failed;
  signal?.addEventListener('abort', () => wake?.(), { once: true });
  const waitUntil = async (ready: () => boolean): Promise<void> => {
    while (!ready() && !halted()) await new Promise<void>((resolve) => (wake = resolve));
    wake = null;
  };
  const room = (next: number): boolean =>
    committer.inFlightChunks < transport.window && (committer.inFlightPoints === 0 || committer.inFlightPoints + next <= MAX_IN_FLIGHT_POINTS);

  const chunks = chunkCount(source.size, input.chunkSize);
  let builtSinceYield = 0;
  let k = 0;
  for (; k < chunks && !halted(); k++) {
    const chunk = buildChunk(input, k);
    if (chunk === null) continue;
    if (!room(chunk.points.length)) {
      await waitUntil(() => room(chunk.points.length));
      builtSinceYield = 0;
      if (halted()) break;
    }
    committer.track(chunk);
    await transport.submit(chunk);
    builtSinceYield += chunk.points.length;
    if (builtSinceYield >= YIELD_POINTS) {
      builtSinceYield = 0;
      await yieldToEventLoop();
    }
  }
  // Everything is submitted: wait for the last outcomes, unless interrupted meanwhile (a Redis sweep's chunks
  // may wait for workers for hours; Ctrl-C must not wait with them). A graceful close then waits for the
  // transport to forget the committed chunks.
  await waitUntil(() => committer.inFlightChunks === 0);
  // A Ctrl-C that came after every chunk was submitted and committed interrupted nothing.
  const interrupted = signal?.aborted === true && (k < chunks || committer.inFlightChunks > 0);
  await transport.close(interrupted ? 'interrupted' : 'graceful');
  // Nor did one whose chunks in flight the embedded transport still saw through to the end.
  return { ...counts, interrupted: interrupted && counts.done < counts.total };
}
