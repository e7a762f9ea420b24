/**
 * The distributed transport: chunks become BullMQ jobs (id `c-<sweep16>-<k>`) on a queue named after the sweep
 * and the model version; `disksweep work` processes anywhere run them and add each chunk's outcome as one job to
 * the sweep's results queue. This process consumes the results queue and completes a result job only after the
 * runner's commit for it (one SQLite transaction) has resolved, so a crash anywhere loses no result: an
 * uncompleted result job comes back to the next orchestrator, an unreturned chunk to the next worker.
 * BullMQ's own completion events are not used: results travel only through the results queue.
 *
 * Reconciliation: before a chunk is added its job's state is read; a waiting, delayed or active job is left
 * alone, and so is one completed since this process started (its results are on their way); a failed one, or
 * one completed before (history of an earlier run, its results drained), is removed and added again; an absent
 * one is added. A sentinel key lets this process notice that Redis lost its data (a restart without persistence) and
 * add every uncommitted chunk again by itself.
 */
import { Queue, Worker, type Job } from 'bullmq';
import { crashPoint } from '../../shared/crash-point.js';
import { chunkOutcomeSchema, type ChunkOutcomePayload, type ChunkTaskPayload } from '../../shared/job-payload.js';
import { redactError } from '../../shared/redact.js';
import { bullConnection, redactedError, type RedisTarget } from '../../shared/redis/redis-connection.js';
import { chunkJobId, chunkQueueName, registryKey, resultsQueueName, sentinelKey, versionTag } from '../../shared/redis/redis-names.js';
import { listWorkers } from './redis-inspect.js';
import { CHUNK_JOB_OPTIONS, type RegistryEntry } from '../../shared/redis/redis-registry.js';
import type { CloseMode, CommitOutcome, Transport } from './transport.js';

export interface RedisTransportOptions {
  readonly target: RedisTarget;
  readonly sweepId: string;
  readonly modelVersion: string;
  /** Chunks enqueued and not yet committed, at most (the runner's window). */
  readonly maxQueued: number;
  readonly lockMs: number;
  readonly stalledMs: number;
  /** Log lines (redacted here already). */
  readonly log: (line: string) => void;
  /** Printed when no worker has sent a heartbeat for a while. */
  readonly workerCommand: string;
  /** Seconds without any worker heartbeat before `workerCommand` is printed (default 30). */
  readonly noWorkerHintS?: number;
}

export interface RedisTransport extends Transport {
  /**
   * Commit every result waiting in the results queue (left by an earlier orchestrator), before the plan of
   * missing chunks is made. Returns the number of result jobs committed.
   */
  drain(commit: CommitOutcome): Promise<number>;
}

const ADD_BATCH = 200;
/** Result jobs held at once: their outcomes share SQLite transactions (group commit in the runner). */
const RESULTS_CONCURRENCY = 16;
const SENTINEL_MS = 1000;

interface PendingChunk {
  readonly chunk: ChunkTaskPayload;
  readonly remaining: Set<number>;
}

