/**
 * The worker-thread pool that runs chunks, shared by every transport: the embedded transport feeds it from
 * the sweep runner, `disksweep work` from its BullMQ processor. CPU-bound model runs stay off the event loop
 * (locks are renewed, heartbeats go out). A thread that dies takes only its chunk: `run` rejects and the caller
 * decides what the chunk's outcome is.
 */
import { availableParallelism, hostname } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import { chunkOutcomeSchema, type ChunkOutcomePayload, type ChunkTaskPayload } from '../shared/job-payload.js';

const WORKER_FILE = fileURLToPath(new URL('./chunk-worker.js', import.meta.url));
const decoder = new TextDecoder();

export function defaultThreadCount(): number {
  return availableParallelism();
}

export interface ChunkPool {
  readonly threads: number;
  /**
   * Run one chunk in a thread; rejects when the thread fails (crash, exit, out of memory) or `signal` aborts
   * (the thread is then terminated and replaced).
   */
  run(chunk: ChunkTaskPayload, signal?: AbortSignal): Promise<ChunkOutcomePayload>;
  destroy(): Promise<void>;
}

export function createChunkPool(threads: number = defaultThreadCount()): ChunkPool {
  const pool = new Piscina({ filename: WORKER_FILE, minThreads: threads, maxThreads: threads, idleTimeout: 60_000 });
  return {
    threads,
    async run(chunk, signal) {
      const buffer = (await pool.run(chunk, { signal: signal ?? null })) as ArrayBuffer | Uint8Array;
      return chunkOutcomeSchema.parse(JSON.parse(decoder.decode(buffer)));
    },
    destroy: () => pool.destroy(),
  };
}

/** The outcome of a chunk whose thread failed: every point an infrastructure failure with the reason. */
export function crashedOutcome(chunk: ChunkTaskPayload, error: unknown, context = 'worker thread failed'): ChunkOutcomePayload {
  return {
    sweep_id: chunk.sweep_id,
    chunk_index: chunk.chunk_index,
    worker_host: hostname(),
    points: chunk.points.map((p) => ({
      point_index: p.point_index,
      point_id: p.point_id,
      outcome: { kind: 'infrastructure', reason: `${context}: ${error instanceof Error ? error.message : String(error)}`.slice(0, 2000) },
    })),
  };
}
