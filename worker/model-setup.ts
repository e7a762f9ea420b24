/**
 * From validated user-facing parameters to the cgs setup of the integrator: the one place where units are
 * converted for a model run, and where constraints that need a derived quantity are checked (the final
 * centrifugal radius of infall must sit well inside the grid).
 */
import { DisksweepError } from '../shared/errors.js';
import type { ModelParams } from '../shared/model-params.js';
import { auToCm, daysToS, lsunToErgS, msunToG, msunYrToGs, myrToS, rsunToCm, yrToS } from '../shared/units.js';
import { fixedColumnActiveLayer, uniformActiveLayer, type ActiveColumn } from './kernels/disk/active-layer.js';
import type { EvolveSetup, InfallSetup } from './kernels/disk/evolve.js';
import { makeLogGrid, type DiskGrid } from './kernels/disk/grid.js';
import type { WindSetup } from './kernels/disk/winds/wind-sink.js';
import { centrifugalRadius, shuInfallRate } from './kernels/disk/infall.js';
import { constantOpacity } from './kernels/disk/opacity.js';
import { SOUND_SPEED2_PER_K, irradiationTemperature4 } from './kernels/disk/thermal-structure.js';
import { ionizationActiveLayer, type IonizationLayerOptions } from './kernels/ionization/ionization-active-layer.js';
import { AL26_MEAN_LIFE_MYR } from './kernels/ionization/radionuclide-rate.js';
import { ALKALI_METALS } from './kernels/ionization/saha.js';
import { XRAY_FIT_3KEV, XRAY_FIT_5KEV, prepareXrayFit } from './kernels/ionization/xray-rate.js';

/** Window over which `mdot_star_avg_msun_yr` averages the accretion rate, s. */
export const MDOT_AVERAGE_WINDOW_S = yrToS(1e4);

/** Secant iterations per step where they are used (numerical choice, common practice, no source). */
const SECANT_ITERATIONS = 6;

export interface ModelSetup {
  readonly evolve: EvolveSetup;
  /** Checkpoint times, s (those after t_end dropped). */
  readonly checkpointTimes: readonly number[];
  /** Start of each checkpoint's averaging window, s (0 where the window would start before t = 0). */
  readonly averageStartTimes: readonly number[];
  /** Series sample times, s. */
  readonly seriesTimes: readonly number[];
}

/** Infall rate, duration and final centrifugal radius for the infall parameters (cgs). */
export function infallFromParams(p: ModelParams): InfallSetup & { rcFinal: number } {
  const soundSpeed = Math.sqrt(SOUND_SPEED2_PER_K * p.t_core_k);
  const mdot = shuInfallRate(soundSpeed);
  const tEnd = msunToG(p.m_core_msun) / mdot;
  return { mdot, soundSpeed, omegaCore: p.omega_core_s, tEnd, rcFinal: centrifugalRadius(soundSpeed, p.omega_core_s, tEnd) };
}

/**
 * Lynden-Bell & Pringle (1974) similarity profile at t = 0 (Hartmann et al. 1998, eq. 33 at T = 1):
 * Σ ∝ (R/R1)^{-γ} exp[−(R/R1)^{2−γ}], normalised so the discrete disk mass is exactly M_disk.
 */
function lbpInitialProfile(grid: DiskGrid, mDisk: number, r1: number, gamma: number): Float64Array {
  const sigma = new Float64Array(grid.n);
  let mass = 0;
  for (let i = 0; i < grid.n; i++) {
    const x = grid.centers[i] / r1;
    sigma[i] = x ** -gamma * Math.exp(-(x ** (2 - gamma)));
    mass += sigma[i] * grid.area[i];
  }
  const scale = mDisk / mass;
  for (let i = 0; i < grid.n; i++) sigma[i] *= scale;
  return sigma;
}

/**
 * Constraints that need a derived quantity, as detail lines (empty when all hold). Shared by `setupModel` and by
 * sweep validation, which checks them before anything is queued.
 */
export function derivedConstraintProblems(p: ModelParams): string[] {
  if (p.initial_state !== 'infall') return [];
  const { rcFinal } = infallFromParams(p);
  const rOut = auToCm(p.r_out_au);
  if (rcFinal <= rOut / 10) return [];
  const rcAu = rcFinal / auToCm(1);
  return [
    `r_out_au: must exceed 10x the final centrifugal radius r_c = ${rcAu.toPrecision(4)} AU ` +
      `(m_core_msun = ${p.m_core_msun}, t_core_k = ${p.t_core_k}, omega_core_s = ${p.omega_core_s}); ` +
      `got ${p.r_out_au}: raise r_out_au to at least ${(10 * rcAu).toPrecision(3)} or lower omega_core_s`,
  ];
}

/**
 * The ionization kernel's options from the parameters (cgs; the user-facing units of these parameters are
 * already cgs, except the ²⁶Al mean life). Shared by the model and `disksweep probe`, so both evaluate the
 * same physics.
 */
export function ionizationOptionsFromParams(p: ModelParams, nCells: number): IonizationLayerOptions {
  return {
    nCells,
    sources: {
      lxErgS: xrayLuminosity(p),
      xrayFit: prepareXrayFit(p.xray_spectrum === '3kev' ? XRAY_FIT_3KEV : XRAY_FIT_5KEV),
      zetaCr: p.zeta_cr_s,
      fuvColumn: p.sigma_fuv_face_g_cm2,
      fuvXe: p.x_e_fuv,
    },
    radionuclides: { zetaAl26: p.zeta_al26_s, zetaK40: p.zeta_k40_s, meanLife: myrToS(AL26_MEAN_LIFE_MYR) },
    physics: {
      chemistry: p.ion_chemistry === 'metals' ? { kind: 'metals', xMetal: p.x_metal } : { kind: 'molecular' },
      alkalis: p.thermal_ionization === 'saha' ? ALKALI_METALS : null,
      criterion:
        p.mri_criterion === 'elsasser'
          ? { kind: 'elsasser', threshold: p.elsasser_crit, betaMidplane: p.beta_midplane }
          : { kind: 'reynolds', threshold: p.reynolds_crit },
    },
    thermal:
      p.thermal_ionization === 'threshold' ? { kind: 'threshold', tMri: p.t_mri_k, halfWidth: p.t_mri_halfwidth_k } : { kind: 'none' },
    nz: p.n_z,
    sigmaFloor: p.sigma_ion_floor_g_cm2,
    refreshTolerance: p.ion_refresh_tol,
    activityTemperature: p.activity_temperature === 'midplane' ? 'midplane' : 'quiescent',
  };
}

