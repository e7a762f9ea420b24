/**
 * Pieces of the Redis end-to-end tests: a redis-server of the test's own per test, `disksweep work` and
 * `disksweep run/resume --redis` processes started in their own process groups (all killed after each test),
 * a spec with gated points (see fault-model.ts) that holds a sweep in a known state, and what the workers'
 * logs say about the chunks they ran.
 */
import { writeFileSync } from 'node:fs';
import { afterEach, beforeEach } from 'vitest';
import { z } from 'zod';
import { faultModelEnv, startCli, type CliOptions, type CliProcess } from './cli.js';
import { startTestRedis, uniquePrefix, type RedisServerOptions, type TestRedis } from './redis-harness.js';
import { TINY_FIXED, TINY_MODEL, writeSpec } from './sweep-specs.js';

/** Short lock and stalled intervals: a dead worker's chunk comes back within a few seconds. */
export const FAST = ['--lock-ms', '2000', '--stalled-ms', '1000'] as const;

export const sweepSummary = z.object({ done: z.number(), failed: z.number(), total: z.number(), committed: z.number(), interrupted: z.boolean() });

/** alpha_active of gated points (FAULT_MARKERS.gated in fault-model.ts). */
export const GATED = 0.0204;

export interface RedisSweepContext {
  readonly redis: TestRedis;
  /** This test's key prefix. */
  readonly prefix: string;
  /** `--redis URL --redis-prefix P` plus the fast lock settings. */
  readonly args: string[];
  /** Start `disksweep work` (1 thread, verbose) in its own process group. */
  worker(options?: CliOptions, extra?: readonly string[]): CliProcess;
  /** Start any disksweep command in its own process group (killed after the test). */
  start(args: readonly string[], options?: CliOptions): CliProcess;
}

/**
 * A fresh redis-server and key prefix per test; every process started through the context dies after it.
 * `server` gives the server's options (a password, TLS) when the test starts.
 */
export function useRedisSweep(server: () => RedisServerOptions = () => ({})): RedisSweepContext {
  let redis: TestRedis | null = null;
  let prefix = '';
  const procs: CliProcess[] = [];
  beforeEach(async () => {
    redis = await startTestRedis(server());
    prefix = uniquePrefix('e2e');
  });
  afterEach(async () => {
    await Promise.all(procs.splice(0).map((p) => p.killGroup('SIGKILL')));
    await redis?.stop();
    redis = null;
  });
  const current = (): TestRedis => {
    if (redis === null) throw new Error('no test Redis: use the context inside a test');
    return redis;
  };
  const start = (args: readonly string[], options: CliOptions = {}): CliProcess => {
    const p = startCli(args, { ...options, group: true });
    procs.push(p);
    return p;
  };
  return {
    get redis() {
      return current();
    },
    get prefix() {
      return prefix;
    },
    get args() {
      return ['--redis', current().url, '--redis-prefix', prefix, ...FAST];
    },
    worker(options = {}, extra = []) {
      return start(['work', '--redis', current().url, '--redis-prefix', prefix, '--concurrency', '1', '--verbose', ...FAST, ...extra], options);
    },
    start,
  };
}

/**
 * 3 x 6 tiny disk models, one point per chunk; alpha_active's fourth value is the gate marker, so points 3, 9
 * and 15 wait at the gate: with one worker thread, the sweep stops after committing points 0-2, holding chunk 3.
 */
export function gatedSpec(dir: string, name: string): string {
  return writeSpec(dir, `${name}.yaml`, {
    name,
    description: 'Lantern Knot discs (invented), a gated test grid',
    model: TINY_MODEL,
    fixed: TINY_FIXED,
    vary: { m_disk_msun: { values: [0.01, 0.02, 0.05] }, alpha_active: { values: [0.001, 0.003, 0.01, GATED, 0.03, 0.1] } },
    chunks: { size: 1 },
  });
}

/** The fault model in pool threads, with gated points waiting for `gateFile`. */
export function gatedEnv(gateFile: string): Record<string, string> {
  return { ...faultModelEnv(), DISKSWEEP_TEST_GATE: gateFile };
}

export function openGate(gateFile: string): void {
  writeFileSync(gateFile, 'open\n');
}

/** How often each chunk index was started, over the logs of `workers` (`work --verbose`). */
export function chunkStarts(workers: readonly CliProcess[]): Map<number, number> {
  const starts = new Map<number, number>();
  for (const w of workers) {
    for (const m of w.stderr().matchAll(/chunk (\d+) of [0-9a-f]{12}: started/g)) starts.set(Number(m[1]), (starts.get(Number(m[1])) ?? 0) + 1);
  }
  return starts;
}
