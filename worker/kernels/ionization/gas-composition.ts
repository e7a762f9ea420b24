/**
 * Conventions of the ionization kernel, stated once here and used by every module beside it.
 *
 * - The gas is H₂ + He with hydrogen mass fraction X ≈ 0.71, so the mass per H nucleus is 1.4 m_H and the
 *   mass per H₂ molecule 2.8 m_H (common practice; 1/X = 1.41). Number density of molecules n_H₂ = ρ/(2.8 m_H);
 *   column of H nuclei N_H = Σ_col/(1.4 m_H).
 * - Ionization rates ζ are per H₂ molecule: ionizations per volume = ζ n_H₂. A rate quoted per H nucleus is
 *   doubled (ionizations per volume ∝ n_H = 2 n_H₂).
 * - The electron fraction is x_e = n_e/n_n with n_n = n_H₂: helium is in the mass per molecule but is not
 *   counted as a separate neutral (counting it would lower x_e by 2.34/2.8 ≈ 0.84 at fixed n_e).
 * - Recombination and rate coefficients take T in kelvin; everything else is cgs.
 * - Every rate says whether it is per face (rays entering through one face of the disk) or for both faces.
 */
import { M_HYDROGEN_CGS } from '../../../shared/constants.js';

/** Mass per H nucleus, g (1.4 m_H). */
export const MASS_PER_H_NUCLEUS_CGS = 1.4 * M_HYDROGEN_CGS;
/** Mass per H₂ molecule including its share of helium, g (2.8 m_H). */
export const MASS_PER_H2_CGS = 2.8 * M_HYDROGEN_CGS;
/** n_H₂ in cm^-3 from ρ in g cm^-3. */
export function h2NumberDensity(rho: number): number {
  return rho / MASS_PER_H2_CGS;
}

/** Column of H nuclei N_H in cm^-2 from a mass column in g cm^-2. */
export function hydrogenColumn(sigmaColumn: number): number {
  return sigmaColumn / MASS_PER_H_NUCLEUS_CGS;
}
