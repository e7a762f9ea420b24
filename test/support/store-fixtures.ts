/**
 * Store test data made by the real model: small, fast runs (40 cells, 0.3 Myr) whose outcomes go into a
 * store and must come back bit for bit. Plus file fingerprints for "left untouched" checks.
 */
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { parseModelParams, type ModelParams } from '../../shared/model-params.js';
import type { ModelResult } from '../../shared/model-result.js';
import { runValidatedModel } from '../../worker/model.js';
import type { NewSweep, StoredOutcome } from '../../orchestrator/store/store-types.js';
import { openStore, type SweepStore } from '../../orchestrator/store/index.js';
import type { SweepPlan } from '../../orchestrator/sweep/sweep-plan.js';
import { canonicalJson, contentHash } from '../../shared/hashing.js';

/** Model settings small enough that one run takes milliseconds. */
export const SMALL_MODEL = { n_cells: 40, t_end_myr: 0.3 } as const;

const sha = (text: string): string => createHash('sha256').update(text).digest('hex');

export function sweepFixture(overrides: Partial<NewSweep> = {}): NewSweep {
  const spec = { name: 'test-sweep', vary: { alpha_active: { log: [1e-3, 1e-1], count: 4 } } };
  const specJson = JSON.stringify(spec);
  return {
    sweepId: sha(`sweep:${specJson}`),
    name: 'test-sweep',
    description: 'a sweep made by the store tests',
    specJson,
    specHash: sha(specJson),
    modelVersion: MODEL_VERSION,
    nPoints: 500,
    chunkSize: 8,
    ...overrides,
  };
}

export interface ModelRun {
  readonly params: ModelParams;
  readonly pointId: string;
  readonly result: ModelResult;
}

const runs = new Map<string, ModelRun>();

/** Run (once per parameter set, cached) a real model and give its point id and result. */
export function modelRun(raw: Record<string, unknown>): ModelRun {
  const key = JSON.stringify(raw);
  const hit = runs.get(key);
  if (hit !== undefined) return hit;
  const params = parseModelParams({ ...SMALL_MODEL, ...raw });
  const run = { params, pointId: sha(JSON.stringify({ MODEL_VERSION, params })).slice(0, 32), result: runValidatedModel(params) };
  runs.set(key, run);
  return run;
}

export function modelOutcome(sweepId: string, pointIndex: number, run: ModelRun, extra: Partial<StoredOutcome> = {}): StoredOutcome {
  return {
    sweepId,
    pointId: run.pointId,
    pointIndex,
    params: run.params,
    outcome: { kind: 'model', result: run.result },
    workerHost: 'worker-a',
    finishedAt: 1_700_000_000_000 + pointIndex * 1000,
    ...extra,
  };
}

export function infrastructureOutcome(sweepId: string, pointIndex: number, run: ModelRun, reason: string): StoredOutcome {
  return modelOutcome(sweepId, pointIndex, run, { outcome: { kind: 'infrastructure', reason }, workerHost: 'worker-b' });
}

/** `count` outcomes that reuse one real result under distinct point ids (for batches of a few hundred). */
export function manyOutcomes(sweepId: string, run: ModelRun, count: number, firstIndex = 0): StoredOutcome[] {
  return Array.from({ length: count }, (_, k) =>
    modelOutcome(sweepId, firstIndex + k, { ...run, pointId: sha(`${run.pointId}:${firstIndex + k}`).slice(0, 32) }),
  );
}

export function sha256File(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** Names, sizes and hashes of every file in a directory: equal snapshots mean nothing was written. */
export function dirSnapshot(dir: string): Record<string, string> {
  return Object.fromEntries(
    readdirSync(dir)
      .sort()
      .map((name) => {
        const path = join(dir, name);
        return [name, `${statSync(path).size}:${sha256File(path)}`];
      }),
  );
}

/** A write store at `file` with the planned sweep registered (its spec stored as canonical JSON). */
export function storeWithPlan(file: string, plan: SweepPlan, chunkSize: number): SweepStore {
  const store = openStore(file, { mode: 'write' });
  store.registerSweep({
    sweepId: plan.sweepId, name: plan.spec.name, specJson: canonicalJson(plan.spec), specHash: contentHash(plan.spec),
    modelVersion: MODEL_VERSION, nPoints: plan.source.size, chunkSize,
  });
  return store;
}
