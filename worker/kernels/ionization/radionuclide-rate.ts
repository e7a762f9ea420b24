/**
 * Ionization by the decay of radionuclides in the disk material (Umebayashi & Nakano 2009, ApJ 690, 69): a
 * volume source, the same at every height (no face), per H₂. Short-lived ²⁶Al decays from its abundance at
 * collapse onset with its mean life; long-lived ⁴⁰K is taken as constant over a few Myr.
 *
 * The rates assume the decay products (positrons, γ-rays) are stopped in the disk; thin columns lose part of
 * them (Umebayashi & Nakano 2009), which this kernel does not model: with the default rates the radionuclides
 * matter only deep inside thick columns, where that holds.
 */

/** ²⁶Al rate per H₂ at collapse onset, s^-1 (Umebayashi & Nakano 2009; from memory). */
export const ZETA_AL26_S = 7.6e-19;
/** ⁴⁰K rate per H₂, s^-1 (Umebayashi & Nakano 2009; from memory). */
export const ZETA_K40_S = 1.1e-22;
/** ²⁶Al mean life, Myr: half-life 0.717 Myr / ln 2 (nuclear data tables; from memory). */
export const AL26_MEAN_LIFE_MYR = 1.03;

/** ζ_R per H₂, s^-1, a time t (s) after collapse onset; `meanLifeS` is the ²⁶Al mean life in s. */
export function radionuclideRate(zetaAl26: number, zetaK40: number, meanLifeS: number, t: number): number {
  return zetaAl26 * Math.exp(-t / meanLifeS) + zetaK40;
}
