/**
 * The Redis transport end to end: this process is the orchestrator (spec -> plan -> store -> Redis transport
 * -> runSweep, as `disksweep run --redis` chains them), real `disksweep work` processes take the chunks, and
 * a redis-server of the bench's own carries them (test/support/redis-harness.ts).
 *
 * - noop_throughput: 100 000 no-op points (noop-model.ts) in chunks of 1000 through two worker processes of
 *   one thread each: points/s from the first submit to the last commit. Goal >= 10 000 points/s.
 * - parallel_efficiency: 256 small real models through two worker processes of one thread each, against the
 *   embedded transport with two threads on the same spec; ratio = embedded wall / Redis wall, rounds
 *   alternating so a load spike hits both (median of the rounds). Goal >= 0.95. The workers are started and
 *   ready before the Redis clock starts; the embedded wall includes its pool start (as a `run` has it).
 * - memory_at_max_queued: with no worker, how much Redis holds when `--max-queued` chunks (default 2000) of
 *   20 points (each a full parameter set, as any model's) wait: used_memory above the empty server, per chunk
 *   and per point.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import { canonicalJson, contentHash } from '../../shared/hashing.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { parseRedisTarget } from '../../shared/redis/redis-connection.js';
import { parseSpecText } from '../../orchestrator/spec/load-spec.js';
import { openStore } from '../../orchestrator/store/index.js';
import { planSweep } from '../../orchestrator/sweep/sweep-plan.js';
import { runSweep } from '../../orchestrator/sweep/sweep-runner.js';
import { createRedisTransport } from '../../orchestrator/transport/redis-transport.js';
import { hasRedisServer, startTestRedis, uniquePrefix, type TestRedis } from '../support/redis-harness.js';
import { waitFor } from '../support/wait.js';
import { median, progress, sig } from './stats.js';
import { CLI_PATH, EFFICIENCY_SPEC, NOOP_MODEL_PATH, noopSpec, runSweepInProcess } from './sweep-bench.js';
import { withTempDirAsync } from './temp-files.js';

const GOALS = { noop_points_per_s: 10_000, parallel_efficiency: 0.95 } as const;
const EFFICIENCY_ROUNDS = 2;

/** EFFICIENCY_SPEC widened to 16 x 16 models, 4 per chunk: a few seconds on two threads. */
const WIDE_SPEC = {
  ...EFFICIENCY_SPEC,
  name: 'bench-redis-efficiency',
  vary: { m_disk_msun: { log: [0.01, 0.1], count: 16 }, alpha_active: { log: [1e-3, 3e-2], count: 16 } },
  chunks: { size: 4 },
};

interface Worker {
  readonly child: ChildProcess;
  stderr(): string;
}

async function startWorker(redis: TestRedis, prefix: string, model: string | null): Promise<Worker> {
  const env: NodeJS.ProcessEnv = { ...process.env };
  if (model === null) delete env.DISKSWEEP_MODEL_MODULE;
  else env.DISKSWEEP_MODEL_MODULE = model;
  const child = spawn(process.execPath, [CLI_PATH, 'work', '--redis', redis.url, '--redis-prefix', prefix, '--concurrency', '1'], { env, stdio: ['ignore', 'ignore', 'pipe'] });
  let err = '';
  child.stderr?.setEncoding('utf8').on('data', (s: string) => (err += s));
  await waitFor(() => {
    if (child.exitCode !== null) throw new Error(`disksweep work exited before it was ready:\n${err}`);
    return /ready: model version/.test(err);
  }, { timeoutMs: 30_000, everyMs: 50, what: () => `disksweep work to get ready:\n${err}` });
  return { child, stderr: () => err };
}

async function stopWorkers(workers: readonly Worker[]): Promise<void> {
  await Promise.all(workers.map((w) => new Promise<void>((resolve) => {
    if (w.child.exitCode !== null) return resolve();
    w.child.once('close', () => resolve());
    w.child.kill('SIGTERM');
  })));
}

interface RedisSweep {
  readonly points: number;
  readonly committed: number;
  readonly wallS: number;
  /** CPU of this (orchestrator) process. */
  readonly cpuS: number;
}

/** One sweep with this process as its orchestrator through `redis` (workers must be running already). */
async function sweepThroughRedis(redis: TestRedis, prefix: string, spec: Record<string, unknown>, options: { maxQueued?: number; signal?: AbortSignal } = {}): Promise<RedisSweep> {
  return withTempDirAsync('disksweep-bench-redis-', async (dir) => {
    const plan = planSweep(parseSpecText(JSON.stringify(spec), 'bench spec', 'json'));
    const chunks = plan.spec.chunks;
    if (!('size' in chunks)) throw new Error('bench specs give chunks.size');
    const store = openStore(join(dir, 'sweep.sqlite'), { mode: 'write' });
    try {
      store.registerSweep({
        sweepId: plan.sweepId, name: plan.spec.name, description: null, specJson: canonicalJson(plan.spec),
        specHash: contentHash(plan.spec), modelVersion: MODEL_VERSION, nPoints: plan.source.size, chunkSize: chunks.size,
      });
      const target = parseRedisTarget({ url: redis.url, prefix });
      const transport = await createRedisTransport({
        target, sweepId: plan.sweepId, modelVersion: MODEL_VERSION, maxQueued: options.maxQueued ?? 2000, lockMs: 30_000, stalledMs: 30_000,
        log: (line) => progress(`  redis: ${line}`), workerCommand: 'disksweep work',
      });
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      const counts = await runSweep({
        sweepId: plan.sweepId, chunkSize: chunks.size, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport, signal: options.signal,
      });
      const wallS = (performance.now() - t0) / 1000;
      const cpu = process.cpuUsage(cpu0);
      return { points: plan.source.size, committed: counts.committed, wallS, cpuS: (cpu.user + cpu.system) / 1e6 };
    } finally {
      store.close();
    }
  });
}

