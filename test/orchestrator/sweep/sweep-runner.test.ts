/**
 * The sweep runner over any transport, with a real store: chunk k is always the index range [k·size,
 * (k+1)·size); a resumed chunk holds only its missing points under the same chunk index; an interrupted run
 * submits nothing new and what it committed is not run again; repeated deliveries count once; a result whose
 * point id does not match its index is stored as an infrastructure failure.
 */
import { describe, expect, it } from 'vitest';
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../../shared/job-payload.js';
import { parseModelParams } from '../../../shared/model-params.js';
import type { ModelResult } from '../../../shared/model-result.js';
import { runValidatedModel } from '../../../worker/model.js';
import { parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import type { SweepStore } from '../../../orchestrator/store/index.js';
import { planSweep, type SweepPlan } from '../../../orchestrator/sweep/sweep-plan.js';
import { yieldToEventLoop } from '../../../orchestrator/sweep/result-committer.js';
import { buildChunk, chunkCount, runSweep } from '../../../orchestrator/sweep/sweep-runner.js';
import type { CommitOutcome, Transport } from '../../../orchestrator/transport/transport.js';
import { resultsPerPoint, statusByIndex } from '../../support/sweep-db.js';
import { gridSpec } from '../../support/sweep-specs.js';
import { storeWithPlan } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();

const plan: SweepPlan = planSweep(parseSpecText(JSON.stringify(gridSpec('runner', 5, 5, 4)), 'test.json', 'json'));
const CHUNK = 4;
const sample: ModelResult = runValidatedModel(parseModelParams({ initial_state: 'disk', n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] }));

function newStore(): SweepStore {
  return storeWithPlan(tmp.file('runner.sqlite'), plan, CHUNK);
}

interface Scripted extends Transport {
  readonly submitted: ChunkTaskPayload[];
}

/** Answers every chunk at once with `sample`; `deliver` may alter or repeat the outcome. */
function scriptedTransport(deliver: (o: ChunkOutcomePayload, commit: CommitOutcome) => Promise<void> = (o, c) => c(o)): Scripted {
  let commit: CommitOutcome | null = null;
  const submitted: ChunkTaskPayload[] = [];
  return {
    description: 'scripted',
    window: 2,
    submitted,
    onOutcome(fn) {
      commit = fn;
    },
    async submit(chunk) {
      submitted.push(chunk);
      if (commit === null) throw new Error('onOutcome was not called before submit');
      await deliver({
        sweep_id: chunk.sweep_id, chunk_index: chunk.chunk_index, worker_host: 'scripted-host',
        points: chunk.points.map((p) => ({ point_index: p.point_index, point_id: p.point_id, outcome: { kind: 'model' as const, result: sample } })),
      }, commit);
    },
    pending: () => 0,
    async close() {},
  };
}

const indexesOf = (chunk: ChunkTaskPayload): number[] => chunk.points.map((p) => p.point_index);

const answer = (chunk: ChunkTaskPayload): ChunkOutcomePayload => ({
  sweep_id: chunk.sweep_id, chunk_index: chunk.chunk_index, worker_host: 'batch-host',
  points: chunk.points.map((p) => ({ point_index: p.point_index, point_id: p.point_id, outcome: { kind: 'model' as const, result: sample } })),
});

interface Batching extends Transport {
  /** Resolves if the transport holds nothing and no chunk came for two turns of the event loop while points are still unsubmitted. */
  readonly stalled: Promise<'stalled'>;
}

/**
 * Holds the chunks submitted in one turn of the event loop and answers them all in the next, so they share one
 * transaction (what a loaded machine does to a pool whose fast chunks finish together). Like the embedded
 * transport, it forgets a chunk only once its commit has resolved, and a failed commit stops it and is
 * reported by close().
 */
