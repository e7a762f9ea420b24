/**
 * Looking at (and clearing) what one sweep has in Redis, for `status --redis` and `cancel`: live workers from
 * their heartbeat keys (with the model version each runs: a worker of another version never takes this sweep's
 * chunks), the sweep's chunk and results queues, and whether it is registered for workers.
 */
import { Queue, RedisConnection } from 'bullmq';
import { DisksweepError } from '../../shared/errors.js';
import { awaitRedis, bullConnection, redactedError, type RedisTarget } from '../../shared/redis/redis-connection.js';
import { chunkQueueName, heartbeatPattern, registryKey, resultsQueueName, sentinelKey, versionTag } from '../../shared/redis/redis-names.js';
import { heartbeatSchema, type Heartbeat } from '../../shared/redis/redis-registry.js';

export interface WorkerView extends Heartbeat {
  /** True when the worker runs the sweep's model version (only such workers take its chunks). */
  readonly takesThisSweep: boolean;
  /** Seconds since its last heartbeat. */
  readonly age_s: number;
}

export interface SweepInRedis {
  readonly registered: boolean;
  readonly chunks: Record<string, number>;
  readonly results_waiting: number;
  readonly workers: WorkerView[];
}

const COUNTED = ['waiting', 'active', 'delayed', 'prioritized', 'completed', 'failed'] as const;

/** How long a command waits for an unreachable Redis before it gives up. */
export const CONNECT_TIMEOUT_MS = 10_000;

/** Open both queues of a sweep, run `fn`, close them; a Redis error becomes a redacted DisksweepError. */
async function withQueues<T>(target: RedisTarget, sweepId: string, modelVersion: string, fn: (chunks: Queue, results: Queue) => Promise<T>): Promise<T> {
  const connection = bullConnection(target.connection);
  // Read-only: a status call must not leave queue metadata behind in a Redis (it may hold no such sweep).
  const chunks = new Queue(chunkQueueName(sweepId, modelVersion), { connection, prefix: target.prefix, skipMetasUpdate: true });
  const results = new Queue(resultsQueueName(sweepId, modelVersion), { connection, prefix: target.prefix, skipMetasUpdate: true });
  const ignore = (): void => undefined; // awaitRedis reports connection errors; later ones reject the command
  chunks.on('error', ignore);
  results.on('error', ignore);
  // Each queue connects at once; a refused connection must not surface later as an unhandled rejection.
  results.waitUntilReady().catch(ignore);
  let out: T;
  try {
    await awaitRedis(chunks.waitUntilReady(), chunks, target.description, CONNECT_TIMEOUT_MS);
    out = await fn(chunks, results);
  } catch (error) {
    // Not closed: closing a connection that was refused rejects inside BullMQ where nobody can catch it; the
    // command fails and its process exits (main.ts) with the clients as they are.
    if (error instanceof DisksweepError) throw error;
    throw redactedError(error, `Redis at ${target.description}`);
  }
  await Promise.allSettled([chunks.close(), results.close()]);
  return out;
}

/** Connect once and ask the server something: a wrong password, a bad certificate or no Redis fails here. Writes nothing. */
export async function probeRedis(target: RedisTarget): Promise<void> {
  const connection = new RedisConnection(bullConnection(target.connection));
  connection.on('error', () => undefined); // awaitRedis reports it
  const client = connection.client;
  await awaitRedis(client, connection, target.description, CONNECT_TIMEOUT_MS); // left as it is on failure: see withQueues
  await (await client).info();
  await connection.close().catch(() => undefined);
}

/** Live worker heartbeats under the target's prefix, oldest host first. */
export async function listWorkers(queue: Queue, prefix: string): Promise<Heartbeat[]> {
  const client = await queue.client;
  const out: Heartbeat[] = [];
  let cursor = '0';
  do {
    const [next, keys] = await client.scan(cursor, { MATCH: heartbeatPattern(prefix), COUNT: 1000 });
    cursor = next;
    // The GETs of a SCAN page are sent together (one round trip), not one after another: the transport calls
    // this every 2 s during a sweep. (BullMQ's client interface has no MGET.)
    const values = await Promise.all(keys.map((key) => client.get(key)));
    for (const raw of values) {
      if (raw === null) continue; // expired between SCAN and MGET
      try {
        const parsed = heartbeatSchema.safeParse(JSON.parse(raw));
        if (parsed.success) out.push(parsed.data);
      } catch {
        // not JSON: not one of ours
      }
    }
  } while (cursor !== '0');
  return out.sort((a, b) => a.host.localeCompare(b.host) || a.pid - b.pid);
}

export async function inspectSweep(target: RedisTarget, sweepId: string, modelVersion: string): Promise<SweepInRedis> {
  return withQueues(target, sweepId, modelVersion, async (chunks, results) => {
    const client = await chunks.client;
    const registered = (await client.hexists(registryKey(target.prefix), chunks.name)) === 1;
    const counts = await chunks.getJobCounts(...COUNTED);
    const resultCounts = await results.getJobCounts('waiting', 'active', 'delayed');
    const now = Date.now();
    const workers = (await listWorkers(chunks, target.prefix)).map((w) => ({
      ...w, takesThisSweep: versionTag(w.model_version) === versionTag(modelVersion), age_s: Math.max(0, (now - w.at) / 1000),
    }));
    return {
      registered,
      chunks: Object.fromEntries(COUNTED.map((k) => [k, counts[k] ?? 0])),
      results_waiting: (resultCounts.waiting ?? 0) + (resultCounts.active ?? 0) + (resultCounts.delayed ?? 0),
      workers,
    };
  });
}

/**
 * Remove everything of a sweep from Redis: its registry entry (workers stop taking its chunks), its sentinel,
 * its chunk jobs and its results queue. Results not yet committed are dropped with it: `resume` runs those
 * points again. Returns the jobs removed.
 */
export async function cancelSweep(target: RedisTarget, sweepId: string, modelVersion: string): Promise<{ chunks: number; results: number }> {
  return withQueues(target, sweepId, modelVersion, async (chunks, results) => {
    const client = await chunks.client;
    await client.hdel(registryKey(target.prefix), chunks.name);
    await client.del(sentinelKey(target.prefix, sweepId));
    const chunkCount = Object.values(await chunks.getJobCounts(...COUNTED)).reduce((a, b) => a + b, 0);
    const resultCount = Object.values(await results.getJobCounts(...COUNTED)).reduce((a, b) => a + b, 0);
    await chunks.obliterate({ force: true });
    await results.obliterate({ force: true });
    return { chunks: chunkCount, results: resultCount };
  });
}

