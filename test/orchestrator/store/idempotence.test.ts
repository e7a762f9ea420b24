/**
 * Writes are idempotent upserts by (sweep_id, point_id) that never overwrite an ok row; what resume and status
 * read back follows from them (which points need a rerun, counts, failure reasons, finish times, reuse).
 */
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import type { StoredOutcome } from '../../../orchestrator/store/store-types.js';
import { openStore, type SweepStore } from '../../../orchestrator/store/sweep-store.js';
import { infrastructureOutcome, manyOutcomes, modelOutcome, modelRun, sweepFixture } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';
import { MODEL_VERSION } from '../../../shared/model-version.js';

const tmp = useTempDir();

const ok = () => modelRun({});
const otherOk = () => modelRun({ initial_state: 'disk', m_disk_msun: 0.5 });
const failed = () => modelRun({ max_steps: 10 });

function rowCounts(file: string, sweepId: string, pointId: string) {
  const raw = new Database(file, { readonly: true });
  const count = (table: string) =>
    raw.prepare(`SELECT count(*) FROM ${table} WHERE sweep_id = ? AND point_id = ?`).pluck().get(sweepId, pointId);
  const counts = { points: count('points'), results: count('results'), checkpoints: count('checkpoints'), series: count('series') };
  raw.close();
  return counts;
}

function withRun(item: StoredOutcome, run: ReturnType<typeof modelRun>): StoredOutcome {
  return { ...item, outcome: { kind: 'model', result: run.result } };
}

function setup(name: string): { store: SweepStore; file: string; sweepId: string } {
  const file = tmp.file(name);
  const store = openStore(file, { mode: 'write' });
  const sweep = sweepFixture();
  store.registerSweep(sweep);
  return { store, file, sweepId: sweep.sweepId };
}

describe('idempotent writes', () => {
  it('writing the same batch twice leaves one row per point', () => {
    const { store, file, sweepId } = setup('twice.sqlite');
    const batch = manyOutcomes(sweepId, ok(), 300);
    expect(store.writeResults(batch)).toEqual({ written: 300, skippedOk: 0 });
    expect(store.writeResults(batch)).toEqual({ written: 0, skippedOk: 300 });
    const n = ok().result.checkpoints.length;
    expect(rowCounts(file, sweepId, batch[123].pointId)).toEqual({ points: 1, results: 1, checkpoints: n, series: 1 });
    expect(store.statusCounts(sweepId)).toMatchObject({ nPoints: 500, withResult: 300, byStatus: { ok: 300, step_limit: 0 } });
    store.close();
  });

  it('never replaces an ok row: not by a later failure, not by a later different ok', () => {
    const { store, file, sweepId } = setup('keep-ok.sqlite');
    const first = modelOutcome(sweepId, 7, ok());
    store.writeResults([first]);
    const laterFailure = withRun(first, failed());
    const laterInfra = { ...first, outcome: { kind: 'infrastructure', reason: 'thread crashed' } } as const;
    const laterOk = { ...withRun(first, otherOk()), workerHost: 'worker-z', finishedAt: first.finishedAt! + 5 };
    expect(store.writeResults([laterFailure, laterInfra, laterOk])).toEqual({ written: 0, skippedOk: 3 });
    expect(store.readResult(sweepId, first.pointId)).toEqual(first);
    expect(rowCounts(file, sweepId, first.pointId).checkpoints).toBe(ok().result.checkpoints.length);
    store.close();
  });

  it('replaces a failed row by a later ok, checkpoints and series with it', () => {
    const { store, file, sweepId } = setup('replace.sqlite');
    const run = ok();
    const infra = infrastructureOutcome(sweepId, 3, run, 'worker lost');
    store.writeResults([infra]);
    expect(rowCounts(file, sweepId, run.pointId)).toEqual({ points: 1, results: 1, checkpoints: 0, series: 0 });

    const modelFailure = withRun(modelOutcome(sweepId, 3, run), failed());
    expect(store.writeResults([modelFailure])).toEqual({ written: 1, skippedOk: 0 });
    expect(store.readResult(sweepId, run.pointId)).toEqual(modelFailure);

    const success = modelOutcome(sweepId, 3, run, { workerHost: 'worker-c' });
    expect(store.writeResults([success])).toEqual({ written: 1, skippedOk: 0 });
    expect(store.readResult(sweepId, run.pointId)).toEqual(success);
    expect(rowCounts(file, sweepId, run.pointId)).toEqual({ points: 1, results: 1, checkpoints: run.result.checkpoints.length, series: 1 });

    // An ok row with checkpoints, replaced by nothing: a failure written afterwards leaves them as they were.
    store.writeResults([infrastructureOutcome(sweepId, 3, run, 'late duplicate')]);
    expect(store.readResult(sweepId, run.pointId)).toEqual(success);
    store.close();
  });
});