async function withRedis<T>(fn: (redis: TestRedis) => Promise<T>): Promise<T> {
  const redis = await startTestRedis();
  try {
    return await fn(redis);
  } finally {
    await redis.stop();
  }
}

async function noopThroughput(): Promise<Record<string, unknown>> {
  const points = 100_000;
  const chunk = 1000;
  progress(`redis.noop_throughput: ${points} no-op points, chunks of ${chunk}, 2 worker processes`);
  return withRedis(async (redis) => {
    const prefix = uniquePrefix('bench');
    const workers = [await startWorker(redis, prefix, NOOP_MODEL_PATH), await startWorker(redis, prefix, NOOP_MODEL_PATH)];
    try {
      const r = await sweepThroughRedis(redis, prefix, noopSpec('bench-redis-noop', points, chunk));
      const rate = r.committed / r.wallS;
      return {
        points, chunk_size: chunk, worker_processes: 2, committed: r.committed, wall_s: sig(r.wallS, 3),
        points_per_s: sig(rate), orchestrator_cpu_us_per_point: sig((1e6 * r.cpuS) / r.points),
        goal_points_per_s: GOALS.noop_points_per_s, goal_met: rate >= GOALS.noop_points_per_s,
      };
    } finally {
      await stopWorkers(workers);
    }
  });
}

async function parallelEfficiency(): Promise<Record<string, unknown>> {
  progress('redis.parallel_efficiency: 256 real models, 2 worker processes vs embedded 2 threads');
  const embedded: number[] = [];
  const viaRedis: number[] = [];
  for (let round = 0; round < EFFICIENCY_ROUNDS; round++) {
    embedded.push((await runSweepInProcess(WIDE_SPEC, 2, null)).wallS);
    viaRedis.push(await withRedis(async (redis) => {
      const prefix = uniquePrefix('bench');
      const workers = [await startWorker(redis, prefix, null), await startWorker(redis, prefix, null)];
      try {
        return (await sweepThroughRedis(redis, prefix, WIDE_SPEC)).wallS;
      } finally {
        await stopWorkers(workers);
      }
    }));
  }
  const ratio = median(embedded) / median(viaRedis);
  return {
    points: 256, chunk_size: WIDE_SPEC.chunks.size, rounds: EFFICIENCY_ROUNDS,
    embedded_wall_s: embedded.map((s) => sig(s, 3)), redis_wall_s: viaRedis.map((s) => sig(s, 3)),
    ratio_embedded_over_redis: sig(ratio, 3), goal: GOALS.parallel_efficiency, goal_met: ratio >= GOALS.parallel_efficiency,
  };
}

function usedMemory(redis: TestRedis): number {
  const m = /used_memory:(\d+)/.exec(redis.cli(['info', 'memory']));
  if (m === null) throw new Error('INFO memory has no used_memory');
  return Number(m[1]);
}

async function memoryAtMaxQueued(): Promise<Record<string, unknown>> {
  const maxQueued = 2000;
  const chunk = 20;
  progress(`redis.memory_at_max_queued: ${maxQueued} chunks of ${chunk} points waiting, no worker`);
  return withRedis(async (redis) => {
    const prefix = uniquePrefix('bench');
    const empty = usedMemory(redis);
    const controller = new AbortController();
    const spec = { ...noopSpec('bench-redis-memory', maxQueued * chunk * 2, chunk) };
    const chunksWaiting = (): number => {
      const key = redis.cli(['--scan', '--pattern', `${prefix}:chunks-*:wait`]).trim();
      return key === '' ? 0 : Number(redis.cli(['llen', key]).trim());
    };
    let held = 0;
    const sweep = sweepThroughRedis(redis, prefix, spec, { maxQueued, signal: controller.signal });
    const deadline = Date.now() + 120_000;
    while ((held = chunksWaiting()) < maxQueued && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
    const used = usedMemory(redis) - empty;
    controller.abort();
    await sweep;
    return {
      max_queued: maxQueued, chunk_size: chunk, chunks_waiting: held, used_memory_bytes: used,
      bytes_per_chunk: sig(used / Math.max(1, held)), bytes_per_point: sig(used / Math.max(1, held * chunk)),
    };
  });
}

export async function benchRedis(): Promise<Record<string, unknown>> {
  if (!hasRedisServer()) return { skipped: 'no redis-server on PATH' };
  return {
    what: 'this process as orchestrator, real `disksweep work` processes (1 thread each), a redis-server of its own',
    noop_throughput: await noopThroughput(),
    parallel_efficiency: await parallelEfficiency(),
    memory_at_max_queued: await memoryAtMaxQueued(),
  };
}
