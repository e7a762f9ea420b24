/**
 * Thermal inertia of the midplane: the one-zone energy equation of a thin disk (Pringle 1981, ARA&A 19, 137;
 * Frank, King & Raine 2002, "Accretion Power in Astrophysics", ch. 5 — both from memory for the exact form)
 *
 *   Σ c_v dT/dt = Q⁺ − Q⁻,   Q⁻ = 2σT_eff⁴ = (16/3) σT⁴/(κΣ)   (optically thick: T⁴ = (3τ/4) T_eff⁴, τ = κΣ/2),
 *
 * with the heating written so that Q⁺ = Q⁻ is exactly the midplane temperature of thermal-structure.ts,
 * T⁴ = A T + C: viscous heating (9/4) νΣΩ² = (16σ/(3κΣ)) A T, and the irradiation and floor terms C taken as
 * heat reprocessed at the same optical depth (16σ/(3κΣ)) C. Hence
 *
 *   dT/dt = k (A T + C − T⁴),   k = 16σ / (3 κ Σ² c_v),   c_v = k_B / ((γ − 1) μ m_H),  γ = 7/5,
 *
 * and the cooling time is t_cool = Σ c_v T / Q⁻ = 1/(k T³) = 3κΣ²c_v/(16σT³). Where viscous heating holds the
 * balance, t_cool = 4/(9(γ−1) α Ω) ≈ 1/(αΩ): the thermal time scale, shorter than the viscous one by (H/R)²
 * (Pringle 1981). Near a dead-zone edge at 0.2–0.3 AU (Σ ~ 10³ g cm⁻², T ~ 1000 K, κ = 1 cm² g⁻¹) it is
 * 10–300 yr, not zero: a cell that crosses the MRI threshold heats or cools on that time, so the edge moves on
 * a physical time and a thermal–viscous cycle, if there is one, is an outburst with a rise time instead of a
 * switch that flips every step.
 *
 * One step of length dt is backward Euler with A (i.e. α) taken from the start of the step:
 *   T − T_old = h (A T + C − T⁴),  h = k dt.
 * g(T) = hT⁴ + (1 − hA)T − T_old − hC is convex on T > 0 with g(0) < 0, so it has exactly one positive root,
 * and it lies between T_old and the equilibrium T_eq (g(T_old) = h(T_old⁴ − AT_old − C), g(T_eq) = T_eq − T_old:
 * opposite signs). Newton from the larger of the two descends onto it monotonically. The scheme is L-stable:
 * dt ≫ t_cool gives T_eq, dt ≪ t_cool keeps T_old; it never overshoots the equilibrium.
 */
import { SIGMA_SB_CGS } from '../../../shared/constants.js';
import { GAMMA_ADIABATIC } from './gravitational-instability.js';
import { SOUND_SPEED2_PER_K, solveMidplaneTemperature } from './thermal-structure.js';

/** Specific heat at constant volume, erg g^-1 K^-1: c_v = (k_B/μ m_H)/(γ − 1). */
export const SPECIFIC_HEAT_CGS = SOUND_SPEED2_PER_K / (GAMMA_ADIABATIC - 1);

/** k of dT/dt = k (A T + C − T⁴), K^-3 s^-1; Infinity for an empty cell (no heat capacity: T is the equilibrium). */
export function coolingRateCoefficient(kappa: number, sigma: number): number {
  return (16 * SIGMA_SB_CGS) / (3 * kappa * sigma * sigma * SPECIFIC_HEAT_CGS);
}

/** Cooling time t_cool = 1/(k T³), s. */
export function coolingTime(kappa: number, sigma: number, temperature: number): number {
  return 1 / (coolingRateCoefficient(kappa, sigma) * temperature ** 3);
}

/**
 * Newton descent onto the positive root of p t⁴ + (b − e) t − s − u from a start t to the right of it (where the
 * quartic is ≥ 0): the convex quartic then decreases monotonically onto the root. The terms are passed apart so
 * that the unscaled form evaluates exactly as it always has (its outputs are pinned bit for bit).
 */
function descendOntoRoot(p: number, b: number, e: number, s: number, u: number, start: number): number {
  let t = start;
  for (let k = 0; k < 60; k++) {
    const t3 = t * t * t;
    const g = p * t3 * t + (b - e) * t - s - u;
    const step = g / (4 * p * t3 + b - e);
    t -= step;
    if (!(step > 1e-13 * t)) break;
  }
  return t;
}

// Above this size of the h-scaled terms the equation is solved divided by h (numerical choice, common practice,
// no source): h T⁴ would overflow near 1.8e308 (a nearly empty cell has k ∝ 1/Σ², so h can be ~1e300).
const SCALED_TERMS_MAX = 1e300;

/**
 * Midplane temperature after one backward-Euler step of the energy equation: h = k dt, T_old the temperature
 * at the start of the step, tEq the equilibrium root of T⁴ = A T + C (solveMidplaneTemperature). Non-finite
 * or negative-free inputs with h = Infinity (or no previous temperature) give tEq.
 */
export function relaxTemperature(a: number, c: number, tOld: number, h: number, tEq: number): number {
  if (!(h < Infinity) || !(tOld > 0)) return tEq;
  if (!(h > 0)) return tOld;
  const m = Math.max(tOld, tEq);
  // Every h-scaled term of g and g' along the descent (t ≤ m; A ≤ T_eq³ and C ≤ T_eq⁴ at the equilibrium) is at
  // most 4 h m³ max(m, 1): below the bound, g as written.
  if (4 * h * m * m * m * Math.max(m, 1) < SCALED_TERMS_MAX) return descendOntoRoot(h, 1, h * a, tOld, h * c, m);
  // g/h = T⁴ + (1/h − A) T − T_old/h − C, the same root. Its start: the smaller of m and the root u of
  // u⁴ = A u + C + T_old/h, where g(u) = u > 0 (both lie right of the root); from m alone the descent, which
  // shrinks t by about 3/4 per step while T⁴ dominates, would not reach a root of ~(T_old/h)^(1/4) in 60 steps.
  const hInv = 1 / h;
  const start = Math.min(m, solveMidplaneTemperature(a, c + tOld * hInv));
  return descendOntoRoot(1, hInv, a, tOld * hInv, c, start);
}
