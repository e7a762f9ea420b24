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

/** Run every point of `spec` and store it in a new database `dir/file`; returns the path and the sweep id. */
export function buildQueryDb(dir: string, spec: SpecObject, file = 'query.sqlite'): { path: string; sweepId: string } {
  const plan = planSweep(parseSpecText(JSON.stringify(spec), 'test spec', 'json'));
  const path = join(dir, file);
  const store = openStore(path, { mode: 'write' });
  try {
    const specJson = storedSpecJson(plan.spec);
    store.registerSweep({
      sweepId: plan.sweepId, name: plan.spec.name, specJson, specHash: contentHash(specJson), modelVersion: MODEL_VERSION,
      nPoints: plan.source.size, chunkSize: 3,
    });
    const outcomes: StoredOutcome[] = [];
    for (let i = 0; i < plan.source.size; i++) {
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
  return { path, sweepId: plan.sweepId };
}
