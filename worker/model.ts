/**
 * One model run: `runModel(params) → ModelResult`, a pure, deterministic function of the parameters and the
 * model version (the wall-clock time sits apart in `timing`). It validates, sets up the integrator, observes
 * it at checkpoints and series samples, and converts what it saw to the user-facing units of the registry.
 */
import { MODEL_VERSION } from '../shared/model-version.js';
import { parseModelParams, type ModelParams } from '../shared/model-params.js';
import {
  encodeSeries,
  type CheckpointRecord,
  type ModelResult,
  type ModelStatus,
  type ScalarRecord,
} from '../shared/model-result.js';
import { AU_CGS, G_CGS, L_SUN_CGS } from '../shared/constants.js';
import { cmToAu, gToMsun, gsToMsunYr, msunToG, msunYrToGs, sToMyr } from '../shared/units.js';
import { massRadii } from './kernels/disk/disk-diagnostics.js';
import { angularMomentumRemoved, budgetErrors, type DiskState } from './kernels/disk/disk-state.js';
import { evolveDisk } from './kernels/disk/evolve.js';
import type { DiskGrid } from './kernels/disk/grid.js';
import { SOUND_SPEED2_PER_K } from './kernels/disk/thermal-structure.js';
import { deadZoneSummary } from './kernels/ionization/dead-zone.js';
import { MDOT_AVERAGE_WINDOW_S, setupModel } from './model-setup.js';
import { OutburstTracker } from './outburst-tracker.js';

/** A budget that does not close to this is a bug or a broken step, not round-off. */
export const BUDGET_TOLERANCE = 1e-8;
/** Above this disk-to-star mass ratio the model's Keplerian, non-self-gravitating picture is questionable. */
export const MASSIVE_DISK_RATIO = 0.3;
/** An accretion outburst: Ṁ_* above this many times its mean over the preceding 1e4 yr. */
export const OUTBURST_FACTOR = 10;

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);
const massShare = (s: DiskState): number => s.mStar / (s.mStar + s.mDisk);
const spinShare = (s: DiskState): number => s.jSpin / (s.jSpin + s.jDisk);
const massToStar = (s: DiskState): number => s.budget.massAccreted + s.budget.massInfallStar;

/** Run one model from raw (unvalidated) parameters. Throws DisksweepError for bad input. */
export function runModel(raw: unknown): ModelResult {
  const params = parseModelParams(raw);
  return runValidatedModel(params);
}

