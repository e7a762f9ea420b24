/**
 * What the integrator (evolve.ts) hands its observers: the disk state, the running mass and angular-momentum
 * budgets, and the closure test of those budgets. Every source or sink the integrator applies books its mass
 * and angular momentum in `Budget`, and `budgetErrors` must account for it, or runs are marked budget_error.
 */
import type { ModelStatus } from '../../../shared/model-result.js';
import type { TransportSummary } from './transport-coefficients.js';
import type { InnerCavity } from './winds/inner-cavity.js';

/** Running totals since t = 0, cgs (g, g cm^2 s^-1). */
export interface Budget {
  massAccreted: number;
  massLost: number;
  massInfallDisk: number;
  massInfallStar: number;
  jAccreted: number;
  jLost: number;
  jInfallDisk: number;
  jInfallStar: number;
  /** Change of J_disk from the growth of M_* at fixed cell masses (every j_i ∝ M_*^{1/2}). */
  jRescale: number;
  /** Removed by photoevaporative winds, in all and per wind, with the angular momentum it carried. */
  massWind: number;
  massWindXray: number;
  massWindEuv: number;
  massWindFuv: number;
  jWind: number;
}

/** The state an observer sees; valid only during the callback (arrays are reused). */
export interface DiskState {
  t: number;
  steps: number;
  rejectedSteps: number;
  readonly sigma: Float64Array;
  readonly temperature: Float64Array;
  readonly nu: Float64Array;
  /** MRI-active column the transport used, g cm^-2 (≤ Σ). */
  readonly sigmaActive: Float64Array;
  mStar: number;
  mDisk: number;
  jDisk: number;
  jSpin: number;
  /** Accretion rate onto the star over the last step (disk + infall inside R_in), g s^-1. */
  mdotStar: number;
  /** Toomre Q minimum and fragmentation flag from the last coefficient pass. */
  transport: TransportSummary;
  /** Irradiating luminosity L_phot + L_acc for the next step and its accretion part, erg s^-1. */
  lStar: number;
  lAcc: number;
  /** Mass-loss rate of the winds over the last step, g s^-1, and the mass each cell lost to them, g. */
  mdotWind: number;
  readonly windLoss: Float64Array;
  /** Inner cavity of the current state (winds/inner-cavity.ts; closed when there are no winds). */
  cavity: InnerCavity;
  readonly mDisk0: number;
  readonly jDisk0: number;
  readonly jSpin0: number;
  readonly budget: Budget;
}

export interface EvolveObserver {
  /** After every accepted step. */
  onStep?(state: DiskState): void;
  /** When t lands on an event time (state.t equals it exactly). */
  onEvent?(state: DiskState): void;
}

export interface EvolveOutcome {
  status: ModelStatus;
  reason: string | null;
  state: DiskState;
}

/** Angular momentum the star has received but not kept: torques and winds removed it. */
export function angularMomentumRemoved(state: DiskState): number {
  const b = state.budget;
  return state.jSpin0 + b.jAccreted + b.jInfallStar - state.jSpin;
}

/** Relative closure errors of the mass and angular-momentum budgets of the disk. */
export function budgetErrors(state: DiskState): { mass: number; angularMomentum: number } {
  const b = state.budget;
  const massIn = state.mDisk0 + b.massInfallDisk;
  const massErr = state.mDisk - (massIn - b.massAccreted - b.massLost - b.massWind);
  const jScale = state.jDisk0 + b.jInfallDisk + Math.abs(b.jRescale);
  const jErr = state.jDisk - (state.jDisk0 + b.jInfallDisk + b.jRescale - b.jAccreted - b.jLost - b.jWind);
  return {
    mass: massIn > 0 ? Math.abs(massErr) / massIn : 0,
    angularMomentum: jScale > 0 ? Math.abs(jErr) / jScale : 0,
  };
}
