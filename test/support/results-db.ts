/**
 * A results database made in-process for the read-side tests (show, export, map, report): a spec is planned
 * the way `run` plans it, every point is run by the real model (settings small enough for milliseconds per
 * model), and the outcomes are written through the store. The sweep's stored name can be overridden, e.g.
 * with markup that a spec file would refuse but a database might still hold.
 */
import { MODEL_VERSION } from '../../shared/model-version.js';
import { contentHash } from '../../shared/hashing.js';
import { parseSpecText } from '../../orchestrator/spec/load-spec.js';
import { openStore, type StoredOutcome } from '../../orchestrator/store/index.js';
import { planSweep, storedSpecJson } from '../../orchestrator/sweep/sweep-plan.js';
import { runValidatedModel } from '../../worker/model.js';
import type { SpecObject } from './sweep-specs.js';

/** Disks over 3 Myr with a fixed active column (so some have dead zones): ~30 ms per model. */
export const SMALL_DISK_SPEC = (name: string, mCount = 4, aCount = 4): SpecObject => ({
  name,
  description: 'Disks of the invented Wren Hollow cluster (OSPREY survey), a small test grid',
  model: { n_cells: 40, t_end_myr: 3, checkpoints_myr: [0.1, 0.3, 1, 2, 3], n_series: 40 },
  fixed: { initial_state: 'disk', active_layer: 'fixed_column', alpha_dead: 1e-5 },
  vary: {
    m_disk_msun: { log: [0.003, 0.1], count: mCount },
    alpha_active: { log: [1e-3, 1e-1], count: aCount },
  },
  sampling: { plan: 'grid' },
  chunks: { size: 8 },
});

export interface ResultsDb {
  readonly sweepId: string;
  readonly pointIds: readonly string[];
  readonly outcomes: readonly StoredOutcome[];
}

/** Plan `spec`, run its points (all, or the first `limit`), store them in `file` (created if absent). */
export function writeResultsDb(file: string, spec: SpecObject, options: { storedName?: string; limit?: number } = {}): ResultsDb {
  const plan = planSweep(parseSpecText(JSON.stringify(spec), 'test spec', 'json'));
  const n = Math.min(plan.source.size, options.limit ?? plan.source.size);
  const outcomes: StoredOutcome[] = [];
  for (let i = 0; i < n; i++) {
    const task = plan.source.taskAt(i);
    outcomes.push({
      sweepId: plan.sweepId,
      pointId: task.pointId,
      pointIndex: i,
      params: task.params,
      outcome: { kind: 'model', result: runValidatedModel(task.params) },
      workerHost: 'test-host',
      finishedAt: 1_700_000_000_000 + i,
    });
  }
  const store = openStore(file, { mode: 'write' });
  try {
    const specJson = storedSpecJson(plan.spec);
    store.registerSweep({
      sweepId: plan.sweepId, name: options.storedName ?? plan.spec.name, description: plan.spec.description ?? null, specJson,
      specHash: contentHash(plan.spec), modelVersion: MODEL_VERSION, nPoints: plan.source.size, chunkSize: 8,
    });
    store.writeResults(outcomes);
  } finally {
    store.close();
  }
  return { sweepId: plan.sweepId, pointIds: outcomes.map((o) => o.pointId), outcomes };
}