export function runValidatedModel(p: ModelParams): ModelResult {
  const started = performance.now();
  const setup = setupModel(p);
  const { evolve, checkpointTimes, averageStartTimes, seriesTimes } = setup;
  const tInfallEnd = evolve.infall === null ? null : Math.min(evolve.infall.tEnd, evolve.tEnd);
  const checkpoints: CheckpointRecord[] = [];
  const seriesRows: number[][] = [];
  const averageStartMass = new Map<number, number>();
  let tSplit: number | null = null;
  let tDiskEnd: number | null = null;
  let cavityOpen: { t: number; radius: number } | null = null;
  let qMinRun = Infinity;
  let maxRatio = 0;
  let fragmentation = false;
  const outbursts = new OutburstTracker(MDOT_AVERAGE_WINDOW_S, OUTBURST_FACTOR);
  const cell1au = cellHolding(evolve.grid, AU_CGS);
  const diskEndMass = msunToG(p.disk_end_mass_msun);
  const diskEndMdot = msunYrToGs(p.disk_end_mdot_msun_yr);

  const outcome = evolveDisk(evolve, {
    onStep(s) {
      outbursts.observe(s.t, massToStar(s), s.mdotStar);
      if (s.transport.qMin < qMinRun) qMinRun = s.transport.qMin;
      if (s.transport.fragmenting) fragmentation = true;
      const ratio = s.mDisk / s.mStar;
      if (ratio > maxRatio) maxRatio = ratio;
      const afterInfall = tInfallEnd === null || s.t >= tInfallEnd;
      if (tSplit === null && afterInfall && massShare(s) >= p.f_mass_star && spinShare(s) <= p.f_j_disk_max) tSplit = s.t;
      if (tDiskEnd === null && afterInfall && (s.mDisk < diskEndMass || s.mdotStar < diskEndMdot)) tDiskEnd = s.t;
      if (cavityOpen === null && afterInfall && s.cavity.open) cavityOpen = { t: s.t, radius: s.cavity.radius };
    },
    onEvent(s) {
      if (averageStartTimes.includes(s.t)) averageStartMass.set(s.t, massToStar(s));
      const k = checkpointTimes.indexOf(s.t);
      if (k >= 0) {
        const avgStart = averageStartTimes[k];
        checkpoints.push(checkpointRecord(evolve.grid, s, avgStart, averageStartMass.get(avgStart) ?? 0, cell1au, p.alpha_active));
      }
      if (seriesTimes.includes(s.t)) {
        seriesRows.push([sToMyr(s.t), gToMsun(s.mStar), gToMsun(s.mDisk), gsToMsunYr(s.mdotStar), massShare(s), spinShare(s)]);
      }
    },
  });

  const s = outcome.state;
  const errors = budgetErrors(s);
  let status: ModelStatus = outcome.status;
  let reason = outcome.reason;
  if (status === 'ok' && (errors.mass > BUDGET_TOLERANCE || errors.angularMomentum > BUDGET_TOLERANCE)) {
    status = 'budget_error';
    reason = `budgets do not close: mass ${errors.mass.toExponential(2)}, angular momentum ${errors.angularMomentum.toExponential(2)}`;
  }
  const b = s.budget;
  const split = tSplit as number | null;
  const diskEnd = tDiskEnd as number | null;
  const cavity = cavityOpen as { t: number; radius: number } | null;
  const bursts = outbursts.result();
  const scalars: ScalarRecord = {
    t_infall_end_myr: tInfallEnd === null ? null : sToMyr(tInfallEnd),
    t_solar_split_myr: split === null ? null : sToMyr(split),
    t_solar_split_after_infall_myr: split === null ? null : sToMyr(split - (tInfallEnd ?? 0)),
    m_star_end_msun: gToMsun(s.mStar),
    m_disk_end_msun: gToMsun(s.mDisk),
    star_mass_share_end: massShare(s),
    spin_j_share_end: spinShare(s),
    q_min_run: finiteOrNull(qMinRun),
    max_disk_star_ratio: maxRatio,
    flag_massive_disk: maxRatio > MASSIVE_DISK_RATIO,
    flag_fragmentation: fragmentation,
    m_infall_msun: gToMsun(b.massInfallDisk + b.massInfallStar),
    m_accreted_msun: gToMsun(b.massAccreted),
    m_lost_msun: gToMsun(b.massLost),
    j_infall_g_cm2_s: b.jInfallDisk + b.jInfallStar,
    j_accreted_g_cm2_s: b.jAccreted,
    j_lost_g_cm2_s: b.jLost,
    j_rescale_g_cm2_s: b.jRescale,
    j_removed_g_cm2_s: angularMomentumRemoved(s),
    mass_budget_rel_err: errors.mass,
    j_budget_rel_err: errors.angularMomentum,
    n_outbursts: bursts.count,
    m_outbursts_msun: gToMsun(bursts.mass),
    t_first_outburst_myr: bursts.firstStart === null ? null : sToMyr(bursts.firstStart),
    disk_lifetime_myr: diskEnd === null ? null : sToMyr(diskEnd),
    disk_lifetime_after_infall_myr: diskEnd === null ? null : sToMyr(diskEnd - (tInfallEnd ?? 0)),
    t_cavity_open_myr: cavity === null ? null : sToMyr(cavity.t),
    r_cavity_open_au: cavity === null ? null : cmToAu(cavity.radius),
    m_wind_msun: gToMsun(b.massWind),
    m_wind_xray_msun: gToMsun(b.massWindXray),
    m_wind_euv_msun: gToMsun(b.massWindEuv),
    m_wind_fuv_msun: gToMsun(b.massWindFuv),
    j_wind_g_cm2_s: b.jWind,
  };
  return {
    model_version: MODEL_VERSION,
    status,
    status_reason: reason,
    scalars,
    checkpoints,
    series: encodeSeries(seriesRows),
    timing: { wall_ms: performance.now() - started, steps: s.steps, rejected_steps: s.rejectedSteps },
  };
}

