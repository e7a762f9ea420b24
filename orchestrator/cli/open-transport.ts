/**
 * The transport `run` and `resume` use: embedded unless `--redis URL` or DISKSWEEP_REDIS_URL names a Redis.
 * With Redis, results an earlier orchestrator left in the results queue are committed before the caller asks
 * the store what is missing, and `--workers N` also starts N worker threads in this process.
 */
import { hostname } from 'node:os';
import { MODEL_VERSION } from '../../shared/model-version.js';
import type { QueueWorker } from '../../worker/queue-worker.js';
import type { SweepStore } from '../store/index.js';
import type { SweepPlan } from '../sweep/sweep-plan.js';
import { ResultCommitter } from '../sweep/result-committer.js';
import { createEmbeddedTransport } from '../transport/embedded-transport.js';
import { logRedacted as log } from '../../shared/redact.js';
import type { Transport } from '../transport/transport.js';
import { redisFlagsForCommand, redisSettings, testHookInteger, type RedisFlags, type RedisSettings } from './redis-flags.js';

export interface OpenTransportInput {
  /** From `checkRedis`: undefined for the embedded transport. */
  readonly redis: RedisSettings | undefined;
  /** With Redis: also run `workers` worker threads in this process (--workers was given). */
  readonly localWorkers: boolean;
  /** Threads for the embedded transport (or local Redis workers). */
  readonly workers: number;
  readonly store: SweepStore;
  readonly plan: SweepPlan;
}

/**
 * The Redis the flags name (or undefined), checked before anything is written: a malformed URL exits 2, a
 * wrong password or an unverifiable certificate exits 2, an unreachable Redis fails after 10 s. Warns about a
 * password on the command line.
 */
export async function checkRedis(flags: RedisFlags): Promise<RedisSettings | undefined> {
  const settings = redisSettings(flags, log);
  if (settings === undefined) return undefined;
  // BullMQ and its Redis client load only when Redis is used: every other command starts ~0.8 s faster.
  const { probeRedis } = await import('../transport/redis-inspect.js');
  await probeRedis(settings.target);
  return settings;
}

export async function openTransport(input: OpenTransportInput): Promise<Transport> {
  const settings = input.redis;
  if (settings === undefined) return createEmbeddedTransport({ threads: input.workers });
  const { createRedisTransport } = await import('../transport/redis-transport.js');
  const { target } = settings;
  const transport = await createRedisTransport({
    target, sweepId: input.plan.sweepId, modelVersion: MODEL_VERSION, maxQueued: settings.maxQueued, lockMs: settings.lockMs,
    stalledMs: settings.stalledMs, log, noWorkerHintS: testHookInteger('DISKSWEEP_TEST_NO_WORKER_S', 1, 'seconds'), workerCommand: `disksweep work ${redisFlagsForCommand(settings)}`,
  });
  const committer = new ResultCommitter(input.plan.source, input.store);
  await transport.drain((outcome) => committer.commit(outcome));
  let local: QueueWorker | null = null;
  if (input.localWorkers) {
    const { startQueueWorker } = await import('../../worker/queue-worker.js');
    local = await startQueueWorker({ target, threads: input.workers, lockMs: settings.lockMs, stalledMs: settings.stalledMs, log: (l) => log(`local worker: ${l}`) });
  }
  if (local === null) return transport;
  const localWorker = local;
  return {
    ...transport,
    description: `${transport.description}, ${input.workers} local worker thread${input.workers === 1 ? '' : 's'} on ${hostname()}`,
    async close(mode) {
      try {
        await transport.close(mode);
      } finally {
        await localWorker.close();
      }
    },
  };
}
