/**
 * ν(R) for the next step from the current Σ: layered α (active-layer.ts), gravitational-instability α
 * (gravitational-instability.ts) and the midplane temperature (thermal-structure.ts), solved together
 * because α_GI depends on c_s(T) and T_visc on α. The temperature is the fixed point T = T_eq(α(T)); T_eq does
 * not increase with T (α_GI falls as c_s rises), so the fixed point is unique. Plain iteration contracts by
 * ~1/3 per pass where GI is off or strong (T ∝ α^{1/3}), but near marginal stability (Q just below q_crit,
 * α_GI ≪ its normalisation) |dT_eq/dT| passes 1 and it falls into a period-2 cycle between a hot and a cool
 * temperature: ν then depended on the pass count and on last step's T, jumping ~10-fold for a 1 % change of
 * Σ, and the integrator crawled. The solve (numerics/root-finding.ts) brackets and uses Brent's method there.
 * It needs T_eq not to increase with T, which holds for constant κ, GI and thermal-inertia relaxation; an opacity
 * law κ(ρ, T) that rises with T can break it (opacity.ts). A cell whose solve does not converge within
 * MAX_EVALUATIONS gets T = ν = NaN: every step from it is then non-finite, and the integrator's retries end the
 * run with a failure status (step_collapse or non_finite, evolve.ts) instead of going on with a wrong temperature.
 */
import { SIGMA_SB_CGS } from '../../../shared/constants.js';
import type { ActiveColumn, ActiveLayerInput } from './active-layer.js';
import { layeredAlpha } from './active-layer.js';
import {
  FRAGMENTATION_BETA,
  alphaGravitationalInstability,
  coolingTimeOmega,
  toomreQ,
} from './gravitational-instability.js';
import type { DiskGrid } from './grid.js';
import type { Opacity } from './opacity.js';
import { nonIncreasingFixedPoint } from '../numerics/root-finding.js';
import { coolingRateCoefficient, relaxTemperature } from './thermal-inertia.js';
import { SOUND_SPEED2_PER_K, solveMidplaneTemperature, viscousHeatingCoefficient } from './thermal-structure.js';

export interface TransportPhysics {
  readonly alphaActive: number;
  readonly alphaDead: number;
  readonly activeColumn: ActiveColumn;
  readonly opacity: Opacity;
  /** Gravitational-instability transport, or null when switched off. */
  readonly gi: { readonly qCrit: number; readonly alphaMax: number } | null;
  /** T_irr^4 + T_floor^4 per cell, K^4. */
  readonly baseTemperature4: Float64Array;
  /**
   * True: the midplane temperature follows the one-zone energy equation over each step (thermal-inertia.ts);
   * false (or absent): it is the thermal equilibrium at every pass.
   */
  readonly thermalInertia?: boolean;
}

/** Per-cell fields the coefficient pass fills in; `temperature` also serves as the next pass's first guess. */
export interface TransportFields {
  readonly nu: Float64Array;
  readonly temperature: Float64Array;
  /** Σ_a the layered rule used (min(provider, Σ)), g cm^-2, when the caller wants it. */
  readonly sigmaActive?: Float64Array;
  /** True for the pass at Σ(1 + ε) that only measures dν/dΣ (flux-linearization.ts); see `ActiveLayerInput`. */
  readonly derivativeProbe?: boolean;
}

export interface TransportSummary {
  /** Smallest Toomre Q over cells holding gas (Infinity for an empty disk). */
  qMin: number;
  /** True where some cell has Q < 1 and t_cool Ω < 3 (Gammie 2001). */
  fragmenting: boolean;
}

/**
 * Cap on the evaluations of T_eq per temperature solve (numerical choice, no source): plain passes gain ~6 digits
 * in 12 from a cold start where they contract, and Brent's method takes over where they do not.
 */
const MAX_EVALUATIONS = 40;
/** Relative tolerance of the midplane temperature. */
const TEMPERATURE_TOL = 1e-10;