/** Index of the cell whose edges enclose radius r (cm), or -1 off the grid. */
function cellHolding(grid: DiskGrid, r: number): number {
  for (let i = 0; i < grid.n; i++) if (grid.edges[i] <= r && r < grid.edges[i + 1]) return i;
  return -1;
}

/**
 * Share of the local accretion flow carried by the active layers in cell i: in a steady disk Ṁ = 3πνΣ, and
 * νΣ splits into α_active Σ_a (active layers) + the rest (dead part, α_GI), all with the same c_s²/Ω; so the
 * share is α_active Σ_a / (α_eff Σ), with α_eff = νΩ/c_s² the α the transport used.
 */
function activeShare(grid: DiskGrid, s: DiskState, i: number, alphaActive: number): number | null {
  if (i < 0 || !(s.sigma[i] > 0)) return null;
  const omega = Math.sqrt((G_CGS * s.mStar) / grid.centers[i] ** 3);
  const alphaEff = (s.nu[i] * omega) / (SOUND_SPEED2_PER_K * s.temperature[i]);
  return Math.min(1, (alphaActive * s.sigmaActive[i]) / (alphaEff * s.sigma[i]));
}

function checkpointRecord(
  grid: DiskGrid,
  s: DiskState,
  averageStart: number,
  massAtAverageStart: number,
  cell1au: number,
  alphaActive: number,
): CheckpointRecord {
  const [r50, r68, r90] = massRadii(grid, s.sigma, [0.5, 0.68, 0.9]);
  const window = s.t - averageStart;
  const dead = deadZoneSummary(grid, s.sigma, s.sigmaActive);
  return {
    t_myr: sToMyr(s.t),
    m_star_msun: gToMsun(s.mStar),
    m_disk_msun: gToMsun(s.mDisk),
    mdot_star_msun_yr: gsToMsunYr(s.mdotStar),
    mdot_star_avg_msun_yr: gsToMsunYr(window > 0 ? (massToStar(s) - massAtAverageStart) / window : s.mdotStar),
    j_disk_g_cm2_s: s.jDisk,
    j_spin_g_cm2_s: s.jSpin,
    j_removed_g_cm2_s: angularMomentumRemoved(s),
    j_lost_g_cm2_s: s.budget.jLost,
    star_mass_share: massShare(s),
    spin_j_share: spinShare(s),
    r50_au: finiteOrNull(cmToAu(r50)),
    r68_au: finiteOrNull(cmToAu(r68)),
    r90_au: finiteOrNull(cmToAu(r90)),
    q_min: finiteOrNull(s.transport.qMin),
    n_dead_bands: dead.bands,
    r_dead_in_au: finiteOrNull(cmToAu(dead.innerEdge)),
    r_dead_out_au: finiteOrNull(cmToAu(dead.outerEdge)),
    m_dead_msun: gToMsun(dead.deadMass),
    sigma_active_1au_g_cm2: cell1au < 0 ? null : s.sigmaActive[cell1au],
    l_star_lsun: s.lStar / L_SUN_CGS,
    l_acc_lsun: s.lAcc / L_SUN_CGS,
    m_wind_msun: gToMsun(s.budget.massWind),
    mdot_wind_msun_yr: gsToMsunYr(s.mdotWind),
    r_cavity_au: s.cavity.open ? cmToAu(s.cavity.radius) : null,
    active_share_1au: activeShare(grid, s, cell1au, alphaActive),
  };
}
