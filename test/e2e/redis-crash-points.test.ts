/**
 * Injected crashes at the named points of the results path (shared/crash-point.ts: the process SIGKILLs
 * itself there, as a power cut would), each its own test, with real processes and a redis-server of the test's
 * own. After each: one result per point, none lost, outputs identical to an uninterrupted embedded run.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.js';
import { chunkStarts, gatedEnv, gatedSpec, openGate, sweepSummary, useRedisSweep } from '../support/redis-sweep.js';
import { deterministicRows, resultCount, resultsPerPoint, type DeterministicRows } from '../support/sweep-db.js';
import { makeTempDir, removeTempDir, useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();
const ctx = useRedisSweep();

let reference: DeterministicRows;
let refDir = '';
beforeAll(() => {
  refDir = makeTempDir();
  openGate(`${refDir}/gate`);
  const r = runCli(['run', gatedSpec(refDir, 'lantern-reference'), '--db', `${refDir}/embedded.sqlite`, '--workers', '2', '--json'], { env: gatedEnv(`${refDir}/gate`) });
  expect(r.status, r.stderr).toBe(0);
  reference = deterministicRows(`${refDir}/embedded.sqlite`);
});
afterAll(() => removeTempDir(refDir));

/** The fault model with its gate open: gated points run at once (the same results as the reference). */
function openEnv(): Record<string, string> {
  const gate = tmp.file('gate');
  openGate(gate);
  return gatedEnv(gate);
}

function expectComplete(db: string): void {
  expect(resultsPerPoint(db)).toEqual({ points: 18, results: 18, maxPerPoint: 1 });
  expect(deterministicRows(db)).toEqual(reference);
}

describe('crash points of the results path', () => {
  it('orchestrator killed after a commit, before acknowledging the result job: resume takes the job again', async () => {
    const env = openEnv();
    const worker = ctx.worker({ env });
    await worker.waitForStderr(/ready: model version/);
    const db = tmp.file('after-commit.sqlite');
    const spec = gatedSpec(tmp.path, 'lantern-after-commit');
    const crashed = await ctx.start(['run', spec, '--db', db, ...ctx.args, '--json'], { env: { ...env, DISKSWEEP_CRASH_AT: 'after-commit' } }).exited;
    expect(crashed.signal, crashed.stderr).toBe('SIGKILL');
    expect(crashed.stderr).toContain('crash point after-commit');
    const committed = resultCount(db);
    expect(committed).toBeGreaterThanOrEqual(1);

    const r = await ctx.start(['resume', '--db', db, ...ctx.args, '--json'], { env }).exited;
    expect(r.status, r.stderr).toBe(0);
    // The job whose rows were committed is delivered again (and written as a no-op), with whatever the
    // worker finished while no orchestrator ran.
    expect(r.stderr).toMatch(/committed \d+ result jobs? left in Redis by an earlier run/);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toMatchObject({ done: 18, total: 18, failed: 0, interrupted: false });
    expectComplete(db);
  });

  it('worker killed after pushing a chunk\'s results, before returning the job: the pushed results count, stored once', async () => {
    const env = openEnv();
    const victim = ctx.worker({ env: { ...env, DISKSWEEP_CRASH_AT: 'after-results-push', DISKSWEEP_CRASH_AFTER: '2' } });
    await victim.waitForStderr(/ready: model version/);
    const db = tmp.file('after-push.sqlite');
    const run = ctx.start(['run', gatedSpec(tmp.path, 'lantern-after-push'), '--db', db, ...ctx.args, '--json'], { env });
    const died = await victim.exited;
    expect(died.signal, died.stderr).toBe('SIGKILL');
    expect(died.stderr).toContain('crash point after-results-push');
    const pushed = [...died.stderr.matchAll(/chunk (\d+) of [0-9a-f]{12}: started/g)].map((m) => Number(m[1]));
    const lastChunk = pushed[pushed.length - 1];
    expect(pushed).toHaveLength(3); // two passed the crash point; the third pushed its results, then died

    const survivor = ctx.worker({ env }, ['--lock-ms', '20000']); // its own locks never lapse: each chunk starts once
    const r = await run.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 18, interrupted: false });
    // The results the victim pushed before dying count: the survivor ran every other chunk, and the victim's
    // last chunk only if stalled-job recovery handed it back before the sweep was complete (then its results
    // arrived twice and were stored once).
    const bySurvivor = chunkStarts([survivor]);
    for (let k = 0; k < 18; k++) if (!pushed.includes(k)) expect(bySurvivor.get(k), `chunk ${k}`).toBe(1);
    for (const k of pushed.slice(0, 2)) expect(bySurvivor.has(k), `chunk ${k}`).toBe(false);
    expect(bySurvivor.get(lastChunk) ?? 0).toBeLessThanOrEqual(1);
    expectComplete(db);
  });

  it('orchestrator killed in the middle of an addBulk: resume adds the missing chunks and leaves the queued ones alone', async () => {
    const env = openEnv();
    const db = tmp.file('mid-add.sqlite');
    const crashed = await ctx.start(['run', gatedSpec(tmp.path, 'lantern-mid-add'), '--db', db, ...ctx.args, '--json'], { env: { ...env, DISKSWEEP_CRASH_AT: 'mid-add-bulk' } }).exited;
    expect(crashed.signal, crashed.stderr).toBe('SIGKILL');
    expect(crashed.stderr).toContain('crash point mid-add-bulk');
    // Half of the first batch (18 chunks) reached Redis before the crash.
    const waiting = ctx.redis.cli(['--scan', '--pattern', `${ctx.prefix}:chunks-*:c-*`]).split('\n').filter((k) => k !== '');
    expect(waiting).toHaveLength(9);

    const worker = ctx.worker({ env }, ['--lock-ms', '20000']); // no lock expiry hands a chunk out twice
    const r = await ctx.start(['resume', '--db', db, ...ctx.args, '--json'], { env }).exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 18, interrupted: false });
    const starts = chunkStarts([worker]);
    expect(starts.size).toBe(18);
    expect([...starts.values()].every((n) => n === 1), JSON.stringify([...starts])).toBe(true);
    expectComplete(db);
  });
});
