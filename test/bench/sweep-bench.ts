/**
 * Whole sweeps driven in this process through the orchestrator's own modules, exactly as `disksweep run`
 * chains them (spec text -> parseSpecText -> planSweep -> openStore/registerSweep -> createEmbeddedTransport
 * -> runSweep), without the CLI's calibration step (the chunk size is given) and without progress output.
 *
 * - parallel efficiency: real models on 2 threads; efficiency = (sum of results.wall_ms, each model's own
 *   time as the model measured it) / (threads x sweep wall time). The wall time runs from creating the pool
 *   (thread start-up and module loading included) to the last commit and the pool's close.
 * - no-op overhead: the same path with the no-op model (noop-model.ts) in the pool threads: points/s of the
 *   machinery alone, with the CPU time of the whole process (all threads) per point.
 */
import Database from 'better-sqlite3';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { canonicalJson, contentHash } from '../../shared/hashing.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { parseSpecText } from '../../orchestrator/spec/load-spec.js';
import { openStore } from '../../orchestrator/store/index.js';
import { planSweep } from '../../orchestrator/sweep/sweep-plan.js';
import { runSweep } from '../../orchestrator/sweep/sweep-runner.js';
import { createEmbeddedTransport } from '../../orchestrator/transport/embedded-transport.js';
import { progress, sig } from './stats.js';
import { withTempDirAsync } from './temp-files.js';

/** The compiled no-op model beside this file in dist/ (DISKSWEEP_MODEL_MODULE for pool threads). */
export const NOOP_MODEL_PATH = fileURLToPath(new URL('./noop-model.js', import.meta.url));

/** The compiled CLI in dist/, for the sections that spawn `disksweep` processes. */
export const CLI_PATH = fileURLToPath(new URL('../../orchestrator/cli/main.js', import.meta.url));

export interface SweepRun {
  readonly points: number;
  readonly committed: number;
  readonly failed: number;
  readonly chunkSize: number;
  readonly threads: number;
  readonly wallS: number;
  readonly cpuS: number;
  /** Sum of results.wall_ms over the sweep's rows, ms. */
  readonly modelMsSum: number;
  readonly statuses: Record<string, number>;
}

/** Run one spec (an object, as its YAML would hold) into a fresh database with `threads` pool threads. */
export async function runSweepInProcess(spec: Record<string, unknown>, threads: number, modelModule: string | null): Promise<SweepRun> {
  return withTempDirAsync('disksweep-bench-sweep-', async (dir) => {
    const file = join(dir, 'sweep.sqlite');
    const plan = planSweep(parseSpecText(JSON.stringify(spec), 'bench spec', 'json'));
    const chunks = plan.spec.chunks;
    if (!('size' in chunks)) throw new Error('bench specs give chunks.size (no calibration in-process)');
    const store = openStore(file, { mode: 'write' });
    const before = process.env.DISKSWEEP_MODEL_MODULE;
    try {
      store.registerSweep({
        sweepId: plan.sweepId, name: plan.spec.name, description: null, specJson: canonicalJson(plan.spec),
        specHash: contentHash(plan.spec), modelVersion: MODEL_VERSION, nPoints: plan.source.size, chunkSize: chunks.size,
      });
      const hasResult = store.pointIndexesWithResult(plan.sweepId);
      // Pool threads copy the environment when they start (in createEmbeddedTransport).
      if (modelModule === null) delete process.env.DISKSWEEP_MODEL_MODULE;
      else process.env.DISKSWEEP_MODEL_MODULE = modelModule;
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      const transport = createEmbeddedTransport({ threads });
      const counts = await runSweep({ sweepId: plan.sweepId, chunkSize: chunks.size, source: plan.source, hasResult, store, transport });
      const wallS = (performance.now() - t0) / 1000;
      const cpu = process.cpuUsage(cpu0);
      store.close();
      const raw = new Database(file, { readonly: true });
      const modelMsSum = raw.prepare('SELECT coalesce(sum(wall_ms), 0) FROM results').pluck().get() as number;
      const statuses = Object.fromEntries(
        (raw.prepare('SELECT status, count(*) FROM results GROUP BY status').raw(true).all() as [string, number][]),
      );
      raw.close();
      return {
        points: plan.source.size, committed: counts.committed, failed: counts.failed, chunkSize: chunks.size, threads,
        wallS, cpuS: (cpu.user + cpu.system) / 1e6, modelMsSum, statuses,
      };
    } finally {
      if (before === undefined) delete process.env.DISKSWEEP_MODEL_MODULE;
      else process.env.DISKSWEEP_MODEL_MODULE = before;
      if (store.isOpen) store.close();
    }
  });
}

