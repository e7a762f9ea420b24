/**
 * Group commit: a big outcome is written in transactions of BATCH_POINTS points with the event loop turning
 * between them (timers and signals are not starved by fast models); outcomes that arrive together share a
 * transaction; `commit` resolves only once every point of its outcome is in the database; a store failure
 * rejects what is queued.
 */
import { describe, expect, it } from 'vitest';
import type { ChunkOutcomePayload } from '../../../shared/job-payload.js';
import { parseModelParams } from '../../../shared/model-params.js';
import { runValidatedModel } from '../../../worker/model.js';
import { parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import type { SweepStore } from '../../../orchestrator/store/index.js';
import { BATCH_POINTS, ResultCommitter } from '../../../orchestrator/sweep/result-committer.js';
import { planSweep } from '../../../orchestrator/sweep/sweep-plan.js';
import { buildChunk } from '../../../orchestrator/sweep/sweep-runner.js';
import { resultCount } from '../../support/sweep-db.js';
import { gridSpec } from '../../support/sweep-specs.js';
import { storeWithPlan } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();
const N = 2100;
const plan = planSweep(parseSpecText(JSON.stringify(gridSpec('committer', 70, 30, N)), 'test.json', 'json'));
const sample = runValidatedModel(parseModelParams({ initial_state: 'disk', n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] }));

function newStore(): SweepStore {
  return storeWithPlan(tmp.file('committer.sqlite'), plan, N);
}

function outcomeOf(k: number, from: number, to: number): ChunkOutcomePayload {
  const chunk = buildChunk({ sweepId: plan.sweepId, chunkSize: N, source: plan.source, hasResult: new Uint8Array(plan.source.size) }, k);
  if (chunk === null) throw new Error('expected a chunk');
  return {
    sweep_id: plan.sweepId, chunk_index: k, worker_host: 'test-host',
    points: chunk.points.slice(from, to).map((p) => ({ point_index: p.point_index, point_id: p.point_id, outcome: { kind: 'model' as const, result: sample } })),
  };
}

describe('ResultCommitter', () => {
  it('writes a big outcome in batches and lets the event loop turn between them', async () => {
    expect(plan.source.size).toBe(N);
    const store = newStore();
    const batches: number[] = [];
    let ticks = 0;
    const ticksAtBatch: number[] = [];
    const committer = new ResultCommitter(plan.source, store, (rows) => {
      batches.push(rows.length);
      ticksAtBatch.push(ticks);
    });
    const ticker = setInterval(() => ticks++, 0);
    const outcome = outcomeOf(0, 0, N);
    await committer.commit(outcome);
    clearInterval(ticker);
    expect(batches).toEqual([500, 500, 500, 500, 100]);
    expect(BATCH_POINTS).toBe(500);
    // A timer ran between every two transactions: nothing waits for the whole outcome.
    for (let b = 1; b < ticksAtBatch.length; b++) expect(ticksAtBatch[b]).toBeGreaterThan(ticksAtBatch[b - 1]);
    store.close();
    expect(resultCount(tmp.file('committer.sqlite'))).toBe(N);
  });

  it('outcomes that arrive together share a transaction, and each resolves only once it is committed', async () => {
    const store = newStore();
    const batches: number[] = [];
    const committer = new ResultCommitter(plan.source, store, (rows) => batches.push(rows.length));
    const resolvedAt: number[] = [];
    const parts = [[0, 100], [100, 250], [250, 700]].map(([a, b], i) =>
      committer.commit(outcomeOf(0, a, b)).then(() => resolvedAt.push(i)));
    await Promise.all(parts);
    // 100 + 150 + 250 of the third fill the first transaction; the rest of the third is the second.
    expect(batches).toEqual([500, 200]);
    expect(resolvedAt).toEqual([0, 1, 2]);
    store.close();
    expect(resultCount(tmp.file('committer.sqlite'))).toBe(700);
  });

  it('a store failure rejects the outcome being written and every one queued behind it', async () => {
    const store = newStore();
    store.close(); // writes now throw
    const committer = new ResultCommitter(plan.source, store);
    const results = await Promise.allSettled([committer.commit(outcomeOf(0, 0, 10)), committer.commit(outcomeOf(0, 10, 20))]);
    expect(results.map((r) => r.status)).toEqual(['rejected', 'rejected']);
    await expect(committer.commit(outcomeOf(0, 20, 30))).rejects.toBeDefined();
  });
});
