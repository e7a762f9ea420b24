/**
 * ν(R) for the next step from the current Σ: layered α (active-layer.ts), gravitational-instability α
 * (gravitational-instability.ts) and the midplane temperature (thermal-structure.ts), iterated together
 * because α_GI depends on c_s(T) and T_visc on α. The fixed point is a contraction (T ∝ α^{1/3}, α_GI ∝ 1/T,
 * so errors shrink by ~1/3 per pass); a few passes from last step's T reach 1e-10.
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
 * Cap on the fixed-point passes (numerical choice, no source): errors shrink ~3x per pass (see above), so 12
 * passes gain ~6 digits from a cold start.
 */
const MAX_PASSES = 12;

type Mutable<T> = { -readonly [K in keyof T]: T[K] };
const SQRT_2PI = Math.sqrt(2 * Math.PI);

/**
 * Equilibrium midplane temperature of a cell with dead-zone transport only: α_dead plus α_GI, iterated to its
 * own fixed point from `t` (GI heating can trigger the MRI; the MRI's own heating cannot, and the result depends
 * on Σ, not on whether the cell is active now). The MRI heating of the ionized surface layers is left out: it is
 * released near the surface, where it escapes.
 */
function deadColumnTemperature(physics: TransportPhysics, s: number, om: number, t0: number, i: number): number {
  const { alphaDead, opacity, gi, baseTemperature4 } = physics;
  let t = t0;
  for (let pass = 0; pass < MAX_PASSES; pass++) {
    const cs = Math.sqrt(SOUND_SPEED2_PER_K * t);
    const alpha = gi === null ? alphaDead : alphaDead + alphaGravitationalInstability(cs, om, s, gi.qCrit, gi.alphaMax);
    const kappa = opacity.isConstant ? opacity.kappa(0, t) : opacity.kappa((s * om) / (SQRT_2PI * cs), t);
    const tNew = solveMidplaneTemperature(viscousHeatingCoefficient(kappa, s, alpha, om), baseTemperature4[i]);
    const converged = Math.abs(tNew - t) <= 1e-10 * tNew;
    t = tNew;
    if (converged || (gi === null && opacity.isConstant)) break;
  }
  return t;
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
  const { alphaActive, alphaDead, activeColumn, opacity, gi, baseTemperature4 } = physics;
  const inertia = physics.thermalInertia === true && dt < Infinity;
  const quiescentFrom = activeColumn.quiescentFrom;
  // One input record for every cell (no allocation per cell and pass).
  const cell: Mutable<ActiveLayerInput> = {
    sigma: 0, temperature: 0, radius: 0, omega: 0, time, index: 0, quiescentTemperature: 0, derivativeProbe: fields.derivativeProbe === true,
  };
  const { nu, temperature, sigmaActive: sigmaActiveOut } = fields;
  let qMin = Infinity;
  let fragmenting = false;
  for (let i = 0; i < grid.n; i++) {
    const s = sigma[i];
    const om = omega[i];
    const tOld = temperature[i];
    let t = tOld > 0 ? tOld : Math.sqrt(Math.sqrt(baseTemperature4[i]));
    cell.sigma = s;
    cell.temperature = t;
    cell.radius = grid.centers[i];
    cell.omega = om;
    cell.index = i;
    // The quiescent column is no hotter than the midplane (less α, less heat): below the provider's threshold
    // the midplane temperature stands in for it and the switch stays off all the same.
    cell.quiescentTemperature = quiescentFrom !== undefined && t >= quiescentFrom ? deadColumnTemperature(physics, s, om, t, i) : t;
    const sigmaActive = Math.min(activeColumn(cell), s);
    if (sigmaActiveOut !== undefined) sigmaActiveOut[i] = sigmaActive;
    const alphaLayer = layeredAlpha(s, sigmaActive, alphaActive, alphaDead);
    let alpha = alphaLayer;
    let kappa = 0;
    for (let pass = 0; pass < MAX_PASSES; pass++) {
      const cs = Math.sqrt(SOUND_SPEED2_PER_K * t);
      alpha = gi === null ? alphaLayer : alphaLayer + alphaGravitationalInstability(cs, om, s, gi.qCrit, gi.alphaMax);
      kappa = opacity.isConstant ? opacity.kappa(0, t) : opacity.kappa((s * om) / (SQRT_2PI * cs), t);
      const a = viscousHeatingCoefficient(kappa, s, alpha, om);
      const tEq = solveMidplaneTemperature(a, baseTemperature4[i]);
      const tNew = inertia ? relaxTemperature(a, baseTemperature4[i], tOld, coolingRateCoefficient(kappa, s) * dt, tEq) : tEq;
      const converged = Math.abs(tNew - t) <= 1e-10 * tNew;
      t = tNew;
      if (converged || (gi === null && opacity.isConstant)) break;
    }
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