type Mutable<T> = { -readonly [K in keyof T]: T[K] };
const SQRT_2PI = Math.sqrt(2 * Math.PI);

/**
 * What one trial temperature of a cell gives: the α and κ there, and the temperature that heating balances.
 * One instance per coefficient pass is filled with the cell's data, so the solve allocates nothing per cell.
 */
interface HeatingTrial {
  s: number;
  om: number;
  i: number;
  /** α of the layered rule (GI is added per trial). */
  alphaLayer: number;
  /** Start-of-step temperature for thermal inertia; NaN for the equilibrium. */
  tOld: number;
  /** α_GI at the trial temperature (0 without GI). */
  alphaGi: number;
  alpha: number;
  kappa: number;
}

/** α_GI of the cell in `trial` at temperature t. */
function alphaGiAt(gi: TransportPhysics['gi'], trial: HeatingTrial, t: number): number {
  return gi === null ? 0 : alphaGravitationalInstability(Math.sqrt(SOUND_SPEED2_PER_K * t), trial.om, trial.s, gi.qCrit, gi.alphaMax);
}

// The balance runs for every cell and pass; its rarely taken branches (an opacity law, thermal inertia) sit in the
// two helpers below so that it stays small enough for the JIT to compile its whole default path (α_GI, T_eq)
// into the coefficient pass: a call it leaves out boxes every number it passes (measured: ~18 % of the allocation
// per run of the default ionization model).

/** κ at the midplane density of the cell in `trial`, at temperature t (opacity laws that depend on them). */
function kappaAtMidplane(opacity: Opacity, trial: HeatingTrial, t: number): number {
  return opacity.kappa((trial.s * trial.om) / (SQRT_2PI * Math.sqrt(SOUND_SPEED2_PER_K * t)), t);
}

/** The temperature after the step with thermal inertia, from the equilibrium tEq of heating coefficient a. */
function relaxedTemperature(trial: HeatingTrial, c: number, a: number, tEq: number, inertiaDt: number): number {
  return relaxTemperature(a, c, trial.tOld, coolingRateCoefficient(trial.kappa, trial.s) * inertiaDt, tEq);
}

function heatingBalance(physics: TransportPhysics, inertiaDt: number, trial: HeatingTrial): (t: number) => number {
  const { opacity, gi, baseTemperature4 } = physics;
  // A constant κ is asked for once per pass (it depends on neither ρ nor T).
  const kappaConstant = opacity.isConstant ? opacity.kappa(0, 0) : NaN;
  return (t) => {
    const c = baseTemperature4[trial.i];
    trial.alphaGi = alphaGiAt(gi, trial, t);
    trial.alpha = trial.alphaLayer + trial.alphaGi;
    trial.kappa = opacity.isConstant ? kappaConstant : kappaAtMidplane(opacity, trial, t);
    const a = viscousHeatingCoefficient(trial.kappa, trial.s, trial.alpha, trial.om);
    const tEq = solveMidplaneTemperature(a, c, t);
    return Number.isNaN(trial.tOld) ? tEq : relaxedTemperature(trial, c, a, tEq, inertiaDt);
  };
}

/** The cell's temperature from `t`, with `trial` filled in at it (α, κ). */
function solveCellTemperature(physics: TransportPhysics, balance: (t: number) => number, trial: HeatingTrial, t: number): number {
  const first = balance(t);
  // The balance depends on T only through α_GI and κ (and, in its last bits, through the Newton start). With κ
  // constant and α_GI = 0 both at t and at T' = T_eq(t) (Q ≥ Q_crit at both; always so without GI), the balance at
  // T' uses the same α and κ as at t and returns T' again to round-off: T' is the fixed point, and the second
  // evaluation the iteration would spend is skipped.
  if (physics.opacity.isConstant && trial.alphaGi === 0 && alphaGiAt(physics.gi, trial, first) === 0) return first;
  return nonIncreasingFixedPoint(balance, t, TEMPERATURE_TOL, MAX_EVALUATIONS, first);
}

