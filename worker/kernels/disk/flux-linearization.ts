/**
 * Newton linearisation of the viscous flux for the implicit step. The transport equation moves G = νΣ; the
 * lagged scheme takes G' ≈ ν Σ' (ν from the start of the step), which is right only where ν does not depend on
 * Σ. Where it rises steeply with Σ — across the thermal MRI switch (α jumps ~100-fold over a few per cent in
 * Σ), under gravitational instability (α_GI ∝ Σ²), with viscous heating (T ∝ Σ^{2/3}) — the true diffusion
 * coefficient is dG/dΣ = ν + Σ dν/dΣ ≫ ν: the lagged step underestimates it, overshoots, and the step control
 * then crawls (or the state flickers from step to step). The linearised implicit flux
 *   G(Σ') ≈ G(Σ) + D (Σ' − Σ),  D = max(dG/dΣ, ν),
 * is the first Newton iterate of backward Euler (e.g. Press et al., Numerical Recipes, §19.2 on nonlinear
 * diffusion, from memory; common practice): it keeps the flux form (budgets close exactly as before) and lets a front where
 * transport switches on relax in one step. D is never taken below ν, so where ν falls with Σ (an active layer
 * of fixed column over a thickening dead zone) the scheme stays the lagged one; and where ν does not depend on
 * Σ at all, D = ν exactly and the offset is exactly 0, so constant-ν runs are unchanged bit for bit.
 * dG/dΣ is a forward difference from one more coefficient pass at Σ (1 + ε) (ν_i depends on Σ_i alone).
 */

/** Relative perturbation of Σ for the difference quotient. */
export const FLUX_PERTURBATION = 1e-4;

/**
 * From ν at Σ and ν at Σ (1 + ε), fill `nuImplicit` with D = max((ν₊(1 + ε) − ν)/ε, ν) and `offset` with
 * (ν − D) Σ √R (the X offset of viscous-transport.ts). Cells where D = ν get exactly ν and offset 0.
 */
export function linearizeFlux(
  sigma: Float64Array,
  sqrtCenters: Float64Array,
  nu: Float64Array,
  nuPerturbed: Float64Array,
  nuImplicit: Float64Array,
  offset: Float64Array,
): void {
  const eps = FLUX_PERTURBATION;
  for (let i = 0; i < sigma.length; i++) {
    const d = (nuPerturbed[i] * (1 + eps) - nu[i]) / eps;
    // Relative 1e-9 margin: a ν that does not depend on Σ gives d = ν up to round-off of the quotient.
    if (d > nu[i] * (1 + 1e-9)) {
      nuImplicit[i] = d;
      offset[i] = (nu[i] - d) * sigma[i] * sqrtCenters[i];
    } else {
      nuImplicit[i] = nu[i];
      offset[i] = 0;
    }
  }
}

/** Σ (1 + ε) into `out`. */
export function perturbSigma(sigma: Float64Array, out: Float64Array): void {
  for (let i = 0; i < sigma.length; i++) out[i] = sigma[i] * (1 + FLUX_PERTURBATION);
}
