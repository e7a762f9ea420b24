/**
 * The Redis side of `status` (live workers, the sweep's queues) and `disksweep cancel` (remove a sweep's jobs
 * and results queue). BullMQ loads only when one of them talks to Redis.
 */
import { Command } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { logRedacted as warn } from '../../shared/redact.js';
import type { SweepRecord } from '../store/index.js';
import { pickSweep } from '../store/pick-sweep.js';
import type { SweepInRedis } from '../transport/redis-inspect.js';
import { lockStore } from './lock-store.js';
import { redisConnectionOptions, redisSettings, type RedisFlags } from './redis-flags.js';

/** What Redis holds for the sweep, as JSON data and text lines; undefined without --redis / DISKSWEEP_REDIS_URL. */
export async function redisStatus(flags: RedisFlags, sweep: SweepRecord): Promise<{ data: SweepInRedis & { redis: string }; lines: string[] } | undefined> {
  const settings = redisSettings(flags, warn);
  if (settings === undefined) return undefined;
  const { inspectSweep } = await import('../transport/redis-inspect.js');
  const r = await inspectSweep(settings.target, sweep.sweepId, sweep.modelVersion);
  const c = r.chunks;
  const lines = [
    `redis (${settings.target.description}): ${r.registered ? 'registered for workers' : 'not registered (no run or resume is feeding it)'}; ` +
      `chunks waiting ${c.waiting + c.prioritized + c.delayed}, active ${c.active}, failed ${c.failed}; results waiting for the orchestrator ${r.results_waiting}`,
    r.workers.length === 0 ? 'workers: none alive (start one with `disksweep work --redis URL`)' : `workers (${r.workers.length}):`,
    ...r.workers.map((w) =>
      `  ${w.host} pid ${w.pid}: model ${w.model_version}, ${w.threads} thread${w.threads === 1 ? '' : 's'}, ${w.chunks_done} chunks done, seen ${w.age_s.toFixed(0)} s ago` +
      (w.takesThisSweep ? '' : `  [another model version: does not take this sweep's chunks (model ${sweep.modelVersion})]`)),
  ];
  return { data: { ...r, redis: settings.target.description }, lines };
}

type CancelFlags = RedisFlags & { db: string; sweep?: string; json?: boolean };

async function cancelAction(opts: CancelFlags): Promise<number> {
  const settings = redisSettings(opts, warn);
  if (settings === undefined) throw new DisksweepError('input/invalid-flag', 'cancel needs --redis URL (or DISKSWEEP_REDIS_URL): the Redis that holds the sweep\'s jobs');
  // The database lock: a running `run`/`resume` of this database holds it, and would add the chunks again.
  const store = lockStore(opts.db);
  try {
    const sweep = pickSweep(store, opts.sweep);
    const { cancelSweep } = await import('../transport/redis-inspect.js');
    const removed = await cancelSweep(settings.target, sweep.sweepId, sweep.modelVersion);
    const data = { sweep_id: sweep.sweepId, name: sweep.name, chunk_jobs_removed: removed.chunks, result_jobs_removed: removed.results };
    process.stdout.write((opts.json === true ? JSON.stringify(data) : [
      `cancelled ${sweep.name} (${sweep.sweepId.slice(0, 12)}) in ${settings.target.description}: removed ${removed.chunks} chunk jobs and ${removed.results} result jobs`,
      `results already committed stay in ${opts.db}; go on later with  disksweep resume --db ${opts.db} --redis URL`,
    ].join('\n')) + '\n');
    return 0;
  } finally {
    store.close();
  }
}

export function cancelCommand(): Command {
  const c = new Command('cancel').description('remove a sweep\'s chunk jobs and results queue from Redis (workers stop taking it)')
    .requiredOption('--db <file>', 'the SQLite database of the sweep').option('--sweep <id-or-name>', 'which sweep, when the database holds several').option('--json', 'print one JSON object');
  for (const opt of redisConnectionOptions()) c.addOption(opt);
  return c
    .addHelpText('after', '\nExample:\n  disksweep cancel --db corvid-rift-cores.sqlite --redis redis://queue-host:6379\n\nStop the `run` first (Ctrl-C): cancel takes the database lock and refuses while a run holds it.\nResults not yet committed are dropped with the queue; `resume` runs those points again.')
    .action(async (opts: CancelFlags) => {
      process.exitCode = await cancelAction(opts);
    });
}
