/**
 * Ohmic resistivity and the MRI-activity criterion.
 * - Diffusivity η = 234 (T/K)^{1/2} / x_e cm² s^-1 (Blaes & Balbus 1994; the electron–neutral collision
 *   rate of Draine, Roberge & Dalgarno 1983; from memory).
 * - Criterion, selectable:
 *   Magnetic Reynolds number Re = c_s H / η = c_s²/(Ω η) above a threshold (Gammie 1996 uses Re ≳ 1; common practice);
 *   Ohmic Elsasser number Λ = v_A²/(η Ω) above a threshold (Turner, Sano & Dziourkevitch 2007; Bai & Goodman
 *   2009 use Λ ≳ 1; from memory), with a field uniform in height of midplane plasma β₀ = 8π ρ₀ c_s²/B², so
 *   v_A² = B²/(4πρ) = 2 c_s² ρ₀/(β₀ ρ), and Λ = Re · 2ρ₀/(β₀ ρ).
 */

export type ActivityCriterion =
  | { readonly kind: 'reynolds'; readonly threshold: number }
  | { readonly kind: 'elsasser'; readonly threshold: number; readonly betaMidplane: number };

/** η in cm² s^-1 from T (K) and x_e. */
export function ohmicDiffusivity(temperature: number, xe: number): number {
  return (234 * Math.sqrt(temperature)) / xe;
}

/** Re = c_s²/(Ω η). */
export function magneticReynolds(soundSpeed2: number, omega: number, eta: number): number {
  return soundSpeed2 / (omega * eta);
}

/** Λ = 2 c_s² ρ₀ / (β₀ ρ η Ω). */
export function ohmicElsasser(soundSpeed2: number, omega: number, eta: number, densityRatio: number, betaMidplane: number): number {
  return (2 * soundSpeed2) / (betaMidplane * densityRatio * eta * omega);
}

/** The criterion's number (Re or Λ) at a point with density ρ/ρ₀ = `densityRatio`. */
export function activityNumber(criterion: ActivityCriterion, soundSpeed2: number, omega: number, eta: number, densityRatio: number): number {
  return criterion.kind === 'reynolds'
    ? magneticReynolds(soundSpeed2, omega, eta)
    : ohmicElsasser(soundSpeed2, omega, eta, densityRatio, criterion.betaMidplane);
}
