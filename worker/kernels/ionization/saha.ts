/**
 * Thermal ionization of alkali metals by the Saha equation (e.g. Rybicki & Lightman 1979, eq. 9.45):
 *   n⁺ n_e / n⁰ = (2 g⁺/g⁰) (2π m_e k T / h²)^{3/2} exp(−χ/kT) ≡ S(T),
 * with ground-state statistical weights (the first excited levels of K and Na lie > 1.6 eV up and hold a
 * negligible share below ~3000 K): K I 4s ²S½ g⁰ = 2, K II 3p⁶ ¹S₀ g⁺ = 1; Na I 3s ²S½ g⁰ = 2, Na II 2p⁶ ¹S₀
 * g⁺ = 1; so 2g⁺/g⁰ = 1 for both (and for hydrogen, H I 1s ²S½ g⁰ = 2, H II g⁺ = 1).
 * Ionization energies from the NIST Atomic Spectra Database: K 4.34066 eV, Na 5.13908 eV. Abundances are the
 * solar photospheric values of Asplund et al. (2009, Table 1): log ε(K) = 5.03, log ε(Na) = 6.24 on the scale
 * log ε(H) = 12, i.e. per H₂ twice the value per H. Potassium, with the lower χ, ionizes first.
 */
import { ELECTRON_VOLT_CGS, H_PLANCK_CGS, K_BOLTZMANN_CGS, M_ELECTRON_CGS } from '../../../shared/constants.js';

export interface SahaElement {
  readonly name: string;
  /** Ionization energy, erg. */
  readonly chi: number;
  /** 2 g⁺/g⁰. */
  readonly weightRatio: number;
  /** Abundance per H₂ molecule. */
  readonly abundancePerH2: number;
}

const perH2 = (logEps: number): number => 2 * 10 ** (logEps - 12);

export const POTASSIUM: SahaElement = { name: 'K', chi: 4.34066 * ELECTRON_VOLT_CGS, weightRatio: 1, abundancePerH2: perH2(5.03) };
export const SODIUM: SahaElement = { name: 'Na', chi: 5.13908 * ELECTRON_VOLT_CGS, weightRatio: 1, abundancePerH2: perH2(6.24) };
export const ALKALI_METALS: readonly SahaElement[] = [POTASSIUM, SODIUM];

/** (2π m_e k / h²)^{3/2}, cm^-3 K^-3/2. */
const QUANTUM_CONCENTRATION_PER_K = ((2 * Math.PI * M_ELECTRON_CGS * K_BOLTZMANN_CGS) / (H_PLANCK_CGS * H_PLANCK_CGS)) ** 1.5;

/** S(T) = n⁺ n_e / n⁰ in cm^-3 for ionization energy χ (erg) and weight ratio 2g⁺/g⁰. */
export function sahaFactor(temperature: number, chi: number, weightRatio: number): number {
  if (!(temperature > 0)) return 0;
  return weightRatio * QUANTUM_CONCENTRATION_PER_K * temperature * Math.sqrt(temperature) * Math.exp(-chi / (K_BOLTZMANN_CGS * temperature));
}

/** Ionized share n⁺/(n⁺ + n⁰) of an element at electron density n_e (cm^-3): S/(n_e + S). */
export function ionizedShare(sahaS: number, electronDensity: number): number {
  return sahaS > 0 ? sahaS / (electronDensity + sahaS) : 0;
}
