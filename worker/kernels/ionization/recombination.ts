/**
 * Gas-phase recombination chemistry without grains (ionization rate ζ per H₂, n = n_H₂, x = n_e/n_H₂; see
 * gas-composition.ts). Two schemes:
 *
 * (a) Molecular ions only: H₂ → m⁺ + e at ζ n, removed by dissociative recombination m⁺ + e → neutrals at
 *     β_dr = 3e-6 (T/K)^{-1/2} cm³ s⁻¹. Balance ζ n = β_dr n_e n_m⁺ with n_e = n_m⁺: x = √(ζ/(β_dr n)).
 * (b) With gas-phase metal atoms M of abundance x_M (per H₂), the Oppenheimer & Dalgarno (1974) model:
 *     charge transfer m⁺ + M → m + M⁺ at β_t = 3e-9 cm³ s⁻¹, radiative recombination M⁺ + e → M + hν at
 *     β_rr = 3e-11 (T/K)^{-1/2} cm³ s⁻¹ (rate coefficients as used by Fromang, Terquem & Balbus 2002; from
 *     memory). Metal ions recombine 10⁵ times slower than molecular ions, so a little metal raises x_e a lot.
 *
 * Scheme (b) is solved for the metal-ion fraction y = n_M⁺/n (see `metalElectronFraction`); at x_M = 0 the
 * bracket is the single point y = 0 and x is (a) to round-off.
 */
import { brentRoot } from '../numerics/root-finding.js';

/** Dissociative recombination of molecular ions, cm³ s^-1, T in K (issue-given; Oppenheimer & Dalgarno 1974). */
export function dissociativeRecombination(temperature: number): number {
  return 3e-6 / Math.sqrt(temperature);
}

/** Radiative recombination of metal ions, cm³ s^-1, T in K (Oppenheimer & Dalgarno 1974; from memory). */
export function radiativeRecombination(temperature: number): number {
  return 3e-11 / Math.sqrt(temperature);
}

/** Charge transfer from molecular ions to metal atoms, cm³ s^-1 (Oppenheimer & Dalgarno 1974; from memory). */
export const CHARGE_TRANSFER_CM3_S = 3e-9;

/** (a): x_e = √(ζ/(β_dr n_H₂)). */
export function molecularElectronFraction(zeta: number, nH2: number, temperature: number): number {
  return Math.sqrt(zeta / (dissociativeRecombination(temperature) * nH2));
}

/**
 * (b): steady state of
 *   ζ/n = β x m + β_t m (x_M − y)        (molecular ions: made by ζ; lost to electrons and charge transfer)
 *   β_t m (x_M − y) = β_rr x y           (metal ions: made by charge transfer; lost by radiative recombination)
 *   x = m + y                            (charge neutrality)
 * with m = n_m⁺/n. Adding the first two, ζ/n = x(β m + β_rr y); with m = x − y this gives x(y) in closed form,
 * x = [D y + √(D² y² + 4β ζ/n)]/(2β), D = β − β_rr. What is left, g(y) = β_t (x − y)(x_M − y) − β_rr x y, is
 * strictly decreasing on 0 ≤ y ≤ min(x_M, √(ζ/(n β_rr))) (x − y and x_M − y fall, x y rises) with g(0) ≥ 0
 * and g < 0 at the upper end, so it has exactly one root there.
 */
export function metalElectronFraction(zeta: number, nH2: number, temperature: number, xMetal: number): number {
  const beta = dissociativeRecombination(temperature);
  const betaR = radiativeRecombination(temperature);
  const a = zeta / nH2;
  const dd = beta - betaR;
  const xOf = (y: number): number => (dd * y + Math.sqrt(dd * dd * y * y + 4 * beta * a)) / (2 * beta);
  const g = (y: number): number => {
    const x = xOf(y);
    return CHARGE_TRANSFER_CM3_S * (x - y) * (xMetal - y) - betaR * x * y;
  };
  const yMax = Math.min(xMetal, Math.sqrt(a / betaR));
  if (!(yMax > 0)) return xOf(0);
  const g0 = g(0);
  const gMax = g(yMax);
  // Work in y/yMax so the tolerance is relative to the metal abundance.
  const root = brentRoot((u) => g(u * yMax), 0, 1, g0, gMax, 1e-14);
  return xOf(root.x * yMax);
}
