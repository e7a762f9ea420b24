/**
 * The electron fraction x_e = n_e/n_H₂ from the chosen chemistry: (a) molecular ions, (b) with metals
 * (recombination.ts), and optionally (c) the thermally ionized alkali metals (saha.ts), joined by charge
 * neutrality n_e = n_m⁺ + n_M⁺ + Σ_k n_k⁺.
 *
 * With alkalis, for a trial x the non-thermal ions follow from their balances at that x (molecular ions:
 * ζ/n = β x m + β_t m (x_M − y); metal ions: β_t m (x_M − y) = β_rr x y, a quadratic in m), the alkali ions from
 * Saha, n_k⁺/n = A_k S_k/(x n + S_k). Every ion fraction falls as x rises, so h(x) = m + y + Σ_k − x is strictly
 * decreasing and has one root. It lies in [x_a, √(ζ/(n β_rr)) + x_M + Σ_k A_k]: at x_a = √(ζ/(β n)) the
 * molecular and metal ions alone give m + y ≥ x_a, and above the upper end their total recombination exceeds
 * ionization. Grain-free chemistry throughout: dust would lower x_e (validity limit; see README).
 */
import { CHARGE_TRANSFER_CM3_S, dissociativeRecombination, metalElectronFraction, molecularElectronFraction, radiativeRecombination } from './recombination.js';
import { brentRoot } from '../numerics/root-finding.js';
import { sahaFactor, type SahaElement } from './saha.js';

export type Chemistry = { readonly kind: 'molecular' } | { readonly kind: 'metals'; readonly xMetal: number };

/** Alkali metals with their Saha factors S_k (cm^-3) at the column's temperature. */
export interface ThermalIons {
  readonly elements: readonly SahaElement[];
  readonly sahaS: Float64Array;
}

export function thermalIons(elements: readonly SahaElement[], temperature: number): ThermalIons {
  return { elements, sahaS: Float64Array.from(elements, (e) => sahaFactor(temperature, e.chi, e.weightRatio)) };
}

/** Electron fraction of the non-thermal chemistry alone, (a) or (b). */
export function chemistryElectronFraction(zeta: number, nH2: number, temperature: number, chemistry: Chemistry): number {
  return chemistry.kind === 'molecular'
    ? molecularElectronFraction(zeta, nH2, temperature)
    : metalElectronFraction(zeta, nH2, temperature, chemistry.xMetal);
}

/**
 * x_e from (a)/(b) plus the thermal ions (c) when `thermal` is given and matters: when even at x_a the alkali ions
 * are below 1e-15 of x_a (cool gas: at 300 K, S_K ~ 1e-54 cm^-3), they are left out and (a)/(b) is returned.
 */
export function electronFraction(
  zeta: number,
  nH2: number,
  temperature: number,
  chemistry: Chemistry,
  thermal: ThermalIons | null,
): number {
  const base = chemistryElectronFraction(zeta, nH2, temperature, chemistry);
  if (thermal === null) return base;
  const { elements, sahaS } = thermal;
  let alkaliMax = 0;
  let bound = 0;
  for (let k = 0; k < elements.length; k++) {
    alkaliMax += elements[k].abundancePerH2;
    bound += elements[k].abundancePerH2 * sahaS[k];
  }
  const xa = Math.sqrt(zeta / (dissociativeRecombination(temperature) * nH2));
  // Σ_k A_k S_k/(x n + S_k) ≤ Σ_k A_k S_k/(x n): negligible at every x ≥ x_a when this is.
  if (xa > 0 && bound / (xa * nH2) < 1e-15 * xa) return base;

  const beta = dissociativeRecombination(temperature);
  const betaR = radiativeRecombination(temperature);
  const betaT = CHARGE_TRANSFER_CM3_S;
  const xMetal = chemistry.kind === 'metals' ? chemistry.xMetal : 0;
  const a = zeta / nH2;
  const h = (lnX: number): number => {
    const x = Math.exp(lnX);
    let ions = 0;
    if (a > 0) {
      // Positive root of A m² + B m − C = 0, in the form that does not cancel.
      const qa = beta * betaT * x;
      const qb = beta * betaR * x * x + betaT * betaR * x * xMetal - a * betaT;
      const qc = a * betaR * x;
      const disc = Math.sqrt(qb * qb + 4 * qa * qc);
      const m = qb >= 0 ? (2 * qc) / (qb + disc) : (disc - qb) / (2 * qa);
      const y = xMetal > 0 ? (betaT * m * xMetal) / (betaR * x + betaT * m) : 0;
      ions = m + y;
    }
    const ne = x * nH2;
    for (let k = 0; k < elements.length; k++) ions += (elements[k].abundancePerH2 * sahaS[k]) / (ne + sahaS[k]);
    return ions / x - 1;
  };
  const lo = xa > 0 ? xa : 1e-300;
  const hi = Math.sqrt(a / betaR) + xMetal + alkaliMax;
  if (!(hi > lo)) return base;
  const hLo = h(Math.log(lo));
  const hHi = h(Math.log(hi));
  if (!(hLo > 0)) return lo;
  return Math.exp(brentRoot(h, Math.log(lo), Math.log(hi), hLo, hHi, 1e-13).x);
}
