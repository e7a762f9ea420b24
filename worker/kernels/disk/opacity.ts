/**
 * Rosseland-mean opacity laws κ(ρ, T). The thermal solve asks an `Opacity` for κ at the current midplane
 * state, so piecewise power laws (Bell & Lin 1994, κ = κ_0 ρ^a T^b per regime) plug in beside the constant one.
 *
 * Requirement: the temperature solve (transport-coefficients.ts, numerics/root-finding.ts) needs the heating
 * balance T_eq(T) not to increase with T. A law whose κ rises with T (at fixed Σ; ρ falls as T^-1/2) can break
 * that, since more optical depth over the same heating makes the midplane hotter: where T_eq(T) rises with slope
 * below 1 the solve creeps towards the root and may stop short of it; above 1 plain iteration runs away from it.
 * Either way the solve returns NaN when it does not converge, and the run ends with a failure status rather than
 * with a wrong temperature; a law that needs such regimes needs a different solve.
 */
export interface Opacity {
  readonly name: string;
  /** κ in cm^2 g^-1 at midplane density ρ (g cm^-3) and temperature T (K). */
  kappa(rho: number, temperature: number): number;
  /** True when κ depends on neither ρ nor T: the thermal solve then needs no outer iteration for κ. */
  readonly isConstant: boolean;
}

export function constantOpacity(kappaCm2G: number): Opacity {
  return { name: 'constant', kappa: () => kappaCm2G, isConstant: true };
}
