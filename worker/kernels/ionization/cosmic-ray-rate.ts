/**
 * Galactic cosmic rays: ionization attenuated as exp(−Σ_face/96 g cm^-2) with the mass column Σ_face between
 * the point and the face (Umebayashi & Nakano 1981).
 *
 * Convention: each face contributes the FULL attenuated rate ζ_CR exp(−Σ_face/96), with ζ_CR the interstellar
 * rate per H₂ (1e-17 s^-1 by default, Umebayashi & Nakano 1981), and the two faces add. This is Umebayashi &
 * Nakano's law applied from each side, as the layered-accretion literature does (Gammie 1996; Bai & Goodman
 * 2009; a public astrochemistry module implementing their fit sums ζ_CR [exp(−Σ₁/96) + exp(−Σ₂/96)]), and it makes the rate
 * at a face column of 96 g cm^-2 exactly ζ_CR/e from that face. A thin column lit from both faces then gets up
 * to 2 ζ_CR; there X-rays and the FUV layer dominate anyway. (The other convention in use, ζ_CR/2 per face
 * so that a thin column gets ζ_CR back, would move every cosmic-ray layer boundary up by 96 ln 2 ≈ 67 g cm^-2.)
 * ζ_CR is a parameter because stellar winds and magnetic fields can exclude cosmic rays.
 */

/** Attenuation column of cosmic-ray ionization, g cm^-2 (Umebayashi & Nakano 1981). */
export const COSMIC_RAY_ATTENUATION_G_CM2 = 96;

/** Rate per H₂ from ONE face, s^-1, at mass column `faceColumn` (g cm^-2) from it. */
export function cosmicRayRateFace(zetaCr: number, faceColumn: number): number {
  return zetaCr * Math.exp(-faceColumn / COSMIC_RAY_ATTENUATION_G_CM2);
}

/** Rate per H₂ from BOTH faces, s^-1, at columns `near` and `far` (g cm^-2) from the two faces. */
export function cosmicRayRate(zetaCr: number, near: number, far: number): number {
  return cosmicRayRateFace(zetaCr, near) + cosmicRayRateFace(zetaCr, far);
}
