/**
 * `query` section of `npm run bench`: the query layer on a synthetic 10^6-point sweep database.
 *
 * The database is written through the store's own writeResults (batches of 5000): one real model result (a
 * small disk model, 2 checkpoints, 10 series samples) under 10^6 point ids, with three log-sampled parameters
 * drawn per point and t_solar_split_myr set per point so that the solar-like split passes with probability 0.9
 * inside a known box of the log parameter space and 0.1 outside. Measured, each on the open read-only store:
 *
 *   target_count_s      countTargets(solar-split): pass count and fraction only, one scan of the results
 *   target_query_s      evaluateTargets(solar-split): the recorded split time and every point's parameters and
 *                       pass flag as typed arrays, 10^6 points (goal <= 1 s)
 *   checkpoint_query_s  evaluateTargets(accretion-window at 1 Myr): one checkpoint join per point
 *   where_query_s       solar-split with a --where on a parameter and a checkpoint output
 *   marginals_s         marginal pass fractions of the three parameters
 *   prim_s              PRIM (peeling, pasting, covering 3 boxes) on the 10^6 points (goal <= 10 s)
 *   series_query_s      solar-split with other thresholds: every point's series re-evaluated (no goal)
 *
 * Times are wall seconds (the first, cold run and the median of the following ones) and process CPU seconds
 * (the wall time of a loaded shared machine can be several times the CPU time). Other sections can time
 * their own work on the same database by passing `extras` (the map of the plots layer does).
 */
import { join } from 'node:path';
import { statSync } from 'node:fs';
import { contentHash } from '../../shared/hashing.js';
import { parseModelParams } from '../../shared/model-params.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { answerQuery, primColumns } from '../../orchestrator/query/answer.js';
import { countTargets, evaluateTargets, type EvaluateRequest, type Evaluation } from '../../orchestrator/query/evaluate.js';
import { marginal } from '../../orchestrator/query/marginals.js';
import { prim } from '../../orchestrator/query/prim.js';
import { parseTarget } from '../../orchestrator/query/targets.js';
import { openStore, type StoreReader, type StoredOutcome } from '../../orchestrator/store/index.js';
import { runValidatedModel } from '../../worker/model.js';
import { median, progress, sig } from './stats.js';
import { withTempDir } from './temp-files.js';

export const QUERY_GOALS = { target_query_s_target: 1, prim_s_target: 10 } as const;

/** The synthetic sweep: three log-sampled parameters, random plan. */
const DIMS = [
  { name: 'm_disk_msun', min: 0.005, max: 0.1 },
  { name: 'alpha_active', min: 1e-4, max: 1e-1 },
  { name: 'r1_au', min: 5, max: 100 },
] as const;
/** Where the split passes with probability 0.9 (log10 bounds of the first two parameters). */
const TRUE_BOX = { m_disk_msun: [Math.log10(0.01), Math.log10(0.03)], alpha_active: [-3, -1.5] } as const;
const BATCH = 5000;

