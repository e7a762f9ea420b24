/**
 * The reliability contract through Redis, with real processes in their own process groups and faults
 * triggered by observed state (rows committed, a chunk held at the gate of the fault model), never by a sleep:
 * kill -9 of the orchestrator then `resume`; Redis killed and restarted empty mid-sweep (the running
 * orchestrator notices through its sentinel key and finishes by itself). After each: one result per point,
 * none lost, outputs identical to an uninterrupted embedded run.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.js';
import { chunkStarts, gatedEnv, gatedSpec, openGate, sweepSummary, useRedisSweep } from '../support/redis-sweep.js';
import { deterministicRows, provenanceByPoint, resultCount, resultsPerPoint, type DeterministicRows } from '../support/sweep-db.js';
import { makeTempDir, removeTempDir, useTempDir } from '../support/temp-dir.js';
import { waitFor } from '../support/wait.js';

const tmp = useTempDir();
/** A worker lock no loaded machine lets expire while the worker lives. */
const LONG_LOCK = ['--lock-ms', '20000'];
const ctx = useRedisSweep();

let reference: DeterministicRows;
let refDir = '';
beforeAll(() => {
  refDir = makeTempDir();
  const gate = `${refDir}/gate`;
  openGate(gate);
  const r = runCli(['run', gatedSpec(refDir, 'lantern-reference'), '--db', `${refDir}/embedded.sqlite`, '--workers', '2', '--json'], { env: gatedEnv(gate) });
  expect(r.status, r.stderr).toBe(0);
  reference = deterministicRows(`${refDir}/embedded.sqlite`);
  expect(reference.results.map((x) => x.status)).toEqual(Array(18).fill('ok'));
});
afterAll(() => removeTempDir(refDir));

/** Start a worker and a run; resolve once points 0-2 are committed and the worker holds gated chunk 3. */
async function sweepHeldAtGate(name: string, workerArgs: readonly string[] = []) {
  const gate = tmp.file('gate');
  const env = gatedEnv(gate);
  const worker = ctx.worker({ env }, workerArgs);
  await worker.waitForStderr(/ready: model version/);
  const db = tmp.file(`${name}.sqlite`);
  const run = ctx.start(['run', gatedSpec(tmp.path, name), '--db', db, ...ctx.args, '--json'], { env });
  await worker.waitForStderr(/chunk 3 of [0-9a-f]{12}: started/);
  await waitFor(() => {
    if (run.done) throw new Error(`the run exited early:\n${run.stderr()}`);
    return resultCount(db) >= 3;
  }, { timeoutMs: 60_000, what: () => `3 committed rows; run log:\n${run.stderr()}` });
  expect(resultCount(db)).toBe(3); // the gate holds everything after them
  return { gate, env, worker, db, run };
}

describe('faults through Redis', () => {
  it('kill -9 of the orchestrator, then resume: nothing committed is recomputed, nothing is lost', async () => {
    const { gate, env, worker, db, run } = await sweepHeldAtGate('lantern-orchestrator', LONG_LOCK);
    const killed = await run.killGroup('SIGKILL');
    expect(killed.signal).toBe('SIGKILL');
    const before = provenanceByPoint(db);
    expect(before.size).toBe(3);

    const resume = ctx.start(['resume', '--db', db, ...ctx.args, '--json'], { env });
    await resume.waitForStderr(/running lantern-orchestrator: 18 points/);
    openGate(gate);
    const r = await resume.exited;
    expect(r.status, r.stderr).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 15, interrupted: false });
    expect(resultsPerPoint(db)).toEqual({ points: 18, results: 18, maxPerPoint: 1 });
    expect(deterministicRows(db)).toEqual(reference);
    // The three rows committed before the kill are the same rows, and their chunks ran once.
    const after = provenanceByPoint(db);
    for (const [id, p] of before) expect(after.get(id)).toEqual(p);
    const starts = chunkStarts([worker]);
    expect([...starts.keys()].sort((a, b) => a - b)).toEqual([...Array(18).keys()]);
    for (const k of [0, 1, 2]) expect(starts.get(k), `chunk ${k}`).toBe(1);
    // Redis kept the queue, so resume left the waiting and the active chunks alone: nothing ran twice (the
    // worker's lock is long here, so no lock expiry on a loaded machine hands a chunk out again either).
    expect([...starts.values()].every((n) => n === 1), `${JSON.stringify([...starts])}\nworker:\n${worker.stderr()}\nresume:\n${r.stderr}`).toBe(true);
  });

  it('Redis killed and restarted empty mid-sweep: the running orchestrator re-adds what was lost and finishes', async () => {
    const { gate, db, run, worker } = await sweepHeldAtGate('lantern-redis-loss');
    await ctx.redis.restart(); // SIGKILL, then an empty server on the same port (no persistence)
    await run.waitForStderr(/Redis lost this sweep's keys/);
    openGate(gate);
    const r = await run.exited;
    expect(r.status, `${r.stderr}\nworker:\n${worker.stderr()}`).toBe(0);
    expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 18, failed: 0, total: 18, committed: 18, interrupted: false });
    expect(resultsPerPoint(db)).toEqual({ points: 18, results: 18, maxPerPoint: 1 });
    expect(deterministicRows(db)).toEqual(reference);
  });
});