export function computeTransportCoefficients(
  grid: DiskGrid,
  sigma: Float64Array,
  omega: Float64Array,
  physics: TransportPhysics,
  fields: TransportFields,
  /** Time of the state, s (for providers whose Σ_a depends on it). */
  time = 0,
  /**
   * Time since the state `fields.temperature` holds, s: with thermal inertia the temperature is advanced over
   * it from there; Infinity (the default) gives the equilibrium.
   */
  dt = Infinity,
): TransportSummary {
  const { alphaActive, alphaDead, activeColumn, baseTemperature4 } = physics;
  const inertia = physics.thermalInertia === true && dt < Infinity;
  const quiescentFrom = activeColumn.quiescentFrom;
  // One input record and one trial record for every cell (no allocation per cell and pass).
  const cell: Mutable<ActiveLayerInput> = {
    sigma: 0, temperature: 0, radius: 0, omega: 0, time, index: 0, quiescentTemperature: 0, derivativeProbe: fields.derivativeProbe === true,
  };
  const trial: HeatingTrial = { s: 0, om: 0, i: 0, alphaLayer: 0, tOld: NaN, alphaGi: 0, alpha: 0, kappa: 0 };
  const balance = heatingBalance(physics, dt, trial);
  const { nu, temperature, sigmaActive: sigmaActiveOut } = fields;
  let qMin = Infinity;
  let fragmenting = false;
  for (let i = 0; i < grid.n; i++) {
    const s = sigma[i];
    const om = omega[i];
    const tOld = temperature[i];
    const tStart = tOld > 0 ? tOld : Math.sqrt(Math.sqrt(baseTemperature4[i]));
    trial.s = s;
    trial.om = om;
    trial.i = i;
    cell.sigma = s;
    cell.temperature = tStart;
    cell.radius = grid.centers[i];
    cell.omega = om;
    cell.index = i;
    // The quiescent column (α_dead plus GI, in equilibrium) is no hotter than the midplane (less α, less heat):
    // below the provider's threshold the midplane temperature stands in for it and the switch stays off all
    // the same. The MRI heating of ionized surface layers is left out of it: released near the surface, it
    // escapes. GI heating can trigger the MRI; the MRI's own heating cannot, so the result depends on Σ, not on
    // whether the cell is active now.
    if (quiescentFrom !== undefined && tStart >= quiescentFrom) {
      trial.alphaLayer = alphaDead;
      trial.tOld = NaN;
      cell.quiescentTemperature = solveCellTemperature(physics, balance, trial, tStart);
    } else {
      cell.quiescentTemperature = tStart;
    }
    if (Number.isNaN(cell.quiescentTemperature)) {
      // Unsolved (see the header): the provider is not asked about a NaN temperature, and the NaN goes on in ν.
      if (sigmaActiveOut !== undefined) sigmaActiveOut[i] = NaN;
      temperature[i] = NaN;
      nu[i] = NaN;
      continue;
    }
    const sigmaActive = Math.min(activeColumn(cell), s);
    if (sigmaActiveOut !== undefined) sigmaActiveOut[i] = sigmaActive;
    trial.alphaLayer = layeredAlpha(s, sigmaActive, alphaActive, alphaDead);
    trial.tOld = inertia ? tOld : NaN;
    const t = solveCellTemperature(physics, balance, trial, tStart);
    const { alpha, kappa } = trial;
    temperature[i] = t;
    const cs2 = SOUND_SPEED2_PER_K * t;
    nu[i] = (alpha * cs2) / om;
    if (s > 0) {
      const cs = Math.sqrt(cs2);
      const q = toomreQ(cs, om, s);
      if (q < qMin) qMin = q;
      if (q < 1 && coolingTimeOmega(s, cs, t, kappa, om, SIGMA_SB_CGS) < FRAGMENTATION_BETA) fragmenting = true;
    }
  }
  return { qMin, fragmenting };
}
