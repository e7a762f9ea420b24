/**
 * Internal EUV photoevaporation (coefficients from memory):
 * - diffuse field, primordial disk (Hollenbach et al. 1994, as used in the "UV-switch" models of Clarke,
 *   Gendrin & Sotomayor 2001): base density n_0(R_g) = 5.7e4 Φ41^{1/2} (R_g/1e14 cm)^{-3/2} cm^-3 at the
 *   gravitational radius R_g = G M_* /c_s², c_s = 10 km/s, falling as (R/R_g)^{-5/2} outside it and no loss inside;
 *   Σ̇ = 2 n_0 m_H c_s (both faces). Its integral, 4π R_g² Σ̇(R_g), is Hollenbach's total
 *   4.4e-10 Φ41^{1/2} (M_* /M_sun)^{1/2} M_sun/yr; the tests check that.
 * - direct field on the rim of an inner hole R_h (Alexander, Clarke & Pringle 2006, paper I):
 *   Σ̇ = 2 C2 μ m_H c_s [Φ/(4π α_B H_h R_h²)]^{1/2} (R/R_h)^{-a}, C2 = 0.235, a = 2.42, H_h/R_h = 0.05,
 *   μ = 1.35, α_B = 2.6e-13 cm³ s⁻¹; total 2π R_h² Σ̇(R_h)/(a − 2) ∝ R_h^{1/2}.
 * Both profiles are power laws, so each cell's rate is the exact integral of 2πR Σ̇ between its edges.
 */
import { G_CGS, M_HYDROGEN_CGS } from '../../../../shared/constants.js';
import type { DiskGrid } from '../grid.js';
import { cellRatesFromCumulative } from './cumulative-table.js';

/** Sound speed of the photoionized gas, cm s^-1 (T ≈ 1e4 K; 10 km/s as in Hollenbach et al. 1994, from memory). */
export const EUV_SOUND_SPEED = 1e6;
/** n_0 at R_g for Φ = 1e41 s^-1 and R_g = 1e14 cm, cm^-3 (Hollenbach et al. 1994, from memory; see above). */
const DIFFUSE_N0 = 5.7e4;
const DIRECT = { c2: 0.235, a: 2.42, hOverR: 0.05, mu: 1.35, alphaB: 2.6e-13 } as const;

/** R_g = G M_* /c_s², cm. */
export function euvGravitationalRadius(mStar: number): number {
  return (G_CGS * mStar) / (EUV_SOUND_SPEED * EUV_SOUND_SPEED);
}

/** Σ̇ of the diffuse wind at R_g, g cm^-2 s^-1 (Hollenbach et al. 1994). */
function euvDiffuseSurfaceRateAtRg(mStar: number, phi: number): number {
  const n0 = DIFFUSE_N0 * Math.sqrt(phi / 1e41) * (euvGravitationalRadius(mStar) / 1e14) ** -1.5;
  return 2 * n0 * M_HYDROGEN_CGS * EUV_SOUND_SPEED;
}

/** Σ̇ of the direct wind at the hole's rim, g cm^-2 s^-1 (Alexander, Clarke & Pringle 2006). */
export function euvDirectSurfaceRateAtRim(holeRadius: number, phi: number): number {
  const { c2, hOverR, mu, alphaB } = DIRECT;
  const n = Math.sqrt(phi / (4 * Math.PI * alphaB * hOverR * holeRadius ** 3));
  return 2 * c2 * mu * M_HYDROGEN_CGS * EUV_SOUND_SPEED * n;
}

/** Total of the direct wind from R_h outward (no outer limit), g s^-1. */
export function euvDirectTotalRate(holeRadius: number, phi: number): number {
  return (2 * Math.PI * holeRadius * holeRadius * euvDirectSurfaceRateAtRim(holeRadius, phi)) / (DIRECT.a - 2);
}

export interface EuvWindInput {
  readonly grid: DiskGrid;
  /** g. */
  readonly mStar: number;
  /** Ionizing photons per second. */
  readonly phi: number;
  readonly scale: number;
  /** Radius of the inner hole, cm, or null for a primordial disk (diffuse field). */
  readonly holeRadius: number | null;
}

/**
 * Rate of each cell, g s^-1, into `out`; returns the sum. A power law Σ̇ = Σ̇_0 (R/R_0)^{-p} for R > R_0 gives
 * ∫ 2πR Σ̇ dR = 2π Σ̇_0 R_0² [(R_a/R_0)^{2−p} − (R_b/R_0)^{2−p}]/(p − 2) between R_a and R_b.
 */
export function euvCellRates(input: EuvWindInput, out: Float64Array): number {
  const { grid, mStar, phi, scale, holeRadius } = input;
  const diffuse = holeRadius === null;
  const r0 = diffuse ? euvGravitationalRadius(mStar) : holeRadius;
  const sigmaDot0 = diffuse ? euvDiffuseSurfaceRateAtRg(mStar, phi) : euvDirectSurfaceRateAtRim(holeRadius, phi);
  const p = diffuse ? 2.5 : DIRECT.a;
  const q = 2 - p;
  const coefficient = (scale * 2 * Math.PI * sigmaDot0 * r0 * r0) / (p - 2);
  const cumulative = (e: number): number => (grid.edges[e] <= r0 ? 0 : 1 - (grid.edges[e] / r0) ** q);
  return cellRatesFromCumulative(grid.n, coefficient, cumulative, out);
}
