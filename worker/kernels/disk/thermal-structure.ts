/**
 * Midplane temperature of the disk: T^4 = T_irr^4 + T_visc^4 + T_floor^4.
 * - Irradiation: T_irr = 280 K (R/AU)^{-1/2} (L_* / L_sun)^{1/4} (Hayashi 1981, eq. 2.3).
 * - Viscous heating, optically thick one-zone estimate with the heat released at the midplane and optical
 *   depth τ = κΣ/2 to each face: T_visc^4 = (3τ/4) T_eff^4 with σT_eff^4 = (9/8) ν Σ Ω^2 per face, i.e.
 *   T_visc^4 = (27/64) κ Σ^2 ν Ω^2 / σ_SB (e.g. Nakamoto & Nakagawa 1994 without the thin term).
 * Since ν = α c_s^2/Ω = α k T/(μ m_H Ω) is itself ∝ T, T_visc^4 = A·T and each cell solves T^4 = A T + C.
 */
import { AU_CGS, K_BOLTZMANN_CGS, L_SUN_CGS, MEAN_MOLECULAR_WEIGHT, M_HYDROGEN_CGS, SIGMA_SB_CGS } from '../../../shared/constants.js';

/** k/(μ m_H): c_s^2 = SOUND_SPEED2_PER_K · T, cm^2 s^-2 K^-1. */
export const SOUND_SPEED2_PER_K = K_BOLTZMANN_CGS / (MEAN_MOLECULAR_WEIGHT * M_HYDROGEN_CGS);

/** T_irr^4 in K^4 (Hayashi 1981). */
export function irradiationTemperature4(radiusCm: number, luminosityErgS: number): number {
  const t1 = 280;
  return t1 ** 4 * (AU_CGS / radiusCm) ** 2 * (luminosityErgS / L_SUN_CGS);
}

/** Coefficient A in T_visc^4 = A·T, K^3: A = (27/64) κ Σ^2 α Ω k / (μ m_H σ_SB). */
export function viscousHeatingCoefficient(kappa: number, sigma: number, alpha: number, omega: number): number {
  return ((27 / 64) * kappa * sigma * sigma * alpha * omega * SOUND_SPEED2_PER_K) / SIGMA_SB_CGS;
}

/**
 * The positive root T* of f(T) = T^4 − A T − C (A, C ≥ 0) by Newton's method. f is convex for T > 0 and f′ > 0
 * at and above T*, so Newton from any point above T* descends monotonically onto it, and quickly from within 2T*.
 * The start: `guess` (a nearby temperature, e.g. the one the caller evaluated A at) when f(guess) ≥ 0 (it lies
 * above T*) and T^4 ≤ 8 (A T + C) there (it lies within 2T*: at T = kT*, k ≥ 1, A T + C ≤ k T*^4, so the ratio is
 * ≥ k³); else one Newton step from a guess below T*, which lands above T* (the tangent of a convex f lies below
 * f) when f′ > 0 there, taken when it lands within twice the guess (so within 2T*); else T_0 = C^{1/4} + A^{1/3}
 * ((a+b)^4 ≥ a^4 + b^3 (a+b) for a, b ≥ 0), also within 2T*. A guess within a few per cent saves the cube root
 * and two of the ~5 steps from T_0. Converges to a relative 1e-13; the last bits of T* depend on the start.
 */
export function solveMidplaneTemperature(a: number, c: number, guess = NaN): number {
  if (a === 0 && c === 0) return 0;
  let t = NaN;
  if (guess > 0 && guess < Infinity) {
    const g3 = guess * guess * guess;
    const heat = a * guess + c;
    const f = g3 * guess - heat;
    const start = f >= 0 ? guess : guess - f / (4 * g3 - a);
    if (f <= 7 * heat && start >= guess && start <= 2 * guess) t = start;
  }
  if (!(t > 0)) t = Math.sqrt(Math.sqrt(c)) + Math.cbrt(a);
  for (let k = 0; k < 60; k++) {
    const t3 = t * t * t;
    const step = (t3 * t - a * t - c) / (4 * t3 - a);
    t -= step;
    if (step <= 1e-13 * t) break;
  }
  return t;
}
