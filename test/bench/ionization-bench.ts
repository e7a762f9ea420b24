/**
 * The ionization part of `npm run bench`:
 * - share: the fraction of a model's wall time spent in the ionization Σ_a provider (and the quiescent
 *   temperature its thermal switch reads). Measured by replay, not
 *   by timers around 10^5 tiny calls: the run is repeated with a provider that returns the recorded Σ_a values
 *   in call order (the same trajectory, bit for bit, at no cost), and share = 1 − t_replay / t_real.
 * - refresh accuracy: every checkpoint output of a run with the default refresh tolerance against the same run
 *   re-evaluating every cell at every pass (ion_refresh_tol = 0); the goal is < 1 % (our own accuracy
 *   target for a cache that skips work: common practice, no source). Differences are
 *   relative to the output itself, except for angular momenta (g cm^2 s^-1), whose scale is at least J_disk of
 *   the checkpoint: the J carried out through R_out = 1000 AU is ~1e-9 of J_disk early on, and its own relative
 *   change says nothing about the model.
 */
import { parseModelParams } from '../../shared/model-params.js';
import { CHECKPOINT_OUTPUTS } from '../../shared/model-outputs.js';
import type { ActiveColumn, ActiveLayerInput } from '../../worker/kernels/disk/active-layer.js';
import { evolveDisk, type EvolveSetup } from '../../worker/kernels/disk/evolve.js';
import { runModel } from '../../worker/model.js';
import { setupModel } from '../../worker/model-setup.js';
import { median, progress, sig } from './stats.js';

export interface IonizationShare {
  params: Record<string, unknown>;
  status: string;
  steps: number;
  provider_calls: number;
  kernel_refreshes: number;
  median_ms_real: number;
  median_ms_replay: number;
  ionization_share: number;
  runs: number;
}

function withProvider(setup: EvolveSetup, activeColumn: ActiveColumn): EvolveSetup {
  return { ...setup, transport: { ...setup.transport, activeColumn } };
}

export function benchIonizationShare(params: Record<string, unknown>, runs: number): IonizationShare {
  const setup = setupModel(parseModelParams(params)).evolve;
  const real = setup.transport.activeColumn;
  const recorded: number[] = [];
  // The recorder asks for the quiescent temperature like the real provider (same trajectory); the replay does
  // not, so the share includes the work of the quiescent-temperature switch done on the provider's behalf.
  const recorder = Object.assign((cell: ActiveLayerInput): number => {
    const v = real(cell);
    recorded.push(v);
    return v;
  }, { reset: () => real.reset?.(), quiescentFrom: real.quiescentFrom });
  const reference = evolveDisk(withProvider(setup, recorder));
  let k = 0;
  const replay = Object.assign((): number => recorded[k++], { reset: () => { k = 0; } });
  const replaySetup = withProvider(setup, replay);
  const check = evolveDisk(replaySetup);
  if (check.state.steps !== reference.state.steps || k !== recorded.length) {
    throw new Error(`ionization replay diverged: ${check.state.steps} vs ${reference.state.steps} steps, ${k} of ${recorded.length} values`);
  }
  const tReal: number[] = [];
  const tReplay: number[] = [];
  for (let r = 0; r < runs; r++) {
    // Alternate, so a load spike on a shared machine hits both alike.
    let t = performance.now();
    evolveDisk(setup);
    tReal.push(performance.now() - t);
    t = performance.now();
    evolveDisk(replaySetup);
    tReplay.push(performance.now() - t);
  }
  const real50 = median(tReal);
  const replay50 = median(tReplay);
  const stats = (real as ActiveColumn & { stats?: { calls: number; refreshes: number } }).stats;
  progress(`ionization share: ${params.active_layer} ${JSON.stringify(params)}: ${sig(real50)} ms real, ${sig(replay50)} ms replayed`);
  return {
    params,
    status: reference.status,
    steps: reference.state.steps,
    provider_calls: stats?.calls ?? recorded.length,
    kernel_refreshes: stats?.refreshes ?? 0,
    median_ms_real: sig(real50),
    median_ms_replay: sig(replay50),
    ionization_share: sig(Math.max(0, 1 - replay50 / real50), 3),
    runs,
  };
}

export interface RefreshAccuracy {
  params: Record<string, unknown>;
  tolerance: number;
  status_default: string;
  status_every_step: string;
  steps_default: number;
  steps_every_step: number;
  /** Largest |a − b| / scale over every numeric checkpoint output and checkpoint (scale: see the header). */
  max_rel_diff: number;
  /** The five largest, per output. */
  worst_by_output: Record<string, number>;
  worst_output: string | null;
  worst_t_myr: number | null;
  /** Outputs whose null-ness differs (a dead zone appearing in one run only), listed. */
  null_mismatches: string[];
  goal_rel_diff: number;
  goal_met: boolean;
}

export function benchRefreshAccuracy(params: Record<string, unknown>): RefreshAccuracy {
  const base = parseModelParams(params);
  const a = runModel(params);
  const b = runModel({ ...params, ion_refresh_tol: 0 });
  let worst = 0;
  let worstOutput: string | null = null;
  let worstT: number | null = null;
  const nullMismatches: string[] = [];
  const byOutput = new Map<string, number>();
  a.checkpoints.forEach((ca, k) => {
    const cb = b.checkpoints[k];
    for (const d of CHECKPOINT_OUTPUTS) {
      const va = ca[d.name];
      const vb = cb?.[d.name];
      if (va === null || vb === null || vb === undefined) {
        if ((va === null) !== (vb === null)) nullMismatches.push(`${d.name}@${ca.t_myr}`);
        continue;
      }
      const jDisk = d.unit === 'g cm^2 s^-1' ? Math.abs(ca.j_disk_g_cm2_s ?? 0) : 0;
      const scale = Math.max(Math.abs(va), Math.abs(vb), jDisk);
      const diff = scale > 0 ? Math.abs(va - vb) / scale : 0;
      byOutput.set(d.name, Math.max(byOutput.get(d.name) ?? 0, diff));
      if (diff > worst) [worst, worstOutput, worstT] = [diff, d.name, ca.t_myr];
    }
  });
  progress(`refresh accuracy (tol ${base.ion_refresh_tol} vs 0): max relative difference ${sig(worst, 3)} in ${worstOutput}`);
  return {
    params,
    tolerance: base.ion_refresh_tol,
    status_default: a.status,
    status_every_step: b.status,
    steps_default: a.timing.steps,
    steps_every_step: b.timing.steps,
    max_rel_diff: sig(worst, 3),
    worst_by_output: Object.fromEntries([...byOutput].sort((x, y) => y[1] - x[1]).slice(0, 5).map(([n, v]) => [n, sig(v, 3)])),
    worst_output: worstOutput,
    worst_t_myr: worstT,
    null_mismatches: nullMismatches,
    goal_rel_diff: 0.01,
    goal_met: worst < 0.01 && nullMismatches.length === 0,
  };
}
