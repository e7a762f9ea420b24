/**
 * Galactic cosmic rays: ionization attenuated as exp(−Σ_face/96 g cm^-2) with the mass column Σ_face between
 * the point and the face (Umebayashi & Nakano 1981).
 *
 * Per-face factor ½: `zetaCr` is the interstellar rate per H₂ (1e-17 s^-1 by default, Umebayashi & Nakano
 * 1981), which comes from the whole sky; the gas at a face of a thick disk sees only the half of the sky
 * above that face, so each face contributes (ζ_CR/2) exp(−Σ_face/96) and a thin column, lit from both sides,
 * gets ζ_CR back. ζ_CR is a parameter because stellar winds and magnetic fields can exclude cosmic rays.
 */

/** Attenuation column of cosmic-ray ionization, g cm^-2 (Umebayashi & Nakano 1981). */
export const COSMIC_RAY_ATTENUATION_G_CM2 = 96;

/** Rate per H₂ from ONE face, s^-1, at mass column `faceColumn` (g cm^-2) from it. */
export function cosmicRayRateFace(zetaCr: number, faceColumn: number): number {
  return 0.5 * zetaCr * Math.exp(-faceColumn / COSMIC_RAY_ATTENUATION_G_CM2);
}

/** Rate per H₂ from BOTH faces, s^-1, at columns `near` and `far` (g cm^-2) from the two faces. */
export function cosmicRayRate(zetaCr: number, near: number, far: number): number {
  return cosmicRayRateFace(zetaCr, near) + cosmicRayRateFace(zetaCr, far);
}
