/**
 * `disksweep work`: take chunk jobs of every registered sweep of this model version from Redis, run them in the
 * worker-thread pool (so the event loop stays free and BullMQ renews locks), and add each chunk's outcome as one
 * job to the sweep's results queue before returning. Delivery is at least once: a SIGKILLed worker's chunk
 * returns through stalled-job recovery, and the store's writes are idempotent.
 *
 * A chunk whose thread dies, runs out of memory or hangs past its watchdog is retried (BullMQ attempts); on its
 * last attempt it is split in halves down to single points, and a point that still fails is reported as an
 * infrastructure failure with the reason, so one poison point never blocks a sweep (poison-chunks.ts).
 */
import { hostname } from 'node:os';
import { Queue, Worker, type Job } from 'bullmq';
import { crashPoint } from '../shared/crash-point.js';
import { chunkTaskSchema, type ChunkOutcomePayload } from '../shared/job-payload.js';
import { MODEL_VERSION } from '../shared/model-version.js';
import { redact, redactError } from '../shared/redact.js';
import { awaitRedis, bullConnection, type RedisTarget } from '../shared/redis/redis-connection.js';
import { heartbeatKey, registryKey, resultsQueueName, versionTag } from '../shared/redis/redis-names.js';
import { registryEntrySchema, RESULT_JOB_OPTIONS } from '../shared/redis/redis-registry.js';
import { createChunkPool, type ChunkPool } from './chunk-pool.js';
import { poisonAwareRunner } from './poison-chunks.js';

export interface QueueWorkerOptions {
  readonly target: RedisTarget;
  /** Pool threads = chunks run at once. */
  readonly threads: number;
  /** BullMQ lock duration (ms): a dead worker's chunk is taken again after about this long. */
  readonly lockMs: number;
  /** BullMQ stalled-job check interval (ms). */
  readonly stalledMs: number;
  /** One line per event, already redacted. */
  readonly log: (line: string) => void;
  /** Also log every chunk taken and finished. */
  readonly verbose?: boolean;
  /** The model version this worker runs (tests pretend to be another). */
  readonly modelVersion?: string;
  /** Shortest watchdog limit of a chunk, ms (default 60 000; see poison-chunks.ts). */
  readonly watchdogMinMs?: number;
}

export interface QueueWorker {
  /** Finish (or release) the chunks in hand, then disconnect. */
  close(): Promise<void>;
}

/**
 * How often the registry is read: a new sweep waits on average half of this before any worker takes a chunk, which
 * cost a 4-s sweep ~10 % of its wall time at 1 s. One HGETALL of a small hash per worker is nothing to Redis.
 */
const POLL_MS = 200;
const HEARTBEAT_MS = 5000;
const HEARTBEAT_TTL_MS = 15_000;
/** Recreate a BullMQ worker that has been idle this long while its queue has chunks waiting. */
const IDLE_WITH_WORK_MS = 10_000;

interface SweepWorker {
  worker: Worker;
  queue: Queue;
  results: Queue;
  lastActivity: number;
  active: number;
  /** Replace the BullMQ worker (the old one is closed without waiting). */
  remake: () => Promise<void>;
}

