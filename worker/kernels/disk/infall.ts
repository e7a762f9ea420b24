/**
 * Infall from a collapsing, slowly rotating isothermal cloud core onto the star + disk.
 * - Rate: Ṁ = m0 c_s^3 / G with m0 = 0.975 (Shu 1977, inside-out collapse of a singular isothermal sphere).
 * - Centrifugal radius: r_c(t) = m0^3 c_s t^3 Ω_core^2 / 16 (Terebey, Shu & Cassen 1984, eq. 3); it follows
 *   from the infallen mass Ṁt, not from the current stellar mass.
 * - Deposition: Σ̇(R) = Ṁ/(8π r_c^2) (R/r_c)^{-3/2} [1 − (R/r_c)^{1/2}]^{-1/2} for R < r_c (Cassen & Moosman
 *   1981), applied per cell from its integral Ṁ(<R)/Ṁ = 1 − [1 − (R/r_c)^{1/2}]^{1/2}, so every cell gets its
 *   exact share and the integrable singularity at r_c does no harm.
 * Gas landing at R arrives with the Keplerian j(R) (it is where its angular momentum is centrifugally
 * supported), so the total specific angular momentum deposited is (2/3)(G M r_c)^{1/2}.
 */
import { G_CGS } from '../../../shared/constants.js';
import type { DiskGrid } from './grid.js';

/** Shu (1977) dimensionless collapse rate m0. */
export const SHU_M0 = 0.975;

/** Shu (1977) infall rate, g s^-1, for isothermal sound speed c_s (cm s^-1). */
export function shuInfallRate(soundSpeed: number): number {
  return (SHU_M0 * soundSpeed ** 3) / G_CGS;
}

/** Terebey, Shu & Cassen (1984) centrifugal radius at time t (s) after collapse onset, cm. */
export function centrifugalRadius(soundSpeed: number, omegaCore: number, t: number): number {
  return (SHU_M0 ** 3 * soundSpeed * t ** 3 * omegaCore * omegaCore) / 16;
}

/** Fraction of the infall landing inside R: 1 − (1 − (R/r_c)^{1/2})^{1/2}, 1 beyond r_c (Cassen & Moosman 1981). */
export function infallFractionInside(radius: number, rc: number): number {
  if (!(rc > radius)) return 1;
  return 1 - Math.sqrt(1 - Math.sqrt(radius / rc));
}

/**
 * Specific angular momentum carried by the infall landing inside R, in units of (G M r_c)^{1/2}, per unit of
 * total infall mass: ∫ (R'/r_c)^{1/2} dF. With u = (1 − (R/r_c)^{1/2})^{1/2}: (1 − u) − (1 − u^3)/3;
 * 2/3 for the whole infall.
 */
export function infallAngularMomentumInside(radius: number, rc: number): number {
  const u = rc > radius ? Math.sqrt(1 - Math.sqrt(radius / rc)) : 0;
  return 1 - u - (1 - u * u * u) / 3;
}

export interface InfallDeposit {
  /** Mass rate landing inside R_in, straight onto the star, g s^-1. */
  toStar: number;
  /** Angular-momentum rate landing inside R_in, g cm^2 s^-2. */
  angularMomentumToStar: number;
}

/**
 * Fill `source` (g s^-1 per cell) with the infall landing on each cell at rate `mdot` and centrifugal radius
 * `rc`; return what lands inside the grid's inner edge. The caller has checked that r_c < R_out.
 */
export function depositInfall(grid: DiskGrid, mdot: number, rc: number, mStar: number, source: Float64Array): InfallDeposit {
  const { n, edges } = grid;
  let below = infallFractionInside(edges[0], rc);
  for (let i = 0; i < n; i++) {
    const above = infallFractionInside(edges[i + 1], rc);
    source[i] = mdot * (above - below);
    below = above;
  }
  const inner = infallFractionInside(edges[0], rc);
  return {
    toStar: mdot * inner,
    angularMomentumToStar: mdot * Math.sqrt(G_CGS * mStar * rc) * infallAngularMomentumInside(edges[0], rc),
  };
}
