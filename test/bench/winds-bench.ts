/**
 * The winds part of `npm run bench`: what the photoevaporation modules cost per model.
 *
 * The wind work of a step is timed on the model's own states: the default model is run once and its state is
 * copied at every series sample; then, on each copy, one step's worth of wind work is repeated many times
 * (rates of the wind models, the inner-cavity search, the predictor solve without winds, the sink coefficients
 * and the read-back of what was removed). Per model: that cost per step times the model's steps (the rates and
 * the cavity once per accepted step, the rest once per attempt). The share is that over the model's median wall
 * time. The same models without winds are timed beside them (their trajectories differ, so this is context,
 * not the measure).
 */
import { G_CGS } from '../../shared/constants.js';
import { parseModelParams } from '../../shared/model-params.js';
import { evolveDisk } from '../../worker/kernels/disk/evolve.js';
import { makeTransportWorkspace, viscousStep } from '../../worker/kernels/disk/viscous-transport.js';
import { findInnerCavity, type InnerCavity } from '../../worker/kernels/disk/winds/inner-cavity.js';
import {
  cavityCheckRadius,
  computeWindRates,
  fillSinkDt,
  makeWindWorkspace,
  windRemoval,
} from '../../worker/kernels/disk/winds/wind-sink.js';
import { setupModel } from '../../worker/model-setup.js';
import { benchModel, type ModelBenchResult } from './model-bench.js';
import { median, progress, sig } from './stats.js';

interface Snapshot {
  sigma: Float64Array;
  nu: Float64Array;
  temperature: Float64Array;
  mStar: number;
  cavity: InnerCavity;
  dt: number;
}

export interface WindCost {
  params: Record<string, unknown>;
  model: ModelBenchResult;
  without_winds: ModelBenchResult;
  /** Wind work of one accepted step (rates + cavity) and of one attempt (predictor, coefficients, read-back), µs. */
  us_per_step_rates_and_cavity: number;
  us_per_attempt_sink: number;
  wind_ms_per_model: number;
  wind_share: number;
  snapshots: number;
}

export function benchWinds(label: string, params: Record<string, unknown>, reps: number): WindCost {
  const setup = setupModel(parseModelParams(params)).evolve;
  const winds = setup.winds ?? null;
  if (winds === null) throw new Error(`${label}: no wind is on`);
  const { grid } = setup;
  const snapshots: Snapshot[] = [];
  let last = 0;
  evolveDisk(setup, {
    onEvent(s) {
      snapshots.push({
        sigma: Float64Array.from(s.sigma), nu: Float64Array.from(s.nu), temperature: Float64Array.from(s.temperature),
        mStar: s.mStar, cavity: s.cavity, dt: Math.max(s.t - last, 1e7),
      });
      last = s.t;
    },
  });
  const ws = makeWindWorkspace(grid);
  const tws = makeTransportWorkspace(grid.n);
  const out = new Float64Array(grid.n);
  const omega = new Float64Array(grid.n);
  const ratesUs: number[] = [];
  const sinkUs: number[] = [];
  for (const snap of snapshots) {
    for (let i = 0; i < grid.n; i++) omega[i] = Math.sqrt((G_CGS * snap.mStar) / grid.centers[i] ** 3);
    const check = cavityCheckRadius(winds, snap.mStar) ?? grid.edges[0];
    let t = performance.now();
    for (let r = 0; r < reps; r++) {
      computeWindRates(winds, grid, snap.sigma, snap.mStar, snap.cavity, ws);
      findInnerCavity(grid, snap.sigma, snap.temperature, omega, winds.cavityColumn, check);
    }
    ratesUs.push(((performance.now() - t) * 1000) / reps);
    const input = {
      grid, sigma: snap.sigma, nuExplicit: snap.nu, nuImplicit: snap.nu, massSource: null, dt: snap.dt, theta: 1,
      inner: null, outer: null,
    };
    t = performance.now();
    for (let r = 0; r < reps; r++) {
      viscousStep(input, tws, out);
      fillSinkDt(winds, grid, out, snap.dt, ws);
      windRemoval(winds, grid, out, ws);
    }
    sinkUs.push(((performance.now() - t) * 1000) / reps);
  }
  const model = benchModel(label, params, { warmupRuns: 5, warmupMs: 1000, runs: 15 });
  const without = benchModel(`${label}_without_winds`, { ...params, xray_wind_scale: 0, euv_wind_scale: 0, fuv_wind_mdot_msun_yr: 0 }, {
    warmupRuns: 5, warmupMs: 1000, runs: 15,
  });
  const perStep = median(ratesUs);
  const perAttempt = median(sinkUs);
  const windMs = (perStep * model.steps_per_model + perAttempt * (model.steps_per_model + model.rejected_steps_per_model)) / 1000;
  progress(`${label}: wind work ${sig(windMs, 3)} ms of ${model.median_ms} ms per model`);
  return {
    params,
    model,
    without_winds: without,
    us_per_step_rates_and_cavity: sig(perStep, 3),
    us_per_attempt_sink: sig(perAttempt, 3),
    wind_ms_per_model: sig(windMs, 3),
    wind_share: sig(windMs / model.median_ms, 3),
    snapshots: snapshots.length,
  };
}