export async function startQueueWorker(o: QueueWorkerOptions): Promise<QueueWorker> {
  const version = o.modelVersion ?? MODEL_VERSION;
  const connection = bullConnection(o.target.connection);
  const pool: ChunkPool = createChunkPool(o.threads);
  const runner = poisonAwareRunner(pool, { minMs: o.watchdogMinMs });
  const control = new Queue('control', { connection, prefix: o.target.prefix, skipMetasUpdate: true });
  control.on('error', (e) => logError('redis', e));
  const sweeps = new Map<string, SweepWorker>();
  const otherVersions = new Set<string>();
  let chunksDone = 0;
  let closing = false;
  let lastErrorLine = '';

  function logError(where: string, error: unknown): void {
    const line = `${where}: ${redactError(error)}`;
    if (line !== lastErrorLine) o.log(line); // one line per distinct error, not one per retry
    lastErrorLine = line;
  }

  function startSweep(chunkQueue: string, sweepId: string): void {
    const results = new Queue(resultsQueueName(sweepId, version), { connection, prefix: o.target.prefix, skipMetasUpdate: true });
    results.on('error', (e) => logError('redis', e));
    const queue = new Queue(chunkQueue, { connection, prefix: o.target.prefix, skipMetasUpdate: true });
    const entry: SweepWorker = {
      worker: undefined as unknown as Worker, // set below, once the processor that updates this entry exists
      queue, results, lastActivity: Date.now(), active: 0,
      remake: async () => {
        const old = entry.worker;
        entry.worker = make();
        entry.lastActivity = Date.now();
        await old.close(true).catch(() => undefined);
      },
    };
    entry.queue.on('error', (e) => logError('redis', e));
    const processor = async (job: Job): Promise<{ points: number }> => {
      entry.active++;
      entry.lastActivity = Date.now();
      try {
        const task = chunkTaskSchema.parse(job.data);
        if (o.verbose === true) o.log(`chunk ${task.chunk_index} of ${sweepId.slice(0, 12)}: started (${task.points.length} points, attempt ${job.attemptsMade + 1})`);
        const lastAttempt = job.attemptsMade + 1 >= (job.opts.attempts ?? 1);
        let outcome: ChunkOutcomePayload;
        try {
          outcome = await runner.run(task, lastAttempt);
        } catch (error) {
          throw new Error(redact(`chunk ${task.chunk_index}, attempt ${job.attemptsMade + 1}: ${redactError(error)}`));
        }
        await results.add('outcome', outcome, RESULT_JOB_OPTIONS);
        crashPoint('after-results-push');
        chunksDone++;
        if (o.verbose === true) o.log(`chunk ${task.chunk_index} of ${sweepId.slice(0, 12)}: results sent`);
        return { points: outcome.points.length };
      } finally {
        entry.active--;
        entry.lastActivity = Date.now();
      }
    };
    const make = (): Worker => {
      const w = new Worker(chunkQueue, processor, {
        connection, prefix: o.target.prefix, concurrency: o.threads, lockDuration: o.lockMs, stalledInterval: o.stalledMs, maxStalledCount: 2,
      });
      w.on('error', (e) => logError('redis', e));
      w.on('failed', (job, e) => logError(`chunk job ${job?.id ?? '?'}`, e));
      return w;
    };
    entry.worker = make();
    sweeps.set(chunkQueue, entry);
    o.log(`taking chunks of sweep ${sweepId.slice(0, 12)} (queue ${chunkQueue})`);
  }

  async function stopSweep(name: string): Promise<void> {
    const entry = sweeps.get(name);
    if (entry === undefined) return;
    sweeps.delete(name);
    await entry.worker.close();
    // Until that close, the worker's stalled-job check kept re-creating <queue>:meta (no TTL) and
    // :stalled-check, even after the orchestrator obliterated the queue. A queue gone from the registry has
    // been obliterated (graceful end or cancel), so its leftovers are ours to remove.
    try {
      const client = await control.client;
      if ((await client.hexists(registryKey(o.target.prefix), name)) === 0) await client.del(entry.queue.keys.meta, entry.queue.keys['stalled-check']);
    } catch (error) {
      logError('redis', error); // Redis away: nothing to tidy, and the next start obliterates anyway
    }
    await Promise.allSettled([entry.queue.close(), entry.results.close()]);
    o.log(`sweep of queue ${name} is no longer registered: stopped taking its chunks`);
  }

  async function poll(): Promise<void> {
    const client = await control.client;
    const registry = await client.hgetall(registryKey(o.target.prefix));
    const wanted = new Set<string>();
    for (const [name, raw] of Object.entries(registry)) {
      let entry;
      try {
        entry = registryEntrySchema.parse(JSON.parse(raw));
      } catch {
        continue;
      }
      if (versionTag(entry.model_version) !== versionTag(version)) {
        if (!otherVersions.has(name)) o.log(`sweep ${entry.sweep_id.slice(0, 12)} needs model version ${entry.model_version}; this worker runs ${version}: not taking its chunks`);
        otherVersions.add(name);
        continue;
      }
      wanted.add(name);
      if (!sweeps.has(name)) startSweep(name, entry.sweep_id);
    }
    for (const name of [...sweeps.keys()]) if (!wanted.has(name)) await stopSweep(name);
    for (const entry of sweeps.values()) {
      if (entry.active > 0 || Date.now() - entry.lastActivity < IDLE_WITH_WORK_MS) continue;
      const waiting = await entry.queue.getWaitingCount();
      if (waiting > 0) {
        o.log(`idle for ${IDLE_WITH_WORK_MS / 1000} s while ${waiting} chunks wait: recreating the queue worker`);
        await entry.remake(); // a connection that came back but a worker that did not
      }
    }
  }

  async function heartbeat(): Promise<void> {
    const client = await control.client;
    const value = JSON.stringify({ host: hostname(), pid: process.pid, model_version: version, threads: o.threads, chunks_done: chunksDone, sweeps: sweeps.size, at: Date.now() });
    await client.set(heartbeatKey(o.target.prefix, hostname(), process.pid), value, { PX: HEARTBEAT_TTL_MS });
  }

  let pollTimer: NodeJS.Timeout | undefined;
  let pollRunning = false;
  const tick = async (): Promise<void> => {
    if (pollRunning || closing) return;
    pollRunning = true;
    try {
      await poll();
    } catch (error) {
      logError('redis', error);
    } finally {
      pollRunning = false;
    }
  };
  // Wait for Redis (a worker may start before it), but give up at once on a wrong password or certificate.
  try {
    await awaitRedis(control.waitUntilReady(), control, o.target.description);
  } catch (error) {
    await pool.destroy(); // the control queue is left as it is: closing a refused connection rejects out of reach
    throw error;
  }
  pollTimer = setInterval(() => void tick(), POLL_MS);
  const beatTimer = setInterval(() => void heartbeat().catch((e: unknown) => logError('redis', e)), HEARTBEAT_MS);
  await heartbeat().catch((e: unknown) => logError('redis', e));
  await tick();
  o.log(`worker ${hostname()}:${process.pid} ready: model version ${version}, ${o.threads} thread${o.threads === 1 ? '' : 's'}, ${o.target.description}`);

  return {
    async close() {
      closing = true;
      clearInterval(pollTimer);
      clearInterval(beatTimer);
      pollTimer = undefined;
      await Promise.allSettled([...sweeps.keys()].map((name) => stopSweep(name)));
      try {
        const client = await control.client;
        await client.del(heartbeatKey(o.target.prefix, hostname(), process.pid));
      } catch {
        // Redis away: the heartbeat expires by itself
      }
      await control.close().catch(() => undefined);
      await pool.destroy();
    },
  };
}