function batchingTransport(total: number): Batching {
  let commit: CommitOutcome | null = null;
  let held: ChunkTaskPayload[] = [];
  const inFlight = new Set<Promise<void>>();
  let submittedPoints = 0;
  let fatal: unknown = null;
  let reportStall: (s: 'stalled') => void = () => undefined;
  const stalled = new Promise<'stalled'>((resolve) => (reportStall = resolve));
  const release = async (): Promise<void> => {
    const batch = held;
    held = [];
    for (const chunk of batch) {
      if (commit === null) throw new Error('onOutcome was not called before submit');
      const p: Promise<void> = commit(answer(chunk)).catch((error: unknown) => void (fatal ??= error)).finally(() => inFlight.delete(p));
      inFlight.add(p);
    }
    await Promise.all([...inFlight]);
    const before = submittedPoints;
    await yieldToEventLoop();
    await yieldToEventLoop();
    if (inFlight.size === 0 && held.length === 0 && submittedPoints === before && submittedPoints < total) reportStall('stalled');
  };
  return {
    description: 'batching',
    window: 4,
    stalled,
    onOutcome(fn) {
      commit = fn;
    },
    async submit(chunk) {
      if (fatal !== null) throw fatal;
      if (held.length === 0) setImmediate(() => void release());
      held.push(chunk);
      submittedPoints += chunk.points.length;
    },
    pending: () => held.length + inFlight.size,
    async close() {
      await Promise.all([...inFlight]);
      if (fatal !== null) throw fatal;
    },
  };
}

describe('buildChunk', () => {
  const none = new Uint8Array(plan.source.size);

  it('chunk k is the index range [k·size, (k+1)·size), the last one shorter', () => {
    expect(chunkCount(25, 4)).toBe(7);
    const input = { sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: none };
    expect(buildChunk(input, 0)).toMatchObject({ sweep_id: plan.sweepId, chunk_index: 0 });
    expect(indexesOf(buildChunk(input, 0) ?? fail())).toEqual([0, 1, 2, 3]);
    expect(indexesOf(buildChunk(input, 2) ?? fail())).toEqual([8, 9, 10, 11]);
    expect(indexesOf(buildChunk(input, 6) ?? fail())).toEqual([24]);
    for (const p of (buildChunk(input, 2) ?? fail()).points) expect(p).toEqual({ point_index: p.point_index, point_id: plan.source.taskAt(p.point_index).pointId, params: plan.source.taskAt(p.point_index).params });
  });

  it('a partly done chunk holds only its missing points and keeps its index; a done chunk is skipped', () => {
    const has = new Uint8Array(plan.source.size);
    has.set([1, 0, 1, 0, 1, 1, 1, 1], 4);
    const input = { sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: has };
    expect(buildChunk(input, 1)).toMatchObject({ chunk_index: 1 });
    expect(indexesOf(buildChunk(input, 1) ?? fail())).toEqual([5, 7]);
    expect(buildChunk(input, 2)).toBeNull();
  });
});

function fail(): never {
  throw new Error('expected a chunk');
}