describe('what resume and status read', () => {
  it('marks the points that need no rerun: ok always, model failures unless retryFailed, infrastructure never', () => {
    const { store, sweepId } = setup('resume.sqlite');
    store.writeResults([
      modelOutcome(sweepId, 0, ok()),
      withRun(modelOutcome(sweepId, 1, otherOk()), failed()),
      infrastructureOutcome(sweepId, 2, modelRun({ alpha_active: 0.05 }), 'exception: boom'),
    ]);
    const plain = store.pointIndexesWithResult(sweepId);
    expect(plain).toBeInstanceOf(Uint8Array);
    expect(plain.length).toBe(500);
    expect([...plain.subarray(0, 4)]).toEqual([1, 1, 0, 0]);
    expect(plain.reduce((a, b) => a + b, 0)).toBe(2);
    const retry = store.pointIndexesWithResult(sweepId, { retryFailed: true });
    expect([...retry.subarray(0, 4)]).toEqual([1, 0, 0, 0]);
    expect(() => store.pointIndexesWithResult('no-such-sweep')).toThrow(expect.objectContaining({ code: 'store/unknown-sweep' }));
    store.close();
  });

  it('counts statuses, ranks failure reasons by shape and lists finish times', () => {
    const { store, sweepId } = setup('status.sqlite');
    const runs = manyOutcomes(sweepId, ok(), 12);
    const batch: StoredOutcome[] = runs.map((o, i) => {
      if (i < 5) return { ...o, outcome: { kind: 'infrastructure', reason: `worker thread exited with code ${i + 1}` } };
      if (i < 7) return { ...o, outcome: { kind: 'infrastructure', reason: 'job timed out' } };
      if (i < 8) return withRun(o, failed());
      return o;
    });
    store.writeResults(batch);
    expect(store.statusCounts(sweepId)).toEqual({
      nPoints: 500,
      withResult: 12,
      byStatus: { ok: 4, step_limit: 1, step_collapse: 0, non_finite: 0, budget_error: 0, infrastructure_error: 7 },
    });
    const reasons = store.topFailureReasons(sweepId, 2);
    expect(reasons).toEqual([
      { status: 'infrastructure_error', reason: 'worker thread exited with code <n>', example: 'worker thread exited with code 1', count: 5 },
      { status: 'infrastructure_error', reason: 'job timed out', example: 'job timed out', count: 2 },
    ]);
    expect(store.topFailureReasons(sweepId, 10).map((r) => r.status)).toContain('step_limit');
    const times = store.finishedTimes(sweepId, batch[6].finishedAt);
    expect([...times]).toEqual(batch.slice(6).map((b) => b.finishedAt));
    store.close();
  });

  it('registers a sweep once and reports another model version under the same id', () => {
    const { store, sweepId } = setup('register.sqlite');
    const again = store.registerSweep(sweepFixture({ chunkSize: 99 }));
    expect(again.kind).toBe('existing');
    expect(again.sweep.chunkSize).toBe(8); // the stored calibration wins: chunk boundaries never move
    const other = store.registerSweep(sweepFixture({ modelVersion: '9.9.9' }));
    expect(other).toMatchObject({ kind: 'model-version-mismatch', requestedModelVersion: '9.9.9', sweep: { modelVersion: MODEL_VERSION } });
    expect(store.getSweep(sweepId)?.name).toBe('test-sweep');
    expect(store.getSweep('nope')).toBeUndefined();
    store.registerSweep(sweepFixture({ sweepId: 'a'.repeat(64), name: 'second' }));
    expect(store.listSweeps().map((s) => s.name)).toEqual(['test-sweep', 'second']);
    store.close();
  });

  it('reuses results of another sweep whose point ids match, under the new sweep id and index', () => {
    const { store, file, sweepId } = setup('reuse.sqlite');
    const a = modelOutcome(sweepId, 0, ok());
    const b = withRun(modelOutcome(sweepId, 1, otherOk()), failed());
    const c = infrastructureOutcome(sweepId, 2, modelRun({ alpha_active: 0.05 }), 'boom');
    store.writeResults([a, b, c]);
    const edited = sweepFixture({ sweepId: 'b'.repeat(64), name: 'edited', nPoints: 10 });
    store.registerSweep(edited);
    const points = [
      { pointId: a.pointId, pointIndex: 5 },
      { pointId: b.pointId, pointIndex: 6 },
      { pointId: c.pointId, pointIndex: 7 },
      { pointId: 'not-in-the-old-sweep', pointIndex: 8 },
    ];
    expect(store.reuseResults(sweepId, edited.sweepId, points, { retryFailed: true })).toEqual({ considered: 4, copied: 1, byStatus: { ok: 1 } });
    expect(store.reuseResults(sweepId, edited.sweepId, points)).toEqual({ considered: 4, copied: 1, byStatus: { step_limit: 1 } });
    expect(store.readResult(edited.sweepId, a.pointId)).toEqual({ ...a, sweepId: edited.sweepId, pointIndex: 5 });
    expect(store.readResult(edited.sweepId, b.pointId)).toEqual({ ...b, sweepId: edited.sweepId, pointIndex: 6 });
    expect(store.readResult(edited.sweepId, c.pointId)).toBeUndefined();
    expect([...store.pointIndexesWithResult(edited.sweepId)]).toEqual([0, 0, 0, 0, 0, 1, 1, 0, 0, 0]);
    expect(rowCounts(file, edited.sweepId, a.pointId)).toEqual({ points: 1, results: 1, checkpoints: ok().result.checkpoints.length, series: 1 });
    // The old sweep is untouched.
    expect(store.readResult(sweepId, a.pointId)).toEqual(a);
    store.close();
  });
});
