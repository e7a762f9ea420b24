/**
 * The embedded default: a pool of worker threads in this process (piscina), one per core unless told
 * otherwise. Threads are reused across chunks; each outcome comes back as a transferred buffer. A thread that
 * dies takes only its chunk with it: that chunk's points are committed as infrastructure failures, which
 * `resume` retries.
 */
import { createChunkPool, crashedOutcome, defaultThreadCount } from '../../worker/chunk-pool.js';
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../shared/job-payload.js';
import type { CommitOutcome, Transport } from './transport.js';

export { defaultThreadCount };

export interface EmbeddedOptions {
  /** Worker threads; default one per core. */
  readonly threads?: number;
}

export function createEmbeddedTransport(options: EmbeddedOptions = {}): Transport {
  const threads = options.threads ?? defaultThreadCount();
  const pool = createChunkPool(threads);
  let commit: CommitOutcome | null = null;
  const inFlight = new Set<Promise<void>>();
  let closing = false;
  let fatal: unknown = null;

  const runOne = async (chunk: ChunkTaskPayload): Promise<void> => {
    let outcome: ChunkOutcomePayload;
    try {
      outcome = await pool.run(chunk);
    } catch (error) {
      if (closing) return; // abandoned on an immediate close: no result, so resume reruns it
      outcome = crashedOutcome(chunk, error);
    }
    if (commit === null) throw new Error('embedded transport: onOutcome was not registered');
    try {
      await commit(outcome);
    } catch (error) {
      fatal ??= error; // the store failed: stop taking work and report it from close()
      closing = true;
    }
  };

  return {
    description: `embedded, ${threads} thread${threads === 1 ? '' : 's'}`,
    window: 2 * threads,
    onOutcome(fn) {
      commit = fn;
    },
    async submit(chunk) {
      if (fatal !== null) throw fatal;
      const p: Promise<void> = runOne(chunk).finally(() => inFlight.delete(p));
      inFlight.add(p);
    },
    pending: () => inFlight.size,
    async close(mode) {
      if (mode === 'immediate') {
        closing = true;
        await pool.destroy();
        await Promise.allSettled([...inFlight]);
        if (fatal !== null) throw fatal;
        return;
      }
      await Promise.all([...inFlight]);
      await pool.destroy();
      if (fatal !== null) throw fatal;
    },
  };
}
