/**
 * The system half of `npm run bench`: the store and the sweep machinery rather than the physics.
 *
 *   sqlite_ingest              rows/s into SQLite through the store's writeResults (store-ingest.ts), for
 *                              outcomes with the default 7 checkpoints and with 2 (as the store tests' models)
 *   sweep_parallel_efficiency  a 2-thread embedded sweep of 64 real models, in this process (sweep-bench.ts)
 *   noop_overhead              points/s of spec -> points -> pool -> store with the no-op model, in this process
 *   orchestrator_rss           peak RSS of `disksweep run` (the built CLI, a child process) on 10^6 no-op
 *                              points, interrupted when its time budget is up (rss-bench.ts)
 *
 * Goals are reported as met (true), missed (false), or not decided by this run (null).
 */
import { benchOrchestratorRss, type RssReport } from './rss-bench.js';
import { benchIngest, type IngestReport } from './store-ingest.js';
import { benchNoopOverhead, benchParallelEfficiency, type EfficiencyReport, type NoopReport } from './sweep-bench.js';

export const SYSTEM_GOALS = {
  sweep_parallel_efficiency_target: 0.95,
  sqlite_ingest_rows_per_s_target: 100_000,
  orchestrator_rss_mb_target: 300,
} as const;

/** How long the 10^6-point run may take before it is interrupted (the whole bench should stay near 3 min). */
const RSS_BUDGET_MS = 40_000;

export interface SystemReport {
  sections: {
    sqlite_ingest: { what: string; default_checkpoints: IngestReport; two_checkpoints: IngestReport };
    sweep_parallel_efficiency: EfficiencyReport & { how: string };
    noop_overhead: NoopReport & { how: string };
    orchestrator_rss: RssReport & { how: string };
  };
  goals: Record<string, number | boolean | null>;
}

export async function benchSystem(): Promise<SystemReport> {
  const ingestDefault = benchIngest('sqlite_ingest (7 checkpoints)', {
    params: { initial_state: 'disk', n_cells: 100 },
    points: 20_000,
    batch: 500,
    rounds: 3,
  });
  const ingestSmall = benchIngest('sqlite_ingest (2 checkpoints)', {
    params: { n_cells: 40, t_end_myr: 0.3 },
    points: 20_000,
    batch: 500,
    rounds: 3,
  });
  const efficiency = await benchParallelEfficiency(2);
  const noop = await benchNoopOverhead(10_000, 1000, 2);
  const rss = await benchOrchestratorRss({ points: 1_000_000, budgetMs: RSS_BUDGET_MS, workers: 2 });

  const rssOver = rss.peak_rss_mb > SYSTEM_GOALS.orchestrator_rss_mb_target;
  return {
    sections: {
      sqlite_ingest: {
        what:
          'store.writeResults of one real result under distinct random point ids, batches of 500, a fresh database per ' +
          'round; rows = points + results + checkpoint rows + series rows; rates are medians over rounds',
        default_checkpoints: ingestDefault,
        two_checkpoints: ingestSmall,
      },
      sweep_parallel_efficiency: {
        how: 'in-process: parseSpecText -> planSweep -> openStore -> createEmbeddedTransport(2) -> runSweep; wall from pool creation to close',
        ...efficiency,
      },
      noop_overhead: {
        how: 'in-process, as sweep_parallel_efficiency, with DISKSWEEP_MODEL_MODULE = dist/test/bench/noop-model.js',
        ...noop,
      },
      orchestrator_rss: {
        how: `built CLI as a child process, VmRSS/VmHWM from /proc every 250 ms; SIGINT after ${RSS_BUDGET_MS / 1000} s if not done, SIGKILL 10 s later if still running`,
        ...rss,
      },
    },
    goals: {
      ...SYSTEM_GOALS,
      sweep_parallel_efficiency: efficiency.efficiency,
      sweep_parallel_efficiency_met: efficiency.efficiency >= SYSTEM_GOALS.sweep_parallel_efficiency_target,
      sqlite_ingest_rows_per_s: ingestDefault.rows_per_s,
      sqlite_ingest_rows_per_s_met: ingestDefault.rows_per_s >= SYSTEM_GOALS.sqlite_ingest_rows_per_s_target,
      noop_points_per_s: noop.points_per_s,
      orchestrator_rss_peak_mb: rss.peak_rss_mb,
      orchestrator_rss_points_done: rss.points_done,
      // Over the limit is a miss however far it got; under it counts only for a run of all 10^6 points.
      orchestrator_rss_met: rssOver ? false : rss.finished ? true : null,
    },
  };
}