/** L_X, erg s^-1: fixed, or a ratio of the photospheric luminosity. Shared by winds and ionization. */
function xrayLuminosity(p: ModelParams): number {
  return p.lx_scaling === 'l_phot' ? p.lx_over_lphot * lsunToErgS(p.l_phot_lsun) : p.lx_erg_s;
}

/** The winds that are on (scale or rate above zero), in cgs; null when none is. */
function windsFromParams(p: ModelParams): WindSetup | null {
  const winds: WindSetup = {
    xray: p.xray_wind_scale > 0 ? { lx: xrayLuminosity(p), scale: p.xray_wind_scale } : null,
    euv: p.euv_wind_scale > 0 ? { phi: p.phi_euv_s, scale: p.euv_wind_scale } : null,
    fuv: p.fuv_wind_mdot_msun_yr > 0 ? { mdot: msunYrToGs(p.fuv_wind_mdot_msun_yr), temperatureK: p.t_fuv_k } : null,
    cavityColumn: p.n_h_cavity_cm2,
  };
  return winds.xray === null && winds.euv === null && winds.fuv === null ? null : winds;
}

function activeColumnFromParams(p: ModelParams, nCells: number): ActiveColumn {
  switch (p.active_layer) {
    case 'fixed_column':
      return fixedColumnActiveLayer.create({ sigmaActiveFace: p.sigma_active_face_g_cm2 });
    case 'ionization':
      return ionizationActiveLayer.create(ionizationOptionsFromParams(p, nCells));
    default:
      return uniformActiveLayer.create({});
  }
}

export function setupModel(p: ModelParams): ModelSetup {
  const problems = derivedConstraintProblems(p);
  if (problems.length > 0) {
    throw new DisksweepError('input/invalid-parameter', 'the grid is too small for the infall', { details: problems });
  }
  const grid = makeLogGrid(auToCm(p.r_in_au), auToCm(p.r_out_au), p.n_cells);
  const infall = p.initial_state === 'infall' ? infallFromParams(p) : null;
  const sigma0 =
    p.initial_state === 'disk'
      ? lbpInitialProfile(grid, msunToG(p.m_disk_msun), auToCm(p.r1_au), p.gamma_lbp)
      : new Float64Array(grid.n);
  const lPhot = lsunToErgS(p.l_phot_lsun);
  const floor4 = p.t_floor_k ** 4;
  const baseTemperature4 = grid.centers.map((r) => irradiationTemperature4(r, lPhot) + floor4);
  const activeColumn = activeColumnFromParams(p, grid.n);

  const tEnd = myrToS(p.t_end_myr);
  const checkpointTimes = p.checkpoints_myr.map(myrToS);
  const averageStartTimes = checkpointTimes.map((t) => Math.max(0, t - MDOT_AVERAGE_WINDOW_S));
  const seriesTimes = Array.from({ length: p.n_series }, (_, k) => (tEnd * (k + 1)) / p.n_series);

  const evolve: EvolveSetup = {
    grid,
    sigma0,
    mStar0: msunToG(p.initial_state === 'infall' ? p.m_seed_msun : p.m_star_msun),
    starGrows: p.star_mass === 'growing',
    transport: {
      alphaActive: p.alpha_active,
      alphaDead: p.alpha_dead,
      activeColumn,
      opacity: constantOpacity(p.kappa_cm2_g),
      gi: p.gi_transport === 'on' ? { qCrit: p.q_crit, alphaMax: p.alpha_gi_max } : null,
      baseTemperature4,
      thermalInertia: p.thermal_inertia === 'on',
    },
    theta: p.theta,
    newtonIterations: p.newton_iterations,
    stepChange: p.step_change,
    linearizeFlux: true,
    // The Saha branch's column switches on through its midplane at a square-root cusp of Σ_a(Σ), where one
    // Newton iterate flips a cell between two states every step (flux-linearization.ts). Elsewhere one iterate is
    // kept: the check costs a coefficient pass per step, and on the default infall model with the ionization
    // layer it would redo ~3x more steps (residuals above the target in thin cells beside the dead zone).
    secantIterations: p.active_layer === 'ionization' && p.thermal_ionization === 'saha' ? SECANT_ITERATIONS : 0,
    maxSteps: p.max_steps,
    tEnd,
    eventTimes: [...checkpointTimes, ...averageStartTimes, ...seriesTimes],
    infall,
    spin: { k2: p.k2_star, rStar: rsunToCm(p.r_star_rsun), period: daysToS(p.p_star_days) },
    winds: windsFromParams(p),
    luminosity: {
      lPhot, accretion: p.accretion_luminosity === 'on', accretionMemory: yrToS(p.l_acc_memory_yr), rStar: rsunToCm(p.r_star_rsun), floor4,
    },
    // A tenth of a year is far below any viscous time on the grid; the step doubles from there.
    initialDt: yrToS(0.1),
  };
  return { evolve, checkpointTimes, averageStartTimes, seriesTimes };
}