/** A deterministic uniform number in [0, 1) from an index and a stream (a 32-bit integer hash). */
function unit(i: number, stream: number): number {
  let h = Math.imul(i ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(stream + 1, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x7feb352d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x846ca68b);
  h ^= h >>> 16;
  return (h >>> 0) / 4294967296;
}

export interface SyntheticDb {
  readonly path: string;
  readonly points: number;
  readonly buildS: number;
  readonly bytes: number;
}

/** Write the synthetic sweep into `dir/query-bench.sqlite` through the store's own writer. */
export function buildSyntheticQueryDb(dir: string, points: number): SyntheticDb {
  const path = join(dir, 'query-bench.sqlite');
  const model = { n_cells: 40, t_end_myr: 1, checkpoints_myr: [0.5, 1], n_series: 10 };
  const spec = {
    name: 'bench-query', description: 'synthetic sweep for the query bench', model, fixed: { initial_state: 'disk' },
    vary: Object.fromEntries(DIMS.map((d) => [d.name, { log: [d.min, d.max] }])),
    sampling: { plan: 'random', points, seed: 1 }, chunks: { size: BATCH },
  };
  const specJson = JSON.stringify(spec);
  const sweepId = contentHash(specJson);
  // A run that reaches the split (at about 0.04 Myr), so the series re-evaluation has something to find.
  const base = parseModelParams({ ...model, initial_state: 'disk', m_disk_msun: 0.02, alpha_active: 0.05 });
  const template = runValidatedModel(base);
  const t0 = performance.now();
  const store = openStore(path, { mode: 'write' });
  try {
    store.registerSweep({ sweepId, name: spec.name, specJson, specHash: sweepId, modelVersion: MODEL_VERSION, nPoints: points, chunkSize: BATCH });
    for (let first = 0; first < points; first += BATCH) {
      const batch: StoredOutcome[] = [];
      for (let i = first; i < Math.min(points, first + BATCH); i++) {
        const params: Record<string, unknown> = { ...base };
        const logs = DIMS.map((d, k) => {
          const u = Math.log10(d.min) + unit(i, k) * (Math.log10(d.max) - Math.log10(d.min));
          params[d.name] = 10 ** u;
          return u;
        });
        const inside = logs[0] >= TRUE_BOX.m_disk_msun[0] && logs[0] <= TRUE_BOX.m_disk_msun[1] && logs[1] >= TRUE_BOX.alpha_active[0] && logs[1] <= TRUE_BOX.alpha_active[1];
        const passes = unit(i, 7) < (inside ? 0.9 : 0.1);
        const result = { ...template, scalars: { ...template.scalars, t_solar_split_myr: passes ? 0.2 + unit(i, 8) * 0.7 : null } };
        batch.push({
          sweepId, pointId: contentHash(`bench-query:${i}`).slice(0, 32), pointIndex: i, params: params as StoredOutcome['params'],
          outcome: { kind: 'model', result }, workerHost: 'bench', finishedAt: 1_700_000_000_000 + i,
        });
      }
      store.writeResults(batch);
      if ((first / BATCH) % 40 === 0) progress(`query bench: ${first + batch.length}/${points} points written`);
    }
  } finally {
    store.close();
  }
  return { path, points, buildS: (performance.now() - t0) / 1000, bytes: statSync(path).size };
}

interface Timing {
  cold_s: number;
  warm_median_s: number;
  /** Process CPU seconds of the warm runs (median): less sensitive to other load on a shared machine. */
  warm_median_cpu_s: number;
  runs: number;
}

function time<T>(label: string, runs: number, fn: () => T): { timing: Timing; last: T } {
  const wall: number[] = [];
  const cpu: number[] = [];
  let last: T | undefined;
  for (let r = 0; r < runs; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    last = fn();
    wall.push((performance.now() - t0) / 1000);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1e6);
  }
  progress(`query bench: ${label} ${wall.map((s) => s.toFixed(3)).join(', ')} s (cpu ${cpu.map((s) => s.toFixed(3)).join(', ')} s)`);
  const warm = (xs: number[]) => median(xs.length > 1 ? xs.slice(1) : xs);
  return { timing: { cold_s: sig(wall[0], 3), warm_median_s: sig(warm(wall), 3), warm_median_cpu_s: sig(warm(cpu), 3), runs }, last: last as T };
}

/** A measurement another layer adds on the same database and evaluation (e.g. the 2-D map). */
export interface QueryBenchExtra {
  readonly name: string;
  run(store: StoreReader, evaluation: Evaluation): Record<string, number | boolean | string | null>;
}

export interface QueryBenchReport {
  section: Record<string, unknown>;
  goals: Record<string, number | boolean>;
}

