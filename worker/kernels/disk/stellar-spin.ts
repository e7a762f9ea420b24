/**
 * Spin angular momentum the star keeps, J_spin = k^2 M_* R_*^2 Ω_*, with Ω_* = 2π/P_* for a disk-locked star
 * (common practice: magnetic star–disk coupling holds young stars near a period of about a week) and never
 * above breakup Ω_break = (G M_* / R_*^3)^{1/2}. Everything else the star accretes is removed by star–disk
 * torques and stellar winds; the model books it as such.
 */
import { G_CGS } from '../../../shared/constants.js';

export function spinAngularMomentum(k2: number, mStar: number, rStar: number, period: number): number {
  const omega = Math.min((2 * Math.PI) / period, Math.sqrt((G_CGS * mStar) / rStar ** 3));
  return k2 * mStar * rStar * rStar * omega;
}
