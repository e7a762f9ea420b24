/**
 * Sweep identity and chunk calibration: the sweep id hashes what decides the results (model settings, fixed and
 * varied parameters, sampling), not the name, description or chunking; calibration runs a few of the sweep's own
 * points spread over it and derives the chunk size from their median time.
 */
import { describe, expect, it } from 'vitest';
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../../shared/job-payload.js';
import { parseModelParams } from '../../../shared/model-params.js';
import type { ModelResult } from '../../../shared/model-result.js';
import { runValidatedModel } from '../../../worker/model.js';
import { parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import { calibrate, calibrationIndexes, MAX_CHUNK_SIZE, planSweep, storedSpecJson, type SweepPlan } from '../../../orchestrator/sweep/sweep-plan.js';
import type { CommitOutcome, Transport } from '../../../orchestrator/transport/transport.js';
import { gridSpec } from '../../support/sweep-specs.js';
import type { SpecObject } from '../../support/sweep-specs.js';

const planOf = (spec: SpecObject): SweepPlan => planSweep(parseSpecText(JSON.stringify(spec), 'test.json', 'json'));
const idOf = (spec: SpecObject): string => planOf(spec).sweepId;

describe('sweep id', () => {
  const base = gridSpec('heron-reach', 3, 2, 4);
  const reference = idOf(base);

  it('is a 256-bit hex hash', () => {
    expect(reference).toMatch(/^[0-9a-f]{64}$/);
  });

  it.each<[string, SpecObject]>([
    ['a new name', { ...base, name: 'heron-reach-renamed' }],
    ['a new description', { ...base, description: 'the same sweep, described differently' }],
    ['no description', Object.fromEntries(Object.entries(base).filter(([k]) => k !== 'description'))],
    ['another chunk size', { ...base, chunks: { size: 50 } }],
    ['a chunk duration instead', { ...base, chunks: { target_seconds: 5 } }],
    ['the default plan left out', Object.fromEntries(Object.entries(base).filter(([k]) => k !== 'sampling'))],
    ['keys in another order', Object.fromEntries(Object.entries(base).reverse())],
  ])('stays the same with %s', (_what, spec) => {
    expect(idOf(spec)).toBe(reference);
  });

  it.each<[string, SpecObject]>([
    ['a fixed value', { ...base, fixed: { initial_state: 'disk', m_star_msun: 0.8 } }],
    ['a model setting', { ...base, model: { n_cells: 48, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] } }],
    ['a varied range', gridSpec('heron-reach', 4, 2, 4)],
    ['the plan', { ...base, vary: { m_disk_msun: { log: [0.01, 0.1] }, alpha_active: { log: [1e-3, 1e-1] } }, sampling: { plan: 'sobol', points: 6 } }],
    ['the order of the varied parameters', { ...base, vary: Object.fromEntries(Object.entries(base.vary as Record<string, unknown>).reverse()) }],
  ])('changes with %s', (_what, spec) => {
    expect(idOf(spec)).not.toBe(reference);
  });

  it('the stored spec read back (as resume does) gives the same id and the same points in the same order', () => {
    // The spec lists m_disk_msun before alpha_active: an order that sorting keys would change.
    const plan = planOf(base);
    const again = planSweep(parseSpecText(storedSpecJson(plan.spec), 'stored', 'json'));
    expect(again.sweepId).toBe(plan.sweepId);
    expect(Array.from({ length: again.source.size }, (_, i) => again.source.taskAt(i).pointId))
      .toEqual(Array.from({ length: plan.source.size }, (_, i) => plan.source.taskAt(i).pointId));
  });
});

describe('calibration indexes', () => {
  it('take every point of a small sweep', () => {
    expect(calibrationIndexes(1)).toEqual([0]);
    expect(calibrationIndexes(3)).toEqual([0, 1, 2]);
  });

  it('spread three points over a large sweep: first, middle, last', () => {
    expect(calibrationIndexes(1001)).toEqual([0, 500, 1000]);
  });
});

/** One real tiny model result, reused with chosen wall times. */
const sample: ModelResult = runValidatedModel(parseModelParams({ initial_state: 'disk', n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] }));

/**
 * A transport that answers each point at once with `sample`, timed by `wallMs(pointIndex)` (or an
 * infrastructure failure when that returns null), and records what it was given.
 */
function scriptedTransport(wallMs: (pointIndex: number) => number | null): Transport & { submitted: ChunkTaskPayload[]; closed: string[] } {
  let commit: CommitOutcome | null = null;
  const submitted: ChunkTaskPayload[] = [];
  const closed: string[] = [];
  return {
    description: 'scripted',
    window: 4,
    submitted,
    closed,
    onOutcome(fn) {
      commit = fn;
    },
    async submit(chunk) {
      submitted.push(chunk);
      if (commit === null) throw new Error('onOutcome was not called before submit');
      const outcome: ChunkOutcomePayload = {
        sweep_id: chunk.sweep_id,
        chunk_index: chunk.chunk_index,
        worker_host: 'scripted-host',
        points: chunk.points.map((p) => {
          const ms = wallMs(p.point_index);
          return {
            point_index: p.point_index,
            point_id: p.point_id,
            outcome: ms === null
              ? { kind: 'infrastructure' as const, reason: 'scripted failure' }
              : { kind: 'model' as const, result: { ...sample, timing: { ...sample.timing, wall_ms: ms } } },
          };
        }),
      };
      await commit(outcome);
    },
    pending: () => 0,
    async close(mode) {
      closed.push(mode);
    },
  };
}

describe('calibrate', () => {
  const plan = planOf(gridSpec('calibration', 10, 10, 1));

  it('runs the spread points of the sweep itself and sizes chunks from their median time', async () => {
    const times = new Map([[0, 20], [50, 40], [99, 900]]); // median 40 ms: one slow outlier does not decide
    const transport = scriptedTransport((i) => times.get(i) ?? null);
    const c = await calibrate(plan, transport, 2);
    expect(transport.submitted.map((t) => t.points.map((p) => p.point_index))).toEqual([[0], [50], [99]]);
    for (const t of transport.submitted) expect(t.points[0].point_id).toBe(plan.source.taskAt(t.points[0].point_index).pointId);
    expect(transport.closed).toEqual(['graceful']);
    expect(c.secondsPerPoint).toBe(0.04);
    expect(c.chunkSize).toBe(50);
    expect(c.outcomes.flatMap((o) => o.points.map((p) => p.point_index))).toEqual([0, 50, 99]);
  });

  it('keeps the chunk size between 1 and the maximum', async () => {
    expect((await calibrate(plan, scriptedTransport(() => 5000), 0.1)).chunkSize).toBe(1);
    expect((await calibrate(plan, scriptedTransport(() => 0.001), 600)).chunkSize).toBe(MAX_CHUNK_SIZE);
  });

  it('falls back to chunks of 1 when no calibration model returned', async () => {
    const c = await calibrate(plan, scriptedTransport(() => null), 2);
    expect(Number.isNaN(c.secondsPerPoint)).toBe(true);
    expect(c.chunkSize).toBe(1);
  });
});
