/**
 * `disksweep work`: a worker process for sweeps run with `--redis`. Start it on any number of machines that
 * reach the Redis; it takes chunks of every running sweep of its model version until stopped.
 */
import { Command, Option } from 'commander';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { defaultThreadCount } from '../../worker/chunk-pool.js';
import { logRedacted as log } from '../../shared/redact.js';
import { redisOptions, redisSettings, testHookInteger, type RedisFlags } from './redis-flags.js';

type WorkFlags = RedisFlags & { concurrency?: string; verbose?: boolean };

async function workAction(opts: WorkFlags): Promise<number> {
  const settings = redisSettings(opts, log);
  if (settings === undefined) throw new DisksweepError('input/invalid-flag', 'work needs --redis URL (or DISKSWEEP_REDIS_URL): the Redis the sweep runs through');
  let threads = defaultThreadCount();
  if (opts.concurrency !== undefined) {
    const r = z.coerce.number().int().min(1).max(1024).safeParse(opts.concurrency);
    if (!r.success) throw new DisksweepError('input/invalid-flag', `--concurrency: expected a whole number from 1 to 1024 (got "${opts.concurrency}")`);
    threads = r.data;
  }
  const { startQueueWorker } = await import('../../worker/queue-worker.js'); // BullMQ loads only for this command
  const worker = await startQueueWorker({
    target: settings.target, threads, lockMs: settings.lockMs, stalledMs: settings.stalledMs, log, verbose: opts.verbose === true,
    // Test hooks (nothing else sets them): pretend to be a worker of another model version; a short watchdog.
    modelVersion: process.env.DISKSWEEP_TEST_MODEL_VERSION || undefined,
    watchdogMinMs: testHookInteger('DISKSWEEP_TEST_WATCHDOG_MS', 100, 'ms'), // the shortest chunk watchdog, for tests of hanging models
  });
  await new Promise<void>((resolve) => {
    let signals = 0;
    const stop = (): void => {
      signals++;
      if (signals > 1) process.exit(130);
      log('stopping: finishing the chunks in hand (again to stop at once; their chunks return to the queue)');
      resolve();
    };
    process.on('SIGINT', stop);
    process.on('SIGTERM', stop);
  });
  await worker.close();
  log('worker stopped');
  return 0;
}

export function workCommand(): Command {
  const c = new Command('work').description('take chunks of sweeps run with --redis from Redis and run them here (until Ctrl-C)');
  for (const opt of redisOptions()) c.addOption(opt);
  return c
    .addOption(new Option('-c, --concurrency <n>', 'chunks run at once, one thread each (default: one per core)'))
    .option('--verbose', 'log every chunk taken and finished')
    .addHelpText('after', '\nExamples:\n  DISKSWEEP_REDIS_URL=redis://queue-host:6379 disksweep work\n  disksweep work --redis rediss://user@queue-host:6380 --redis-password-file ~/.disksweep-redis --concurrency 8\n\nCtrl-C (or SIGTERM) finishes the chunks in hand, then exits.')
    .action(async (opts: WorkFlags) => {
      process.exitCode = await workAction(opts);
    });
}
