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
 *
 * One iterate is not always enough. Where G(Σ) has a corner that the tangent cannot see — the Saha branch's
 * column switches on through its midplane with a square-root cusp, Σ − Σ_a ∝ √(Σ_c − Σ), because x_e is nearly
 * flat in height there — the tangent just above the corner misses the cliff below it and the tangent just below
 * overshoots above: a cell at the corner flipped between Σ_a = Σ and Σ_a ≈ 0.9 Σ with Σ 0.2 % apart, every step,
 * and the step stayed at the change target for good (default infall model with thermal_ionization=saha, 0.13 AU).
 * `linearizationResidual` measures what a linearised step left undone and `secantUpdate` re-linearises along the
 * chord; the integrator iterates the two when asked to (evolve.ts, `secantIterations`).
 */

import type { DiskGrid } from './grid.js';
import { computeTransportCoefficients, type TransportPhysics } from './transport-coefficients.js';

/** Relative perturbation of Σ for the difference quotient. */
export const FLUX_PERTURBATION = 1e-4;

/**
 * ν(Σ) as the linearisation differentiates it and its residual evaluates it: the coefficient pass in probe mode
 * at `time`, with thermal inertia the temperature held at `heldTemperature` (dt = 0: T lags Σ within a step, and
 * an equilibrium T would differ from the held one by far more than a change of Σ moves it); without inertia
 * `heldTemperature` only seeds the pass. `temperature` is scratch.
 */
export function probeViscosity(
  grid: DiskGrid,
  sigma: Float64Array,
  omega: Float64Array,
  physics: TransportPhysics,
  heldTemperature: Float64Array,
  time: number,
  nu: Float64Array,
  temperature: Float64Array,
): void {
  temperature.set(heldTemperature);
  computeTransportCoefficients(grid, sigma, omega, physics, { nu, temperature, derivativeProbe: true }, time, 0);
}

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

/** The disk a probe pass runs on: grid, Ω per cell and the transport physics. */
export interface ProbeDisk {
  readonly grid: DiskGrid;
  readonly omega: Float64Array;
  readonly physics: TransportPhysics;
}

/** Scratch arrays of `linearizeAbout` (Σ(1 + ε), ν there, the temperature of that pass). */
export interface ProbeScratch {
  readonly sigma: Float64Array;
  readonly nu: Float64Array;
  readonly temperature: Float64Array;
}

/**
 * The linearisation of the flux about a state Σ with its ν (the start of a step, or a later iterate), T held at
 * `heldTemperature`: the probe pass at Σ (1 + ε), then `linearizeFlux` into `nuImplicit` and `offset`.
 */
export function linearizeAbout(
  disk: ProbeDisk,
  time: number,
  sigma: Float64Array,
  nu: Float64Array,
  heldTemperature: Float64Array,
  scratch: ProbeScratch,
  nuImplicit: Float64Array,
  offset: Float64Array,
): void {
  perturbSigma(sigma, scratch.sigma);
  probeViscosity(disk.grid, scratch.sigma, disk.omega, disk.physics, heldTemperature, time, scratch.nu, scratch.temperature);
  linearizeFlux(sigma, disk.grid.sqrtCenters, nu, scratch.nu, nuImplicit, offset);
}

/**
 * What the linearised implicit flux left undone, as a change of Σ per cell: with X_i the flux variable νΣ√R of
 * viscous-transport.ts, the step used X_lin,i = ν_imp,i Σ'_i √R_i + offset_i where backward Euler wants
 * X_i(Σ') = ν_i(Σ') Σ'_i √R_i; the difference e_i moves mass through the implicit flows, and
 *   out_i = θ dt 3π [w_{i+1}(e_{i+1} − e_i) − w_i(e_i − e_{i−1})] / A_i
 * is the amount by which Σ'_i misses the nonlinear step's equation for cell i (its residual divided by A_i).
 * Zero-torque edges take e = 0 beyond the grid; a prescribed edge flow carries no e. Zero wherever ν does not
 * depend on Σ (then X_lin = X exactly).
 */
export function linearizationResidual(
  grid: DiskGrid,
  step: { readonly sigmaNew: Float64Array; readonly nuNew: Float64Array; readonly nuImplicit: Float64Array; readonly offset: Float64Array },
  thetaDt: number,
  zeroTorque: { readonly inner: boolean; readonly outer: boolean },
  out: Float64Array,
): void {
  const { n, area, sqrtCenters, edgeWeight: w } = grid;
  const { sigmaNew, nuNew, nuImplicit, offset } = step;
  const e = (i: number): number => (nuNew[i] - nuImplicit[i]) * sigmaNew[i] * sqrtCenters[i] - offset[i];
  const k = 3 * Math.PI * thetaDt;
  let eBelow = 0;
  let eCur = e(0);
  for (let i = 0; i < n; i++) {
    const last = i === n - 1;
    const eNext = last ? 0 : e(i + 1);
    const wBelow = i > 0 ? w[i] : zeroTorque.inner ? w[0] : 0;
    const wAbove = !last ? w[i + 1] : zeroTorque.outer ? w[n] : 0;
    out[i] = (k * (wAbove * (eNext - eCur) - wBelow * (eCur - eBelow))) / area[i];
    eBelow = eCur;
    eCur = eNext;
  }
}

/**
 * One secant update of the linearisation: where Σ moved by more than a relative 1e-9, D_i becomes the chord
 * (ν'Σ' − νΣ)/(Σ' − Σ) from the start of the step to the latest solution, if positive, and the offset follows
 * ((ν − D) Σ √R, as in `linearizeFlux`); elsewhere D and the offset stay. A solution that reproduces itself under
 * this update satisfies the nonlinear backward-Euler step exactly (its X_lin is X(Σ') in every moved cell).
 */
export function secantUpdate(
  sigma: Float64Array,
  sqrtCenters: Float64Array,
  nu: Float64Array,
  step: { readonly sigmaNew: Float64Array; readonly nuNew: Float64Array },
  nuImplicit: Float64Array,
  offset: Float64Array,
): void {
  const { sigmaNew, nuNew } = step;
  for (let i = 0; i < sigma.length; i++) {
    const ds = sigmaNew[i] - sigma[i];
    if (!(Math.abs(ds) > 1e-9 * sigma[i])) continue;
    const chord = (nuNew[i] * sigmaNew[i] - nu[i] * sigma[i]) / ds;
    if (!(chord > 0)) continue;
    nuImplicit[i] = chord;
    offset[i] = (nu[i] - chord) * sigma[i] * sqrtCenters[i];
  }
}
