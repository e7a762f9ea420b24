/**
 * The star's luminosity as the disk's irradiation sees it: L_* = L_phot + L_acc, with the accretion luminosity
 * of gas that falls from the disk's inner edge R_in onto the star, L_acc = G M_* Ṁ_* /R_* (1 − R_* /R_in)
 * (Gullbring et al. 1998, eq. 8, from memory; with the usual R_in ≈ 5 R_* the factor is 0.8). Irradiation follows it through
 * T_irr⁴ ∝ L_* (Hayashi 1981; thermal-structure.ts).
 */
import { G_CGS, L_SUN_CGS } from '../../../shared/constants.js';
import type { DiskGrid } from './grid.js';
import { irradiationTemperature4 } from './thermal-structure.js';

/** erg s^-1, from M_* (g), Ṁ_* (g s^-1), R_* and R_in (cm). */
export function accretionLuminosity(mStar: number, mdot: number, rStar: number, rIn: number): number {
  return ((G_CGS * mStar * mdot) / rStar) * (1 - rStar / rIn);
}

export interface LuminositySetup {
  /** Photospheric luminosity, erg s^-1. */
  readonly lPhot: number;
  /** Add L_acc to the irradiating luminosity. */
  readonly accretion: boolean;
  /** Memory of the irradiating L_acc, s: it relaxes toward its instantaneous value on this time (0 = at once). */
  readonly accretionMemory: number;
  /** Stellar radius, cm. */
  readonly rStar: number;
  /** T_floor^4, K^4. */
  readonly floor4: number;
}

/**
 * L_acc after a step of length dt: exponential relaxation toward the instantaneous value with time scale
 * `memory` (exact for a constant target over the step). Without it, a disk whose MRI switch sits on the
 * irradiation temperature feeds back on itself within one step (Mdot → L_acc → T → activity → Mdot) and flickers.
 */
export function relaxedAccretionLuminosity(previous: number, instantaneous: number, dt: number, memory: number): number {
  if (!(memory > 0)) return instantaneous;
  return instantaneous + (previous - instantaneous) * Math.exp(-dt / memory);
}

/** T_irr^4 per cell at one solar luminosity, K^4 (the irradiation is linear in L_*). */
export function irradiationPerLsun(grid: DiskGrid): Float64Array {
  return grid.centers.map((r) => irradiationTemperature4(r, L_SUN_CGS));
}

/** T_irr^4(L_*) + T_floor^4 per cell into `out`. */
export function fillBaseTemperature4(perLsun: Float64Array, luminosity: number, floor4: number, out: Float64Array): void {
  const l = luminosity / L_SUN_CGS;
  for (let i = 0; i < out.length; i++) out[i] = perLsun[i] * l + floor4;
}
