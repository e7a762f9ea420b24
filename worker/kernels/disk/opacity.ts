/**
 * Rosseland-mean opacity laws κ(ρ, T). The thermal solve asks an `Opacity` for κ at the current midplane
 * state, so piecewise power laws (Bell & Lin 1994, κ = κ_0 ρ^a T^b per regime) plug in beside the constant one.
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