export async function createRedisTransport(o: RedisTransportOptions): Promise<RedisTransport> {
  const { target, sweepId } = o;
  const connection = bullConnection(target.connection);
  const prefix = target.prefix;
  const chunkQueue = chunkQueueName(sweepId, o.modelVersion);
  const resultsQueue = resultsQueueName(sweepId, o.modelVersion);
  const chunks = new Queue(chunkQueue, { connection, prefix });
  const results = new Queue(resultsQueue, { connection, prefix });
  let lastError = '';
  const logError = (where: string, error: unknown): void => {
    const line = `${where}: ${redactError(error)}`;
    if (line !== lastError) o.log(line);
    lastError = line;
  };
  chunks.on('error', (e) => logError('redis', e));
  results.on('error', (e) => logError('redis', e));

  const entry: RegistryEntry = { sweep_id: sweepId, model_version: o.modelVersion, chunk_queue: chunkQueue, results_queue: resultsQueue, since: Date.now() };
  const client = await chunks.client;
  const register = async (): Promise<void> => {
    await client.set(sentinelKey(prefix, sweepId), String(entry.since));
    await client.hset(registryKey(prefix), { [chunkQueue]: JSON.stringify(entry) });
  };
  // Chunk jobs completed before this process started: their results were pushed before they completed, so
  // `drain` commits them. Such a chunk submitted again is a rerun (an infrastructure error, --retry-failed) and
  // is added anew; a chunk that completes later has its results on the way and is left alone.
  let completedBefore: Set<string>;
  try {
    await chunks.waitUntilReady();
    await register();
    completedBefore = new Set(await chunks.getRanges(['completed'], 0, -1));
  } catch (error) {
    await Promise.allSettled([chunks.close(), results.close()]);
    throw redactedError(error, `cannot reach Redis at ${target.description}`);
  }

  const pending = new Map<number, PendingChunk>();
  const toAdd: number[] = [];
  let commit: CommitOutcome | null = null;
  let fatal: unknown = null;
  let closed = false;
  let wakeIdle: (() => void) | null = null;

  // --- adding chunks -------------------------------------------------------------------------------------------
  let pumping = false;
  let pumpAgain = false;
  async function pump(): Promise<void> {
    if (pumping) {
      pumpAgain = true;
      return;
    }
    pumping = true;
    try {
      while (toAdd.length > 0 && !closed) {
        const batch = toAdd.splice(0, ADD_BATCH).filter((k) => pending.has(k));
        try {
          await addReconciled(batch);
        } catch (error) {
          toAdd.unshift(...batch); // Redis away: try again shortly (the sentinel check also re-adds)
          logError('adding chunks', error);
          await new Promise((r) => setTimeout(r, 500));
        }
      }
    } finally {
      pumping = false;
      if (pumpAgain) {
        pumpAgain = false;
        void pump();
      }
    }
  }

  async function addReconciled(batch: number[]): Promise<void> {
    const states = await Promise.all(batch.map((k) => chunks.getJobState(chunkJobId(sweepId, k))));
    const fresh: number[] = [];
    for (let i = 0; i < batch.length; i++) {
      const state = states[i];
      const id = chunkJobId(sweepId, batch[i]);
      if (state === 'failed' || (state === 'completed' && completedBefore.has(id))) {
        await chunks.remove(id); // history of an earlier run: it must run again
        completedBefore.delete(id);
        fresh.push(batch[i]);
      } else if (state === 'unknown') fresh.push(batch[i]);
      // waiting, delayed, prioritized, active, waiting-children, completed since this process started: on its way
    }
    const jobs = fresh.map((k) => ({ name: 'chunk', data: pending.get(k)?.chunk, opts: { ...CHUNK_JOB_OPTIONS, jobId: chunkJobId(sweepId, k) } }));
    const half = process.env.DISKSWEEP_CRASH_AT === 'mid-add-bulk' ? Math.floor(jobs.length / 2) : jobs.length;
    if (half < jobs.length && half > 0) {
      await chunks.addBulk(jobs.slice(0, half));
      crashPoint('mid-add-bulk');
      await chunks.addBulk(jobs.slice(half));
    } else if (jobs.length > 0) await chunks.addBulk(jobs);
  }

  // --- consuming results ---------------------------------------------------------------------------------------
  let activeCommit: CommitOutcome | null = null;
  const processResult = async (job: Job): Promise<void> => {
    const parsed = chunkOutcomeSchema.safeParse(job.data);
    if (!parsed.success || parsed.data.sweep_id !== sweepId) {
      o.log(`results queue: dropping malformed result job ${job.id ?? '?'}`);
      return;
    }
    const outcome: ChunkOutcomePayload = parsed.data;
    const fn = activeCommit;
    if (fn === null) throw new Error('no commit callback registered yet');
    const p = pending.get(outcome.chunk_index);
    if (p !== undefined) {
      for (const pt of outcome.points) p.remaining.delete(pt.point_index);
      if (p.remaining.size === 0) pending.delete(outcome.chunk_index);
    }
    try {
      await fn(outcome);
    } catch (error) {
      fatal ??= error; // the store failed: the job stays in Redis (retried later), this transport stops
      wakeIdle?.();
      throw error;
    }
    crashPoint('after-commit');
    if (pending.size === 0) wakeIdle?.();
  };
  let resultsWorker: Worker | null = null;
  const startResults = (): Worker => {
    resultsWorker ??= new Worker(resultsQueue, processResult, { connection, prefix, concurrency: RESULTS_CONCURRENCY, lockDuration: Math.max(o.lockMs, 5000), stalledInterval: o.stalledMs });
    resultsWorker.on('error', (e) => logError('redis (results)', e));
    return resultsWorker;
  };

  // --- sentinel, worker hint ---------------------------------------------------------------------------------
  let sentinelBusy = false;
  const sentinelTimer = setInterval(() => {
    if (sentinelBusy || closed) return;
    sentinelBusy = true;
    void (async () => {
      try {
        const seen = await client.get(sentinelKey(prefix, sweepId));
        if (seen === null && !closed) {
          o.log(`Redis lost this sweep's keys (a restart without persistence?): adding the ${pending.size} uncommitted chunks again`);
          await register();
          toAdd.push(...[...pending.keys()].filter((k) => !toAdd.includes(k)));
          void pump();
        }
      } catch (error) {
        logError('redis', error);
      } finally {
        sentinelBusy = false;
      }
    })();
  }, SENTINEL_MS);
  sentinelTimer.unref();

  let lastHeartbeat = Date.now();
  let hinted = false;
  const hintTimer = setInterval(() => {
    void (async () => {
      try {
        const workers = await listWorkers(chunks, prefix);
        const others = workers.filter((w) => versionTag(w.model_version) !== versionTag(o.modelVersion));
        if (others.length < workers.length) lastHeartbeat = Date.now();
        if (!hinted && Date.now() - lastHeartbeat > (o.noWorkerHintS ?? 30) * 1000) {
          hinted = true;
          clearInterval(hintTimer); // the hint is printed once: no reason to scan for heartbeats any longer
          const otherNote = others.length === 0 ? '' : ` (${others.length} worker${others.length === 1 ? '' : 's'} of another model version ${others.length === 1 ? 'is' : 'are'} running: ${[...new Set(others.map((w) => w.model_version))].join(', ')}; they never take this sweep's chunks)`;
          o.log(`no worker of model version ${o.modelVersion} has been seen for ${o.noWorkerHintS ?? 30} s${otherNote}; start one on any machine that reaches this Redis:\n  ${o.workerCommand}`);
        }
      } catch (error) {
        logError('redis', error);
      }
    })();
  }, 2000);
  hintTimer.unref();

  async function shutdown(mode: CloseMode): Promise<void> {
    closed = true;
    clearInterval(sentinelTimer);
    clearInterval(hintTimer);
    const worker = resultsWorker;
    if (worker !== null) await worker.close(mode === 'immediate').catch((e: unknown) => logError('redis', e));
    if (mode === 'graceful' && fatal === null && pending.size === 0) {
      // Every chunk committed: remove what this sweep left in Redis.
      try {
        await client.hdel(registryKey(prefix), chunkQueue);
        await client.del(sentinelKey(prefix, sweepId));
        await chunks.obliterate({ force: true });
        await results.obliterate({ force: true });
      } catch (error) {
        logError('cleaning up Redis', error);
      }
    }
    await Promise.allSettled([chunks.close(), results.close()]);
  }

  return {
    description: `redis (${target.description}), up to ${o.maxQueued} chunks queued`,
    interruptNote: 'committing the results in hand; queued chunks stay in Redis for workers and for resume',
    // At least 2, so a chunk waits in the queue while the result of the one before it is committed.
    window: Math.max(2, o.maxQueued),
    async drain(fn) {
      await results.retryJobs({ state: 'failed' }).catch((e: unknown) => logError('redis', e));
      let n = 0;
      activeCommit = async (outcome) => {
        await fn(outcome);
        n++;
      };
      const w = startResults();
      for (;;) {
        const c = await results.getJobCounts('waiting', 'active', 'delayed', 'prioritized');
        if ((c.waiting ?? 0) + (c.active ?? 0) + (c.delayed ?? 0) + (c.prioritized ?? 0) === 0) break;
        await new Promise((r) => setTimeout(r, 100));
      }
      await w.pause(); // waits for the result in hand; resumed when the runner registers its commit
      activeCommit = null;
      if (n > 0) o.log(`committed ${n} result job${n === 1 ? '' : 's'} left in Redis by an earlier run`);
      return n;
    },
    onOutcome(fn) {
      commit = fn;
      activeCommit = fn;
      const w = startResults();
      if (w.isPaused()) w.resume();
    },
    async submit(chunk) {
      if (fatal !== null) throw fatal;
      if (commit === null) throw new Error('redis transport: onOutcome was not registered');
      if (pending.has(chunk.chunk_index)) return;
      pending.set(chunk.chunk_index, { chunk, remaining: new Set(chunk.points.map((p) => p.point_index)) });
      toAdd.push(chunk.chunk_index);
      if (toAdd.length >= ADD_BATCH) await pump();
      else setImmediate(() => void pump());
    },
    pending: () => pending.size,
    async close(mode) {
      if (mode === 'graceful') {
        while (pending.size > 0 && fatal === null) {
          await new Promise<void>((resolve) => {
            wakeIdle = resolve;
            setTimeout(resolve, 1000).unref();
          });
          wakeIdle = null;
        }
      }
      await shutdown(mode);
      if (mode === 'immediate') pending.clear(); // abandoned: no result in the store, so resume runs them again
      if (fatal !== null) throw fatal;
    },
  };
}
