/**
 * Looking at (and clearing) what one sweep has in Redis, for `status --redis` and `cancel`: live workers from
 * their heartbeat keys (with the model version each runs: a worker of another version never takes this sweep's
 * chunks), the sweep's chunk and results queues, and whether it is registered for workers.
 */
import { Queue } from 'bullmq';
import { bullConnection, redactedError, type RedisTarget } from '../../shared/redis/redis-connection.js';
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

/** Open both queues of a sweep, run `fn`, close them; a Redis error becomes a redacted DisksweepError. */
async function withQueues<T>(target: RedisTarget, sweepId: string, modelVersion: string, fn: (chunks: Queue, results: Queue) => Promise<T>): Promise<T> {
  const connection = { ...bullConnection(target.connection), maxRetriesPerRequest: 1, retryStrategy: () => null };
  const chunks = new Queue(chunkQueueName(sweepId, modelVersion), { connection, prefix: target.prefix });
  const results = new Queue(resultsQueueName(sweepId, modelVersion), { connection, prefix: target.prefix });
  let lastError: unknown = null;
  chunks.on('error', (e) => (lastError = e));
  results.on('error', (e) => (lastError = e));
  try {
    await chunks.waitUntilReady();
    return await fn(chunks, results);
  } catch (error) {
    throw redactedError(lastError ?? error, `Redis at ${target.description}`);
  } finally {
    await Promise.allSettled([chunks.close(), results.close()]);
  }
}

/** Live worker heartbeats under the target's prefix, oldest host first. */
export async function listWorkers(queue: Queue, prefix: string): Promise<Heartbeat[]> {
  const client = await queue.client;
  const out: Heartbeat[] = [];
  let cursor = '0';
  do {
    const [next, keys] = await client.scan(cursor, { MATCH: heartbeatPattern(prefix), COUNT: 1000 });
    cursor = next;
    for (const key of keys) {
      const raw = await client.get(key);
      if (raw === null) continue;
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

