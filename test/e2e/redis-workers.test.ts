/**
 * Workers as a researcher sees them: a worker of another model version never takes the sweep's chunks and
 * `status --redis` says so; with no worker of the right version, `run` prints the `disksweep work` command to
 * start one; Ctrl-C of a Redis run leaves its queued chunks in Redis, `cancel` removes them (and refuses while
 * a run holds the database), and `resume` finishes the sweep.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCliAsync } from '../support/cli.js';
import { chunkStarts, gatedEnv, gatedSpec, openGate, sweepSummary, useRedisSweep } from '../support/redis-sweep.js';
import { resultsPerPoint } from '../support/sweep-db.js';
import { useTempDir } from '../support/temp-dir.js';
import { waitFor } from '../support/wait.js';

const tmp = useTempDir();
const ctx = useRedisSweep();

const statusJson = z.object({
  redis: z.object({
    registered: z.boolean(),
    chunks: z.record(z.string(), z.number()),
    workers: z.array(z.object({ model_version: z.string(), takesThisSweep: z.boolean(), chunks_done: z.number(), pid: z.number() })),
  }),
});

function jobKeys(): string[] {
  return ctx.redis.cli(['--scan', '--pattern', `${ctx.prefix}:chunks-*`]).split('\n').filter((k) => k !== '');
}

describe('workers and queues through Redis', () => {
  it('a worker of another model version takes nothing and status shows it; run prints the work command', async () => {
    const gate = tmp.file('gate');
    openGate(gate);
    const env = gatedEnv(gate);
    const stranger = ctx.worker({ env: { ...env, DISKSWEEP_TEST_MODEL_VERSION: '0.0.1-old' } });
    await stranger.waitForStderr(/ready: model version 0\.0\.1-old/);
    const db = tmp.file('versions.sqlite');
    const run = ctx.start(['run', gatedSpec(tmp.path, 'lantern-versions'), '--db', db, ...ctx.args, '--json'], { env: { ...env, DISKSWEEP_TEST_NO_WORKER_S: '1' } });
    await run.waitForStderr(/no worker of model version \S+ has been seen for 1 s/);
    expect(run.stderr()).toMatch(/1 worker of another model version is running: 0\.0\.1-old/);
    expect(run.stderr()).toContain(`disksweep work --redis '${ctx.redis.url}' --redis-prefix ${ctx.prefix}`);
    await stranger.waitForStderr(/needs model version .*this worker runs 0\.0\.1-old: not taking its chunks/);

    // The hint can come before the last addBulk batch lands on a loaded machine: wait for all 18 to be queued.
    let seen: z.infer<typeof statusJson>['redis'] | undefined;
    await waitFor(async () => {
      const status = await runCliAsync(['status', '--db', db, '--redis', ctx.redis.url, '--redis-prefix', ctx.prefix, '--json']);
      expect(status.status, status.stderr).toBe(0);
      seen = statusJson.parse(JSON.parse(status.stdout)).redis;
      return seen.chunks.waiting === 18;
    }, { timeoutMs: 30_000, everyMs: 200, what: () => `18 waiting chunks in status (last: ${JSON.stringify(seen?.chunks)})` });
    if (seen === undefined) throw new Error('unreachable: waitFor returned without a status');
    expect(seen.registered).toBe(true);
    expect(seen.workers).toEqual([expect.objectContaining({ model_version: '0.0.1-old', takesThisSweep: false, chunks_done: 0, pid: stranger.pid })]);
    const text = await runCliAsync(['status', '--db', db, '--redis', ctx.redis.url, '--redis-prefix', ctx.prefix]);
    expect(text.stdout).toMatch(/model 0\.0\.1-old, 1 thread, 0 chunks done, .*another model version: does not take this sweep's chunks/);

    const worker = ctx.worker({ env });
    const r = await run.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toMatchObject({ done: 18, failed: 0 });
    expect(chunkStarts([stranger]).size).toBe(0);
    expect(chunkStarts([worker]).size).toBe(18);
  });

  it('--max-queued bounds the chunks in Redis that are not committed; the orchestrator tops up as commits land', async () => {
    const gate = tmp.file('gate');
    const env = gatedEnv(gate);
    const worker = ctx.worker({ env });
    await worker.waitForStderr(/ready: model version/);
    const db = tmp.file('max-queued.sqlite');
    const run = ctx.start(['run', gatedSpec(tmp.path, 'lantern-max-queued'), '--db', db, ...ctx.args, '--max-queued', '5', '--json'], { env });
    // Points 0-2 committed, chunk 3 held at the gate: chunks 3-7 are the five in Redis, 8-17 not added yet.
    await worker.waitForStderr(/chunk 3 of [0-9a-f]{12}: started/);
    let seen: z.infer<typeof statusJson>['redis'] | null = null;
    await waitFor(async () => {
      if (run.done) throw new Error(`run exited:\n${run.stderr()}`);
      const status = await runCliAsync(['status', '--db', db, '--redis', ctx.redis.url, '--redis-prefix', ctx.prefix, '--json']);
      seen = statusJson.parse(JSON.parse(status.stdout)).redis;
      return seen.chunks.waiting + seen.chunks.active === 5 && seen.chunks.completed === 3;
    }, { timeoutMs: 60_000, what: () => `5 uncommitted chunks in Redis; saw ${JSON.stringify(seen)}` });
    openGate(gate);
    const r = await run.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 18, interrupted: false });
    expect(chunkStarts([worker]).size).toBe(18);
  });

  it('Ctrl-C leaves queued chunks in Redis; cancel refuses while a run holds the database, then removes them; resume finishes', async () => {
    const gate = tmp.file('gate');
    openGate(gate);
    const env = gatedEnv(gate);
    const db = tmp.file('cancel.sqlite');
    const run = ctx.start(['run', gatedSpec(tmp.path, 'lantern-cancel'), '--db', db, ...ctx.args, '--json'], { env });
    await waitFor(() => {
      if (run.done) throw new Error(`run exited:\n${run.stderr()}`);
      return jobKeys().length >= 18;
    }, { timeoutMs: 60_000, what: () => `18 chunk jobs in Redis; run log:\n${run.stderr()}` });

    const refused = await runCliAsync(['cancel', '--db', db, '--redis', ctx.redis.url, '--redis-prefix', ctx.prefix]);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toContain('store/locked');
    expect(jobKeys().length).toBeGreaterThanOrEqual(18);

    const stopped = await run.killGroup('SIGINT');
    expect(stopped.status, stopped.stderr).toBe(130);
    expect(stopped.stderr).toContain('stopping: committing the results in hand; queued chunks stay in Redis');
    expect(stopped.stderr).toContain(`interrupted: resume with  disksweep resume --db ${db} --redis '${ctx.redis.url}' --redis-prefix ${ctx.prefix}`);
    expect(jobKeys().length).toBeGreaterThanOrEqual(18); // still there for workers and a later resume

    const cancelled = await runCliAsync(['cancel', '--db', db, '--redis', ctx.redis.url, '--redis-prefix', ctx.prefix, '--json']);
    expect(cancelled.status, cancelled.stderr).toBe(0);
    expect(JSON.parse(cancelled.stdout)).toMatchObject({ chunk_jobs_removed: 18, result_jobs_removed: 0 });
    expect(jobKeys()).toEqual([]);
    expect(ctx.redis.cli(['--scan', '--pattern', `${ctx.prefix}:*`]).trim()).toBe(''); // registry entry and sentinel gone too

    const worker = ctx.worker({ env });
    const r = await ctx.start(['resume', '--db', db, ...ctx.args, '--json'], { env }).exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 18, interrupted: false });
    expect(chunkStarts([worker]).size).toBe(18);
    expect(resultsPerPoint(db)).toEqual({ points: 18, results: 18, maxPerPoint: 1 });
  });
});
