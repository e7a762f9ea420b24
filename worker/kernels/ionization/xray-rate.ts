/**
 * Stellar X-ray ionization: the Bai & Goodman (2009, ApJ 701, 737; eq. 21 and the text after it) fit to the
 * Monte-Carlo transfer results of Igea & Glassgold (1999) for a thermal X-ray spectrum:
 *
 *   ζ_X = (L_X / 10²⁹ erg s⁻¹) (r/AU)^{-2.2} Σ_faces [ ζ₁ exp(−(N/N₁)^α) + ζ₂ exp(−(N/N₂)^β) ],
 *
 * N being the column of H nuclei between the point and the face (one term pair per face; the published fit
 * is the sum over both faces). The first pair is the directly absorbed component, the second the part
 * Compton-scattered deeper into the disk.
 *
 * Per H or per H₂: the fit is quoted, like Igea & Glassgold's rates, per H nucleus (from memory); this
 * kernel's rates are per H₂ molecule, so it is doubled (gas-composition.ts).
 */
import { AU_CGS } from '../../../shared/constants.js';
import { PER_H_TO_PER_H2 } from './gas-composition.js';

/** One published coefficient row of the fit (rates per H nucleus). */
export interface XrayFitRow {
  /** Temperature of the thermal X-ray spectrum, keV. */
  readonly kTKev: number;
  /** Absorbed component: rate at the face, s^-1, and its column scale, cm^-2, and exponent. */
  readonly zeta1: number;
  readonly n1: number;
  readonly alpha: number;
  /** Scattered component: rate, s^-1, column scale, cm^-2, exponent. */
  readonly zeta2: number;
  readonly n2: number;
  readonly beta: number;
}

/**
 * kT_X = 5 keV row (Bai & Goodman 2009, text after eq. 21; from memory): ζ₁ = 6.0e-12 s^-1, N₁ = 1.5e21 cm^-2,
 * α = 0.4; ζ₂ = 1.0e-15 s^-1, N₂ = 7.0e23 cm^-2, β = 0.65. The 3 keV row of the same paper is not given here:
 * its numbers could not be checked against the paper, and an unchecked row would be worse than none.
 */
export const XRAY_FIT_5KEV: XrayFitRow = {
  kTKev: 5, zeta1: 6.0e-12, n1: 1.5e21, alpha: 0.4, zeta2: 1.0e-15, n2: 7.0e23, beta: 0.65,
};

/** Luminosity and distance scaling (L_X/10^29)(r/AU)^-2.2, per H₂ (the factor 2 included). */
export function xrayScale(lxErgS: number, radiusCm: number): number {
  return PER_H_TO_PER_H2 * (lxErgS / 1e29) * Math.exp(-2.2 * Math.log(radiusCm / AU_CGS));
}

/** A row with the logarithms of its column scales taken once (the fit is evaluated millions of times). */
export interface PreparedXrayFit {
  readonly row: XrayFitRow;
  readonly lnN1: number;
  readonly lnN2: number;
}

export function prepareXrayFit(row: XrayFitRow): PreparedXrayFit {
  return { row, lnN1: Math.log(row.n1), lnN2: Math.log(row.n2) };
}

/**
 * ζ_X per H₂ from ONE face, s^-1, at H-nucleus column `column` (cm^-2) from that face, given the scale of
 * `xrayScale`. (N/N*)^a is written exp(a ln(N/N*)): cheaper than a general power, and exact at N = 0.
 */
export function xrayRateFace(scale: number, column: number, fit: PreparedXrayFit): number {
  const { row } = fit;
  if (!(column > 0)) return scale * (row.zeta1 + row.zeta2);
  const lnN = Math.log(column);
  const absorbed = row.zeta1 * Math.exp(-Math.exp(row.alpha * (lnN - fit.lnN1)));
  const scattered = row.zeta2 * Math.exp(-Math.exp(row.beta * (lnN - fit.lnN2)));
  return scale * (absorbed + scattered);
}

/** ζ_X per H₂ from BOTH faces, s^-1: H-nucleus columns to the near and the far face (cm^-2). */
export function xrayRate(scale: number, columnNear: number, columnFar: number, fit: PreparedXrayFit): number {
  return xrayRateFace(scale, columnNear, fit) + xrayRateFace(scale, columnFar, fit);
}
