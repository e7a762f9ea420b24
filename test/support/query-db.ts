/**
 * Sweep databases for the query tests, made in this process the way `disksweep run` makes them: the spec is
 * validated and expanded by the sweep planner, every point runs the real model, and the outcomes go through
 * the store's own writer. Small disk models (40 cells, 1 Myr) so a 3 x 3 grid takes a second or two.
 */
import { join } from 'node:path';
import { contentHash } from '../../shared/hashing.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { parseSpecText } from '../../orchestrator/spec/load-spec.js';
import { openStore, type StoredOutcome } from '../../orchestrator/store/index.js';
import { planSweep, storedSpecJson } from '../../orchestrator/sweep/sweep-plan.js';
import { runValidatedModel } from '../../worker/model.js';
import type { SpecObject } from './sweep-specs.js';

/**
 * A 3 x 3 grid of ready-made disks over disk mass and alpha_active that drain within 1 Myr: some reach the
 * solar-like split early, some late, some never (too little angular momentum left in the disk).
 */
export function splitGridSpec(name = 'heron-reach-split'): SpecObject {
  return {
    name,
    description: 'Heron Reach disks (invented): which reach the solar-like split within 1 Myr',
    model: { n_cells: 40, t_end_myr: 1, checkpoints_myr: [0.1, 0.5, 1], n_series: 30 },
    fixed: { initial_state: 'disk' },
    vary: { m_disk_msun: { log: [0.01, 0.05], count: 3 }, alpha_active: { log: [3e-3, 0.1], count: 3 } },
    sampling: { plan: 'grid' },
    chunks: { size: 3 },
  };
}

/**
 * Disks over 3 Myr with a fixed active column, so some have dead zones (Wren Hollow, an invented cluster):
 * ~30 ms per model; a mix of runs that reach the solar-like split and runs that do not.
 */
export function deadZoneGridSpec(name = 'wren-hollow', mCount = 4, aCount = 4): SpecObject {
  return {
    name,
    description: 'Disks of the invented Wren Hollow cluster (OSPREY survey), a small test grid',
    model: { n_cells: 40, t_end_myr: 3, checkpoints_myr: [0.1, 0.3, 1, 2, 3], n_series: 40 },
    fixed: { initial_state: 'disk', active_layer: 'fixed_column', alpha_dead: 1e-5 },
    vary: { m_disk_msun: { log: [0.003, 0.1], count: mCount }, alpha_active: { log: [1e-3, 1e-1], count: aCount } },
    sampling: { plan: 'grid' },
    chunks: { size: 8 },
  };
}

export interface QueryDbOptions {
  /** Store the sweep under this name instead of the spec's (e.g. markup a spec file would refuse). */
  readonly storedName?: string;
  /** Run and store only the first `limit` points. */
  readonly limit?: number;
}

export interface QueryDb {
  readonly path: string;
  readonly sweepId: string;
  /** What was written, in point order. */
  readonly outcomes: readonly StoredOutcome[];
  readonly pointIds: readonly string[];
}

/** Run the points of `spec` and store them in the database `dir/file` (created if absent). */
export function buildQueryDb(dir: string, spec: SpecObject, file = 'query.sqlite', options: QueryDbOptions = {}): QueryDb {
  const plan = planSweep(parseSpecText(JSON.stringify(spec), 'test spec', 'json'));
  const path = join(dir, file);
  const outcomes: StoredOutcome[] = [];
  const store = openStore(path, { mode: 'write' });
  try {
    const specJson = storedSpecJson(plan.spec);
    store.registerSweep({
      sweepId: plan.sweepId, name: options.storedName ?? plan.spec.name, specJson, specHash: contentHash(specJson), modelVersion: MODEL_VERSION,
      nPoints: plan.source.size, chunkSize: 3,
    });
    for (let i = 0; i < Math.min(plan.source.size, options.limit ?? plan.source.size); i++) {
      const task = plan.source.taskAt(i);
      outcomes.push({
        sweepId: plan.sweepId, pointId: task.pointId, pointIndex: i, params: task.params,
        outcome: { kind: 'model', result: runValidatedModel(task.params) }, workerHost: 'test-host', finishedAt: 1_700_000_000_000 + i,
      });
    }
    store.writeResults(outcomes);
  } finally {
    store.close();
  }
  return { path, sweepId: plan.sweepId, outcomes, pointIds: outcomes.map((o) => o.pointId) };
}