export function benchQuery(points = 1_000_000, extras: readonly QueryBenchExtra[] = []): QueryBenchReport {
  return withTempDir('disksweep-bench-query-', (dir) => {
    progress(`query bench: writing a synthetic ${points}-point database through the store`);
    const dbInfo = buildSyntheticQueryDb(dir, points);
    const store = openStore(dbInfo.path, { mode: 'read' });
    try {
      const request = (targets: string[], where?: string): EvaluateRequest => ({ targets: targets.map(parseTarget), where });
      const count = time('solar-split count', 4, () => countTargets(store, request(['solar-split'])));
      const target = time('solar-split', 4, () => evaluateTargets(store, request(['solar-split'])));
      const ev = target.last;
      const checkpoint = time('accretion-window', 3, () => evaluateTargets(store, request(['accretion-window(at_myr=1,min=1e-12,max=1e-6)'])));
      const where = time('solar-split --where', 3, () => evaluateTargets(store, request(['solar-split'], 'r1_au < 50 and m_star_msun@1myr > 0')));
      const marginals = time('marginals', 3, () => ev.parameters.map((_, k) => marginal(ev, k)));
      const primRun = time('PRIM', 2, () => prim(primColumns(ev), ev.pass));
      const series = time('solar-split from series', 1, () => evaluateTargets(store, request(['solar-split(f_j=0.019)'])));
      const box = answerQuery({ ...ev, parameters: ev.parameters }, { maxBoxes: 1 }).boxes[0];
      const extraResults = Object.fromEntries(extras.map((x) => [x.name, x.run(store, ev)]));
      const section = {
        what:
          `synthetic ${points}-point sweep written through store.writeResults (one real small-disk result, 2 checkpoints, 10 series samples; ` +
          '3 log parameters; split passes with p = 0.9 inside log10 m_disk in [-2, -1.52], log10 alpha in [-3, -1.5], 0.1 outside)',
        points,
        build_s: sig(dbInfo.buildS, 3),
        build_points_per_s: sig(points / dbInfo.buildS, 3),
        database_mb: sig(dbInfo.bytes / 1e6, 4),
        selected: ev.counts.selected,
        passed: ev.counts.passed,
        target_count: { ...count.timing, passed: count.last.counts.passed },
        target_query: target.timing,
        checkpoint_query: checkpoint.timing,
        where_query: { ...where.timing, selected: where.last.counts.selected },
        marginals: marginals.timing,
        prim: { ...primRun.timing, boxes: primRun.last.boxes.length, steps_first_box: primRun.last.boxes[0]?.trajectory.length ?? 0 },
        series_query: { ...series.timing, passed: series.last.counts.passed },
        best_box_log10: box === undefined ? null : box.ranges.slice(0, 2).map((r) => ({
          parameter: r.parameter.name,
          lower: r.lower === null ? null : sig(Math.log10(r.lower), 3),
          upper: r.upper === null ? null : sig(Math.log10(r.upper), 3),
        })),
        true_box_log10: [
          { parameter: 'm_disk_msun', lower: sig(TRUE_BOX.m_disk_msun[0], 3), upper: sig(TRUE_BOX.m_disk_msun[1], 3) },
          { parameter: 'alpha_active', lower: TRUE_BOX.alpha_active[0], upper: TRUE_BOX.alpha_active[1] },
        ],
        ...extraResults,
      };
      return {
        section,
        goals: {
          ...QUERY_GOALS,
          target_count_s: count.timing.warm_median_s,
          target_count_cpu_s: count.timing.warm_median_cpu_s,
          target_query_s: target.timing.warm_median_s,
          target_query_s_met: target.timing.warm_median_s <= QUERY_GOALS.target_query_s_target,
          target_query_cpu_s: target.timing.warm_median_cpu_s,
          prim_s: primRun.timing.warm_median_s,
          prim_cpu_s: primRun.timing.warm_median_cpu_s,
          prim_s_met: primRun.timing.warm_median_s <= QUERY_GOALS.prim_s_target,
        },
      };
    } finally {
      store.close();
    }
  });
}