/** 8 x 8 small real models: a ready-made disk, 100 cells, 1 Myr (tens of ms each). */
export const EFFICIENCY_SPEC = {
  name: 'bench-parallel-efficiency',
  model: { n_cells: 100, t_end_myr: 1 },
  fixed: { initial_state: 'disk' },
  vary: { m_disk_msun: { log: [0.01, 0.1], count: 8 }, alpha_active: { log: [1e-3, 3e-2], count: 8 } },
  sampling: { plan: 'grid' },
  chunks: { size: 2 },
} as const;

/**
 * Time for a fresh pool to start its threads (each loads the disk model) and run one tiny real model per
 * thread: the one-off cost inside the efficiency sweep's wall time that a long sweep amortises.
 */
export async function poolStartMs(threads: number): Promise<number> {
  const spec = { ...EFFICIENCY_SPEC, name: 'bench-pool-start', model: { n_cells: 16, t_end_myr: 0.001 } };
  const plan = planSweep(parseSpecText(JSON.stringify(spec), 'bench spec', 'json'));
  const t0 = performance.now();
  const transport = createEmbeddedTransport({ threads });
  transport.onOutcome(async () => {});
  for (let i = 0; i < threads; i++) {
    const t = plan.source.taskAt(i);
    await transport.submit({ sweep_id: plan.sweepId, chunk_index: i, points: [{ point_index: i, point_id: t.pointId, params: t.params }] });
  }
  await transport.close('graceful');
  return performance.now() - t0;
}

export interface EfficiencyReport {
  spec: typeof EFFICIENCY_SPEC;
  threads: number;
  available_parallelism: number;
  points: number;
  chunk_size: number;
  statuses: Record<string, number>;
  model_ms_sum: number;
  sweep_wall_ms: number;
  efficiency: number;
  /** A separate fresh pool's start-up plus one tiny model per thread (see poolStartMs). */
  pool_start_ms: number;
  /** The same ratio with pool_start_ms taken off the sweep wall time: the rate a long sweep settles at. */
  efficiency_after_start: number;
  /** Mean of results.wall_ms over the sweep's points. */
  mean_model_ms: number;
}

export async function benchParallelEfficiency(threads = 2): Promise<EfficiencyReport> {
  progress(`sweep_parallel_efficiency: ${threads}-thread embedded sweep of 64 real models`);
  const r = await runSweepInProcess(EFFICIENCY_SPEC, threads, null);
  const startMs = await poolStartMs(threads);
  return {
    spec: EFFICIENCY_SPEC,
    threads,
    available_parallelism: availableParallelism(),
    points: r.points,
    chunk_size: r.chunkSize,
    statuses: r.statuses,
    model_ms_sum: sig(r.modelMsSum),
    sweep_wall_ms: sig(r.wallS * 1000),
    efficiency: sig(r.modelMsSum / (threads * r.wallS * 1000), 3),
    pool_start_ms: sig(startMs, 3),
    efficiency_after_start: sig(r.modelMsSum / (threads * (r.wallS * 1000 - startMs)), 3),
    mean_model_ms: sig(r.modelMsSum / r.points),
  };
}

/** A random plan over two parameters: no-op points cost the same wherever they are. */
export function noopSpec(name: string, points: number, chunk: number | 'calibrate'): Record<string, unknown> {
  return {
    name,
    model: { n_cells: 100, t_end_myr: 1 },
    fixed: { initial_state: 'disk' },
    vary: { m_disk_msun: { log: [0.01, 0.1] }, alpha_active: { log: [1e-3, 3e-2] } },
    sampling: { plan: 'random', points, seed: 1 },
    chunks: chunk === 'calibrate' ? { target_seconds: 2 } : { size: chunk },
  };
}

export interface NoopReport {
  model: string;
  threads: number;
  points: number;
  chunk_size: number;
  statuses: Record<string, number>;
  wall_s: number;
  points_per_s: number;
  us_per_point: number;
  /** CPU time of the whole process (main thread and pool threads) per point. */
  cpu_us_per_point: number;
}

export async function benchNoopOverhead(points: number, chunk: number, threads = 2): Promise<NoopReport> {
  progress(`noop_overhead: ${points} no-op points, chunks of ${chunk}, ${threads} threads`);
  const r = await runSweepInProcess(noopSpec('bench-noop-overhead', points, chunk), threads, NOOP_MODEL_PATH);
  return {
    model: 'test/bench/noop-model.ts',
    threads,
    points: r.points,
    chunk_size: r.chunkSize,
    statuses: r.statuses,
    wall_s: sig(r.wallS, 3),
    points_per_s: sig(r.points / r.wallS),
    us_per_point: sig((1e6 * r.wallS) / r.points),
    cpu_us_per_point: sig((1e6 * r.cpuS) / r.points),
  };
}
