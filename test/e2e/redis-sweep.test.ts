/**
 * A sweep through a real redis-server with two real `disksweep work` processes stores the same deterministic
 * outputs as the embedded transport; `kill -9` of a worker holding a chunk (seen in its log, after rows were
 * committed) costs time, not results: its chunk returns through stalled-job recovery.
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.js';
import { sweepSummary as summary, useRedisSweep } from '../support/redis-sweep.js';
import { deterministicRows, resultCount, resultsPerPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';
import { waitFor } from '../support/wait.js';

const tmp = useTempDir();
const ctx = useRedisSweep();

describe('sweeps through Redis', () => {
  it('two worker processes store exactly what the embedded transport stores', async () => {
    const spec = writeSpec(tmp.path, 'heron.yaml', gridSpec('heron-redis', 6, 4, 2));
    const embedded = runCli(['run', spec, '--db', tmp.file('embedded.sqlite'), '--workers', '2', '--json']);
    expect(embedded.status, embedded.stderr).toBe(0);

    const prefix = ctx.prefix;
    const workers = [ctx.worker(), ctx.worker()];
    await Promise.all(workers.map((w) => w.waitForStderr(/ready: model version/)));
    const run = ctx.start(['run', spec, '--db', tmp.file('redis.sqlite'), ...ctx.args, '--json']);
    const r = await run.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`redis (redis 127.0.0.1:${ctx.redis.port} db 0, prefix ${prefix})`);
    expect(summary.parse(JSON.parse(r.stdout))).toEqual({ done: 24, failed: 0, total: 24, committed: 24, interrupted: false });
    // The workers (not this process) ran the chunks: every one of the 12 had its results sent by a worker.
    const sent = workers.reduce((n, w) => n + (w.stderr().match(/chunk \d+ of [0-9a-f]{12}: results sent/g)?.length ?? 0), 0);
    expect(sent).toBeGreaterThanOrEqual(12);

    const reference = deterministicRows(tmp.file('embedded.sqlite'));
    expect(reference.results.map((x) => x.status)).toEqual(Array(24).fill('ok'));
    expect(reference.checkpoints).toHaveLength(48);
    expect(deterministicRows(tmp.file('redis.sqlite'))).toEqual(reference);
    // A finished sweep leaves nothing of its own in Redis (the running workers keep their heartbeat and control keys),
    // once each worker has seen the sweep leave the registry and stopped its consumer (it tidies up after it).
    await Promise.all(workers.map((w) => w.waitForStderr(/is no longer registered: stopped taking its chunks/)));
    const keys = ctx.redis.cli(['--scan', '--pattern', `${prefix}:*`]).split('\n').filter((k) => k !== '' && !k.includes(':disksweep:worker:') && !k.startsWith(`${prefix}:control:`)); // the workers' own keys
    expect(keys).toEqual([]);
  });

  it('kill -9 of a worker holding a chunk loses nothing: its chunk comes back to the other worker', async () => {
    const spec = writeSpec(tmp.path, 'heron.yaml', gridSpec('heron-kill-worker', 6, 5, 1));
    const embedded = runCli(['run', spec, '--db', tmp.file('embedded.sqlite'), '--workers', '2', '--json']);
    expect(embedded.status, embedded.stderr).toBe(0);

    const victim = ctx.worker();
    await victim.waitForStderr(/ready: model version/);
    const db = tmp.file('redis.sqlite');
    const run = ctx.start(['run', spec, '--db', db, ...ctx.args, '--json']);
    // Observed state: a few rows committed and a chunk started (not finished) in the victim's own log.
    await waitFor(() => resultCount(db) >= 3, { timeoutMs: 60_000, what: () => `3 committed rows; worker log:\n${victim.stderr()}` });
    await waitFor(() => {
      const lines = victim.stderr().trim().split('\n');
      return /: started \(/.test(lines[lines.length - 1] ?? '');
    }, { timeoutMs: 30_000, what: () => `the victim to hold a chunk; its log:\n${victim.stderr()}` });
    const killed = await victim.killGroup('SIGKILL');
    expect(killed.signal).toBe('SIGKILL');
    const survivor = ctx.worker();
    const r = await run.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(summary.parse(JSON.parse(r.stdout))).toMatchObject({ done: 30, failed: 0, total: 30, interrupted: false });
    expect(survivor.stderr()).toMatch(/results sent/);
    expect(resultsPerPoint(db)).toEqual({ points: 30, results: 30, maxPerPoint: 1 });
    expect(deterministicRows(db)).toEqual(deterministicRows(tmp.file('embedded.sqlite')));
  });
});
