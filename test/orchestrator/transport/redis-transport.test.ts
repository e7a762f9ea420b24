/**
 * The Redis transport against the transport conformance suite: a redis-server of this test's own, a queue
 * worker (the code of `disksweep work`) in this process feeding its thread pool, a fresh key prefix per
 * transport. Pool threads load compiled JavaScript, so this runs the built modules from dist/.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll } from 'vitest';
import type * as RedisTransportModule from '../../../orchestrator/transport/redis-transport.js';
import type * as ConnectionModule from '../../../shared/redis/redis-connection.js';
import type * as QueueWorkerModule from '../../../worker/queue-worker.js';
import { MODEL_VERSION } from '../../../shared/model-version.js';
import { startTestRedis, uniquePrefix, type TestRedis } from '../../support/redis-harness.js';
import { transportConformance } from './transport-conformance.js';

const dist = (path: string): string => fileURLToPath(new URL(`../../../dist/${path}`, import.meta.url));

async function load<T>(path: string): Promise<T> {
  const file = dist(path);
  if (!existsSync(file)) throw new Error(`${file} is missing: run \`npm run build\` before the tests`);
  return (await import(pathToFileURL(file).href)) as T;
}

let redis: TestRedis;
beforeAll(async () => {
  redis = await startTestRedis();
});
afterAll(async () => {
  await redis.stop();
});

async function makeTransport(threads: number, sweepId: string): Promise<RedisTransportModule.RedisTransport> {
  const { createRedisTransport } = await load<typeof RedisTransportModule>('orchestrator/transport/redis-transport.js');
  const { parseRedisTarget } = await load<typeof ConnectionModule>('shared/redis/redis-connection.js');
  const { startQueueWorker } = await load<typeof QueueWorkerModule>('worker/queue-worker.js');
  const target = parseRedisTarget({ url: redis.url, prefix: uniquePrefix('conf') });
  const lines: string[] = [];
  const worker = await startQueueWorker({ target, threads, lockMs: 5000, stalledMs: 2000, log: (l) => lines.push(l) });
  const transport = await createRedisTransport({
    target, sweepId, modelVersion: MODEL_VERSION, maxQueued: 100, lockMs: 5000, stalledMs: 2000,
    log: (l) => lines.push(l), workerCommand: 'disksweep work',
  });
  return {
    ...transport,
    async close(mode) {
      try {
        await transport.close(mode);
      } finally {
        await worker.close();
      }
    },
  };
}

transportConformance('redis, one worker of 1 thread', (id) => makeTransport(1, id));
transportConformance('redis, one worker of 2 threads', (id) => makeTransport(2, id));
