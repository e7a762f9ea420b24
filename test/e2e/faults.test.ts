/**
 * Failing models in a real sweep, with the fault model in the pool threads (test/support/fault-model.ts):
 * a model that throws and a thread that dies are infrastructure errors; an injected non-finite result and a
 * run that hits its step cap are model failures. Each is stored with its status, the sweep goes on and
 * completes the rest; `resume` reruns only the infrastructure errors, `resume --retry-failed` also the model
 * failures, and nothing that is ok.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { faultModelEnv, runCli } from '../support/cli.js';
import { pointIndexById, provenanceByPoint, statusByIndex, type Provenance } from '../support/sweep-db.js';
import { TINY_FIXED, TINY_MODEL, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();

/** Marker alpha values the fault model reacts to (see FAULT_MARKERS in fault-model.ts). */
const THROWS = 0.0201;
const NON_FINITE = 0.0202;
const KILLS_THREAD = 0.0203;

const summary = z.object({ done: z.number(), failed: z.number(), total: z.number(), committed: z.number(), interrupted: z.boolean() });

function sweep(args: string[], env: Record<string, string> = faultModelEnv()) {
  const r = runCli([...args, '--workers', '2', '--json'], { env });
  expect(r.status, r.stderr).toBe(0);
  return summary.parse(JSON.parse(r.stdout));
}

/** Point indexes whose stored row changed between two snapshots (by point id; every point is in both). */
function rerun(before: Map<string, Provenance>, after: Map<string, Provenance>, indexOf: Map<string, number>): number[] {
  return [...before].filter(([id, p]) => after.get(id)?.finished_at !== p.finished_at).map(([id]) => indexOf.get(id) ?? -1).sort((a, b) => a - b);
}

describe('model failures and infrastructure failures', () => {
  it('are stored with their status; resume reruns infrastructure errors, --retry-failed also model failures', () => {
    // max_steps varies slowest: points 0-4 have a 10-step cap, points 5-9 the default.
    const spec = writeSpec(tmp.path, 'tern-faults.yaml', {
      name: 'tern-faults',
      model: TINY_MODEL,
      fixed: TINY_FIXED,
      vary: { max_steps: { values: [10, 200000] }, alpha_active: { values: [0.001, THROWS, NON_FINITE, KILLS_THREAD, 0.05] } },
      chunks: { size: 1 },
    });
    const db = tmp.file('faults.sqlite');
    expect(sweep(['run', spec, '--db', db])).toEqual({ done: 10, failed: 8, total: 10, committed: 10, interrupted: false });

    const statuses = statusByIndex(db);
    const expected = ['step_limit', 'infrastructure_error', 'non_finite', 'infrastructure_error', 'step_limit', 'ok', 'infrastructure_error', 'non_finite', 'infrastructure_error', 'ok'];
    expect([...statuses.keys()].sort((a, b) => a - b).map((i) => statuses.get(i)?.status)).toEqual(expected);
    expect(statuses.get(1)?.reason).toContain('injected failure: this model throws');
    expect(statuses.get(3)?.reason).toContain('worker thread failed');
    expect(statuses.get(2)?.reason).toContain('injected: non-finite');
    expect(statuses.get(0)?.reason).toContain('max_steps = 10');

    // status reports the counts and the commonest reasons.
    const status = runCli(['status', '--db', db, '--json']);
    expect(status.status, status.stderr).toBe(0);
    const report = z.object({ by_status: z.record(z.string(), z.number()), top_failure_reasons: z.array(z.object({ status: z.string(), count: z.number() })) }).parse(JSON.parse(status.stdout));
    expect(report.by_status).toMatchObject({ ok: 2, step_limit: 2, non_finite: 2, infrastructure_error: 4 });
    expect(report.top_failure_reasons.reduce((n, r) => n + r.count, 0)).toBe(8);

    const indexOf = pointIndexById(db);
    const statusesNow = () => {
      const now = statusByIndex(db);
      return [...now.keys()].sort((a, b) => a - b).map((i) => now.get(i)?.status);
    };

    // resume: only the infrastructure errors run again (and fail again: the faults are deterministic).
    const afterRun = provenanceByPoint(db);
    expect(sweep(['resume', '--db', db])).toEqual({ done: 10, failed: 4, total: 10, committed: 4, interrupted: false });
    const afterResume = provenanceByPoint(db);
    expect(rerun(afterRun, afterResume, indexOf)).toEqual([1, 3, 6, 8]);
    expect(statusesNow()).toEqual(expected);

    // --retry-failed: the model failures too, never an ok point.
    expect(sweep(['resume', '--db', db, '--retry-failed'])).toEqual({ done: 10, failed: 8, total: 10, committed: 8, interrupted: false });
    expect(rerun(afterResume, provenanceByPoint(db), indexOf)).toEqual([0, 1, 2, 3, 4, 6, 7, 8]);
    expect(statusesNow()).toEqual(expected);

    // With the real model the infrastructure errors go through; the model failures stay as they are.
    const beforeReal = provenanceByPoint(db);
    expect(sweep(['resume', '--db', db], {})).toEqual({ done: 10, failed: 2, total: 10, committed: 4, interrupted: false });
    expect(rerun(beforeReal, provenanceByPoint(db), indexOf)).toEqual([1, 3, 6, 8]);
    expect(statusesNow()).toEqual(['step_limit', 'step_limit', 'non_finite', 'step_limit', 'step_limit', 'ok', 'ok', 'non_finite', 'ok', 'ok']);
  });

  it('a throwing model fails alone; a dying thread takes only its own chunk with it', () => {
    const spec = writeSpec(tmp.path, 'tern-chunks.yaml', {
      name: 'tern-chunks',
      model: TINY_MODEL,
      fixed: TINY_FIXED,
      vary: { alpha_active: { values: [0.001, THROWS, 0.05, 0.002, KILLS_THREAD, 0.06, 0.003, 0.03, 0.07] } },
      chunks: { size: 3 },
    });
    const db = tmp.file('chunks.sqlite');
    expect(sweep(['run', spec, '--db', db])).toEqual({ done: 9, failed: 4, total: 9, committed: 9, interrupted: false });
    const statuses = statusByIndex(db);
    const ordered = [...statuses.keys()].sort((a, b) => a - b).map((i) => statuses.get(i));
    expect(ordered.map((s) => s?.status)).toEqual([
      'ok', 'infrastructure_error', 'ok', // chunk 0: the other two models of the chunk are kept
      'infrastructure_error', 'infrastructure_error', 'infrastructure_error', // chunk 1: the thread died
      'ok', 'ok', 'ok', // chunk 2: unaffected
    ]);
    for (const i of [3, 4, 5]) expect(ordered[i]?.reason).toContain('worker thread failed');

    const indexOf = pointIndexById(db);
    const before = provenanceByPoint(db);
    expect(sweep(['resume', '--db', db], {})).toEqual({ done: 9, failed: 0, total: 9, committed: 4, interrupted: false });
    expect(rerun(before, provenanceByPoint(db), indexOf)).toEqual([1, 3, 4, 5]);
    expect([...statusByIndex(db).values()].every((s) => s.status === 'ok')).toBe(true);
  });
});