describe('runSweep', () => {
  it('an interrupted run stops submitting; the resumed run submits exactly the rest, on the same boundaries', async () => {
    const store = newStore();
    const controller = new AbortController();
    const first = scriptedTransport();
    const r1 = await runSweep({
      sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId),
      store, transport: first, signal: controller.signal,
      onProgress: (c) => {
        if (c.committed >= 3 * CHUNK) controller.abort();
      },
    });
    expect(r1).toMatchObject({ interrupted: true, committed: 12, done: 12, total: 25, failed: 0 });
    expect(first.submitted.map((c) => c.chunk_index)).toEqual([0, 1, 2]);
    expect([...statusByIndex(store.file).keys()].sort((a, b) => a - b)).toEqual([...Array(12).keys()]);

    // Point 13 got its result some other way (another sweep's reuse, say): chunk 3 is resumed without it.
    store.writeResults([{ sweepId: plan.sweepId, pointId: plan.source.taskAt(13).pointId, pointIndex: 13, params: plan.source.taskAt(13).params, outcome: { kind: 'model', result: sample }, workerHost: 'elsewhere' }]);
    const second = scriptedTransport();
    const r2 = await runSweep({
      sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport: second,
    });
    expect(r2).toMatchObject({ interrupted: false, committed: 12, done: 25, total: 25 });
    expect(second.submitted.map((c) => [c.chunk_index, indexesOf(c)])).toEqual([
      [3, [12, 14, 15]], [4, [16, 17, 18, 19]], [5, [20, 21, 22, 23]], [6, [24]],
    ]);
    store.close();
    expect(resultsPerPoint(tmp.file('runner.sqlite'))).toEqual({ points: 25, results: 25, maxPerPoint: 1 });
  });

  it('counts a chunk delivered twice once', async () => {
    const store = newStore();
    const twice = scriptedTransport(async (o, commit) => {
      await commit(o);
      await commit(o);
    });
    const r = await runSweep({ sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport: twice });
    expect(r).toMatchObject({ done: 25, committed: 25, failed: 0, interrupted: false });
    store.close();
    expect(resultsPerPoint(tmp.file('runner.sqlite'))).toEqual({ points: 25, results: 25, maxPerPoint: 1 });
  });

  it('stores a result whose point id does not match its index as an infrastructure failure', async () => {
    const store = newStore();
    const swapped = scriptedTransport((o, commit) => commit({
      ...o,
      points: o.points.map((p) => (p.point_index === 6 ? { ...p, point_id: plan.source.taskAt(7).pointId } : p)),
    }));
    const r = await runSweep({ sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport: swapped });
    expect(r).toMatchObject({ done: 25, failed: 1 });
    store.close();
    const status = statusByIndex(tmp.file('runner.sqlite'));
    expect(status.get(6)?.status).toBe('infrastructure_error');
    expect(status.get(6)?.reason).toContain('point id mismatch');
    expect(status.get(7)?.status).toBe('ok');
  });
});

describe('runSweep: every chunk in flight committed in one transaction', () => {
  const input = (store: SweepStore, transport: Transport, onProgress?: (c: { committed: number }) => void) => ({
    sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport, onProgress,
  });

  it('goes on submitting (the window frees in the turn of the commit, not when the transport forgets the chunks)', async () => {
    const store = newStore();
    const transport = batchingTransport(plan.source.size);
    const committedAt: number[] = [];
    const r = await Promise.race([runSweep(input(store, transport, (c) => committedAt.push(c.committed))), transport.stalled]);
    expect(r).toMatchObject({ done: 25, committed: 25, interrupted: false });
    // The window of 4 chunks (16 points) filled and was committed in one transaction, then the last 3 chunks.
    expect(committedAt).toEqual([16, 25]);
    store.close();
    expect(resultsPerPoint(tmp.file('runner.sqlite'))).toEqual({ points: 25, results: 25, maxPerPoint: 1 });
  });

  it('stops and reports a store that fails on that transaction instead of waiting for a commit that never comes', async () => {
    const store = newStore();
    const failing: SweepStore = Object.assign(Object.create(store) as SweepStore, {
      writeResults: () => {
        throw new Error('disk I/O error (injected)');
      },
    });
    const transport = batchingTransport(plan.source.size);
    await expect(Promise.race([runSweep(input(failing, transport)), transport.stalled])).rejects.toThrow('disk I/O error (injected)');
    store.close();
  });
});

describe('work on the orchestrator thread', () => {
  it('derives each point once per run (the chunk tasks are kept until their outcomes are committed)', async () => {
    const store = newStore();
    let derived = 0;
    const counting = { size: plan.source.size, taskAt: (i: number) => (derived++, plan.source.taskAt(i)) };
    const r = await runSweep({ sweepId: plan.sweepId, chunkSize: CHUNK, source: counting, hasResult: store.pointIndexesWithResult(plan.sweepId), store, transport: scriptedTransport() });
    expect(r).toMatchObject({ done: 25, committed: 25 });
    expect(derived).toBe(25);
    store.close();
  });
});
