/**
 * Stellar X-ray ionization: the Bai & Goodman (2009, ApJ 701, 737; eq. 21) fit to the Monte-Carlo transfer
 * results of Igea & Glassgold (1999) for a thermal X-ray spectrum of temperature kT_X:
 *
 *   ζ_X = (L_X / 10²⁹ erg s⁻¹) (r/AU)^{-2.2} Σ_faces [ ζ₁ exp(−(N/N₁)^α) + ζ₂ exp(−(N/N₂)^β) ],
 *
 * N being the column of H nuclei between the point and the face (one term pair per face; the published fit
 * is the sum over both faces). The first pair is the directly absorbed component, the second the part
 * Compton-scattered deeper into the disk.
 *
 * Per H or per H₂: Igea & Glassgold quote rates per H nucleus; the coefficients as published in eq. 21 carry
 * the factor 2 already and give the rate per H₂ molecule, this kernel's convention (gas-composition.ts), so
 * they are used as they stand. Evidence (the paper's own text could not be opened here): a public
 * astrochemistry module that implements this fit (citing it as "fitting formula from Bai & Goodman (2009)")
 * holds per-H rows ζ₁ = 3.0e-12, ζ₂ = 0.5e-15 (3 keV) and 2.0e-12, 1.5e-15 (5 keV) and multiplies
 * the sum by 2 before it joins the per-H₂ cosmic-ray rate; an independent script quoting the paper gives
 * ζ₁ = 6e-12, ζ₂ = 1e-15 for 3 keV, which is that ×2. The 5 keV row below is the per-H row of that module ×2;
 * the paper's printed 5 keV numbers were not seen.
 */
import { AU_CGS } from '../../../shared/constants.js';

/** One coefficient row of the fit (rates per H₂ molecule, per face, at L_X = 1e29 erg s^-1 and 1 AU). */
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

/** kT_X = 3 keV (Bai & Goodman 2009, eq. 21, as quoted by two secondary sources; not checked against the paper's table): ζ₁ = 6.0e-12 s^-1, N₁ = 1.5e21 cm^-2, α = 0.4; ζ₂ = 1.0e-15 s^-1, N₂ = 7.0e23 cm^-2, β = 0.65. */
export const XRAY_FIT_3KEV: XrayFitRow = {
  kTKev: 3, zeta1: 6.0e-12, n1: 1.5e21, alpha: 0.4, zeta2: 1.0e-15, n2: 7.0e23, beta: 0.65,
};

/** kT_X = 5 keV (Bai & Goodman 2009; per-H row of that public module ×2; not checked against the paper's table): ζ₁ = 4.0e-12, N₁ = 3.0e21, α = 0.5; ζ₂ = 3.0e-15, N₂ = 1.0e24, β = 0.7. */
export const XRAY_FIT_5KEV: XrayFitRow = {
  kTKev: 5, zeta1: 4.0e-12, n1: 3.0e21, alpha: 0.5, zeta2: 3.0e-15, n2: 1.0e24, beta: 0.7,
};

/** Luminosity and distance scaling (L_X/10^29)(r/AU)^-2.2 of the per-H₂ rows. */
export function xrayScale(lxErgS: number, radiusCm: number): number {
  return (lxErgS / 1e29) * Math.exp(-2.2 * Math.log(radiusCm / AU_CGS));
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
