/**
 * External far-ultraviolet photoevaporation by a nearby cluster (Adams et al. 2004): gas heated by the external
 * FUV field to T_FUV escapes where its sound speed approaches the escape speed, i.e. outside a fraction of
 * r_g = G M_* /a_s²; Adams et al. find the flow still effective down to about 0.1–0.2 r_g (from memory); we
 * launch it outside 0.2 r_g. The total rate is a parameter (it depends on the field strength G_0 and on the
 * disk's size); it is taken from the cells outside that radius in proportion to the mass each holds, so the
 * outer disk is eroded from its edge inward and nothing is taken from a disk that lies entirely inside.
 */
import { G_CGS, K_BOLTZMANN_CGS, M_HYDROGEN_CGS } from '../../../../shared/constants.js';
import type { DiskGrid } from '../grid.js';

/** Mean molecular weight of the FUV-heated (atomic, neutral) surface gas; common practice. */
export const FUV_GAS_MU = 1.3;
/** Launching radius in units of r_g (Adams et al. 2004: 0.1–0.2; from memory). */
export const FUV_LAUNCH_RG = 0.2;

/** Radius outside which the external wind takes mass, cm. */
export function fuvLaunchRadius(mStar: number, temperatureK: number): number {
  const soundSpeed2 = (K_BOLTZMANN_CGS * temperatureK) / (FUV_GAS_MU * M_HYDROGEN_CGS);
  return (FUV_LAUNCH_RG * G_CGS * mStar) / soundSpeed2;
}

export interface FuvWindInput {
  readonly grid: DiskGrid;
  /** Σ at the start of the step, g cm^-2. */
  readonly sigma: Float64Array;
  /** g. */
  readonly mStar: number;
  /** Total rate, g s^-1. */
  readonly mdot: number;
  /** Temperature of the FUV-heated gas, K. */
  readonly temperatureK: number;
}

/** Rate of each cell, g s^-1, into `out` (cells whose centre lies outside the launch radius); returns the sum. */
export function fuvCellRates(input: FuvWindInput, out: Float64Array): number {
  const { grid, sigma, mStar, mdot, temperatureK } = input;
  const rLaunch = fuvLaunchRadius(mStar, temperatureK);
  let massOutside = 0;
  for (let i = 0; i < grid.n; i++) {
    out[i] = grid.centers[i] >= rLaunch ? sigma[i] * grid.area[i] : 0;
    massOutside += out[i];
  }
  if (!(massOutside > 0)) {
    out.fill(0);
    return 0;
  }
  // Shares first: a nearly empty outer disk must not overflow mdot / massOutside.
  for (let i = 0; i < grid.n; i++) out[i] = mdot * (out[i] / massOutside);
  return mdot;
}
