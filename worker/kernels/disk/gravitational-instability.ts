/**
 * Gravitational-instability transport as a local α.
 * Toomre (1964) Q = c_s Ω / (π G Σ) for a gas disk; where Q < Q_crit,
 *   α_GI = 0.01 [(Q_crit/Q)^2 − 1], capped,
 * the Lin & Pringle (1987) form with the normalisation of Armitage, Livio & Pringle (2001) (from memory).
 * Written with (Q_crit/Q)^2 = (Q_crit π G Σ / (c_s Ω))^2 so an empty cell (Σ = 0, Q = ∞) needs no division.
 */
import { G_CGS } from '../../../shared/constants.js';

export function toomreQ(soundSpeed: number, omega: number, sigma: number): number {
  return sigma > 0 ? (soundSpeed * omega) / (Math.PI * G_CGS * sigma) : Infinity;
}

export function alphaGravitationalInstability(
  soundSpeed: number,
  omega: number,
  sigma: number,
  qCrit: number,
  alphaMax: number,
): number {
  const ratio = (qCrit * Math.PI * G_CGS * sigma) / (soundSpeed * omega);
  const ratio2 = ratio * ratio;
  return ratio2 > 1 ? Math.min(alphaMax, 0.01 * (ratio2 - 1)) : 0;
}

/**
 * Gammie (2001) fragmentation criterion: a disk with Q ≲ 1 fragments when it cools faster than
 * t_cool Ω ≈ 3. The cooling time is the thermal energy per area Σ c_s^2/(γ − 1) over the radiated flux
 * 2σT^4/(3τ/4 + 1/τ), an optically thick/thin interpolation (common practice, no single source), with
 * γ = 7/5 and τ = κΣ/2. It is a flag for a regime the 1-D model cannot follow, not a model of fragmentation.
 */
export const FRAGMENTATION_BETA = 3;
/** Adiabatic index of the H₂-dominated gas (rotation excited, vibration not), common practice. */
export const GAMMA_ADIABATIC = 1.4;

export function coolingTimeOmega(
  sigma: number,
  soundSpeed: number,
  temperature: number,
  kappa: number,
  omega: number,
  sigmaSb: number,
): number {
  const tau = 0.5 * kappa * sigma;
  if (!(tau > 0) || !(temperature > 0)) return Infinity;
  const energy = (sigma * soundSpeed * soundSpeed) / (GAMMA_ADIABATIC - 1);
  const flux = (2 * sigmaSb * temperature ** 4) / (0.75 * tau + 1 / tau);
  return (energy / flux) * omega;
}
