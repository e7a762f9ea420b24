/**
 * Interrupting `disksweep run` (real processes) at a moment chosen from its observed progress: once the
 * database holds a share of the results, Ctrl-C (SIGINT) or `kill -9`. Then `resume`: exactly one result per
 * point, outputs identical to an uninterrupted run of the same spec, and every result committed before the
 * interrupt left as it was (same finish time, worker and wall time: not recomputed). After kill -9 the dead
 * process's lock is still in the database; resume takes it over.
 */
import { hostname } from 'node:os';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCli, startCli, stopCli, type CliProcess } from '../support/cli.js';
import { deterministicRows, lockRows, provenanceByPoint, resultsPerPoint, waitForResults } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { makeTempDir, removeTempDir } from '../support/temp-dir.js';

/** 400 tiny models in chunks of 4: several seconds on two threads, so there is time to interrupt. */
const POINTS = 400;
/** Interrupt once this many results are committed (well before the end, well after the start). */
const INTERRUPT_AFTER = 60;

let dir = '';
let spec = '';
let reference = '';
const started: CliProcess[] = [];

beforeAll(() => {
  dir = makeTempDir('disksweep-interrupt-');
  spec = writeSpec(dir, 'heron-interrupt.yaml', gridSpec('heron-interrupt', 20, 20, 4));
  reference = `${dir}/reference.sqlite`;
  const r = runCli(['run', spec, '--db', reference, '--workers', '2']);
  expect(r.status, r.stderr).toBe(0);
  expect(resultsPerPoint(reference)).toEqual({ points: POINTS, results: POINTS, maxPerPoint: 1 });
});

afterEach(async () => {
  for (const p of started.splice(0)) await stopCli(p);
});

afterAll(() => removeTempDir(dir));

const resumeSummary = z.object({ done: z.number(), total: z.number(), committed: z.number(), interrupted: z.boolean() });

/** Start a run and wait until it has committed INTERRUPT_AFTER results. */
async function runUntilProgress(db: string): Promise<CliProcess> {
  const p = startCli(['run', spec, '--db', db, '--workers', '2']);
  started.push(p);
  await p.waitForStderr(/^running heron-interrupt: 400 points in 100 chunks of 4/m);
  await waitForResults(db, INTERRUPT_AFTER, p);
  return p;
}

/** Resume and check the end state against the uninterrupted reference run. */
function resumeAndCompare(db: string, before: Map<string, unknown>): void {
  const r = runCli(['resume', '--db', db, '--workers', '2', '--json']);
  expect(r.status, r.stderr).toBe(0);
  expect(resumeSummary.parse(JSON.parse(r.stdout))).toEqual({ done: POINTS, total: POINTS, committed: POINTS - before.size, interrupted: false });
  expect(resultsPerPoint(db)).toEqual({ points: POINTS, results: POINTS, maxPerPoint: 1 });
  expect(deterministicRows(db)).toEqual(deterministicRows(reference));
  const after = provenanceByPoint(db);
  for (const [pointId, committed] of before) expect(after.get(pointId), `point ${pointId} was recomputed`).toEqual(committed);
}

describe('interrupt and resume', () => {
  it('Ctrl-C: finishes the chunks in flight, exits 130 naming the resume command; resume completes it', async () => {
    const db = `${dir}/sigint.sqlite`;
    const p = await runUntilProgress(db);
    p.child.kill('SIGINT');
    const r = await p.exited;
    expect(r.status, r.stderr).toBe(130);
    expect(r.stderr).toContain('stopping: finishing the chunks in flight');
    expect(r.stderr).toContain(`interrupted: resume with  disksweep resume --db ${db}\n`);

    const before = provenanceByPoint(db);
    expect(before.size).toBeGreaterThanOrEqual(INTERRUPT_AFTER);
    expect(before.size, 'the run finished before the interrupt reached it').toBeLessThan(POINTS);
    // What the interrupted run says it committed is what the database holds, and nobody holds the lock.
    expect(r.stdout).toContain(`${before.size}/${POINTS} points have a result; this run committed ${before.size};`);
    expect(lockRows(db)).toEqual([]);

    resumeAndCompare(db, before);
  });

  it('kill -9: committed results survive, the dead owner\'s lock is taken over, resume completes it', async () => {
    const db = `${dir}/sigkill.sqlite`;
    const p = await runUntilProgress(db);
    p.child.kill('SIGKILL');
    const r = await p.exited;
    expect(r.signal).toBe('SIGKILL');

    const before = provenanceByPoint(db);
    expect(before.size).toBeGreaterThanOrEqual(INTERRUPT_AFTER);
    expect(before.size, 'the run finished before the kill reached it').toBeLessThan(POINTS);
    expect(resultsPerPoint(db).maxPerPoint).toBe(1);
    expect(lockRows(db)).toEqual([{ scope: '*', host: hostname(), pid: p.pid }]);

    resumeAndCompare(db, before);
    expect(lockRows(db)).toEqual([]);
  });
});
