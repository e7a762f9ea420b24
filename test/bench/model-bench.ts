/**
 * Wall time of whole model runs (`runModel`, validation of the parameters included), single-threaded:
 * warm-up runs until the JIT has settled, then repeated timed runs; the median is the figure of merit.
 */
import { runModel } from '../../worker/model.js';
import { median, progress, quantile, sig } from './stats.js';

export interface ModelBenchOptions {
  /** At least this many warm-up runs ... */
  readonly warmupRuns: number;
  /** ... and at least this much warm-up time, ms. */
  readonly warmupMs: number;
  /** Timed runs. */
  readonly runs: number;
}

export interface ModelBenchResult {
  params: Record<string, unknown>;
  status: string;
  median_ms: number;
  min_ms: number;
  p90_ms: number;
  runs: number;
  warmup_runs: number;
  models_per_s_per_core: number;
  steps_per_model: number;
  rejected_steps_per_model: number;
  /** Median model time per attempted (accepted + rejected) step, µs. */
  us_per_attempted_step: number;
  /** Wall ms of the first run in this process for these parameters (JIT still cold). */
  first_run_ms: number;
}

export function benchModel(label: string, params: Record<string, unknown>, opts: ModelBenchOptions): ModelBenchResult {
  const t0 = performance.now();
  const first = runModel(params);
  const firstMs = performance.now() - t0;
  const steps = first.timing.steps;
  const rejected = first.timing.rejected_steps;
  let warmups = 1;
  const warmStart = performance.now();
  while (warmups < opts.warmupRuns || performance.now() - warmStart < opts.warmupMs) {
    runModel(params);
    warmups++;
  }
  progress(`${label}: ${warmups} warm-up runs, status ${first.status}, ${steps} steps; timing ${opts.runs} runs`);
  const ms: number[] = [];
  for (let k = 0; k < opts.runs; k++) {
    const t = performance.now();
    const r = runModel(params);
    ms.push(performance.now() - t);
    // A model is a pure function of its parameters: the step count must not change from run to run.
    if (r.timing.steps !== steps || r.status !== first.status) {
      throw new Error(`${label}: run ${k} took ${r.timing.steps} steps (${r.status}), the first ${steps} (${first.status})`);
    }
  }
  const med = median(ms);
  return {
    params,
    status: first.status,
    median_ms: sig(med),
    min_ms: sig(Math.min(...ms)),
    p90_ms: sig(quantile(ms, 0.9)),
    runs: opts.runs,
    warmup_runs: warmups,
    models_per_s_per_core: sig(1000 / med),
    steps_per_model: steps,
    rejected_steps_per_model: rejected,
    us_per_attempted_step: sig((1000 * med) / (steps + rejected)),
    first_run_ms: sig(firstMs),
  };
}
