/**
 * Viscous transport of a thin Keplerian disk (Lynden-Bell & Pringle 1974; Pringle 1981, eq. 3.8):
 *   ∂Σ/∂t = (3/R) ∂/∂R [R^{1/2} ∂/∂R (ν Σ R^{1/2})],
 * in conservative finite-volume form written in the specific angular momentum j = (G M_* R)^{1/2}.
 *
 * With the viscous torque g = 3π ν Σ j, angular-momentum conservation gives the inward mass flow through an
 * edge as Ṁ = ∂g/∂j; between centres i and i+1 this is Ṁ_e = (g_{i+1} - g_i)/(j_{i+1} - j_i). Because
 * g/j-differences telescope, Σ_i j_i ΔM_i reduces to boundary terms only, so the angular-momentum budget closes
 * to round-off and each boundary removes exactly Ṁ·j(edge). The factor (G M_*)^{1/2} cancels from Ṁ_e, so the
 * operator needs only R^{1/2}: Ṁ_e = 3π w_e (X_{i+1} - X_i) with X_i = ν_i Σ_i R_i^{1/2}, w_e from the grid.
 *
 * Zero-torque edges put g = 0 at the grid edges R_in and R_out (Pringle 1981, §3.2): the inner one is the
 * standard accreting boundary (ν Σ → 0 at the stellar surface region), the outer one sits far out.
 *
 * Time discretisation: θ-scheme (θ = 1 backward Euler, θ = ½ Crank–Nicolson), ν supplied separately for the
 * explicit and implicit parts so the caller can lag ν or Picard-iterate it. One Thomas solve per call.
 */
import type { DiskGrid } from './grid.js';
import { solveTridiagonal } from './tridiagonal.js';

/** Work arrays for one grid, allocated once per model run. */
export interface TransportWorkspace {
  readonly lower: Float64Array;
  readonly diag: Float64Array;
  readonly upper: Float64Array;
  readonly rhs: Float64Array;
  readonly scratch: Float64Array;
}

export function makeTransportWorkspace(n: number): TransportWorkspace {
  return {
    lower: new Float64Array(n),
    diag: new Float64Array(n),
    upper: new Float64Array(n),
    rhs: new Float64Array(n),
    scratch: new Float64Array(n),
  };
}

/**
 * What happens at a grid edge. `null`: zero torque (g = 0 at the edge). A number: a prescribed inward mass
 * flow in g s^-1, already averaged over the step; used only by validation runs against analytic solutions.
 */
export type EdgeCondition = number | null;

export interface TransportStepInput {
  readonly grid: DiskGrid;
  /** Σ at the start of the step, g cm^-2. */
  readonly sigma: Float64Array;
  /** ν for the explicit part (the start of the step), cm^2 s^-1. */
  readonly nuExplicit: Float64Array;
  /** ν for the implicit part (lagged: the same array as nuExplicit; Picard: from the latest estimate). */
  readonly nuImplicit: Float64Array;
  /**
   * Linearised flux (Newton): the implicit X'_i = ν_imp,i Σ'_i √R_i + offset_i, with ν_imp = d(νΣ)/dΣ and
   * offset = (νΣ − ν_imp Σ)√R at the start of the step (flux-linearization.ts); null: X'_i = ν_imp,i Σ'_i √R_i.
   */
  readonly implicitOffset?: Float64Array | null;
  /** Mass added per cell per unit time (infall, later minus winds), g s^-1; null for none. */
  readonly massSource: Float64Array | null;
  /**
   * A linear sink per cell as λ_i dt (dimensionless; winds), always fully implicit whatever θ, so it never makes
   * Σ negative: row i gains A_i λ_i dt Σ'_i on its diagonal and the cell loses exactly that mass. Null for none.
   */
  readonly sinkDt?: Float64Array | null;
  readonly dt: number;
  readonly theta: number;
  readonly inner: EdgeCondition;
  readonly outer: EdgeCondition;
}

/** Mass flows through the two boundaries averaged over the step (θ-weighted, as the scheme books them). */
export interface BoundaryFlows {
  /** Inward mass flow through R_in (accretion onto the star), g s^-1. */
  mdotInner: number;
  /** Outward mass flow through R_out (lost from the grid), g s^-1. */
  mdotOuter: number;
}

const THREE_PI = 3 * Math.PI;

/**
 * Advance Σ by one θ-step into `sigmaOut` (which may not alias `sigma`) and return the boundary flows.
 * Row i reads: A_i (1 + λ_i dt) Σ'_i − θ dt (Ṁ'_{i+1/2} − Ṁ'_{i−1/2}) = A_i Σ_i + (1−θ) dt (Ṁ_{i+1/2} − Ṁ_{i−1/2}) + dt S_i.
 */
export function viscousStep(input: TransportStepInput, ws: TransportWorkspace, sigmaOut: Float64Array): BoundaryFlows {
  const { grid, sigma, nuExplicit, nuImplicit, massSource, dt, theta, inner, outer } = input;
  const offset = input.implicitOffset ?? null;
  const sinkDt = input.sinkDt ?? null;
  const { n, area, sqrtCenters, edgeWeight: w } = grid;
  const { lower, diag, upper, rhs, scratch } = ws;
  const implicit = theta * dt * THREE_PI;
  const explicit = (1 - theta) * dt * THREE_PI;
  // Zero-torque edges keep their weight in the diagonal; a prescribed edge flux drops it.
  const wIn = inner === null ? w[0] : 0;
  const wOut = outer === null ? w[n] : 0;

  // Explicit-part flows (inward) through every edge, from X = ν Σ √R at the start of the step.
  let xPrev = 0;
  let flowInner = 0; // inward flow through the edge below cell i, explicit part
  for (let i = 0; i < n; i++) {
    const x = nuExplicit[i] * sigma[i] * sqrtCenters[i];
    const below = i === 0 ? wIn * x : w[i] * (x - xPrev);
    if (i === 0) flowInner = below;
    // Store the explicit flow below each cell in rhs temporarily; combined in the next loop.
    rhs[i] = below;
    xPrev = x;
  }
  const explicitOuter = -wOut * xPrev; // inward flow through R_out from the zero-torque point: −w_n X_{n-1}

  // Rows, with the neighbours' c = ν√R, edge weights and explicit flows carried in locals: each array element
  // is read once per step (typed-array loads dominate this loop's cost in V8).
  let cPrev = 0;
  let cCur = nuImplicit[0] * sqrtCenters[0];
  let wBelow = wIn;
  let flowBelow = rhs[0];
  for (let i = 0; i < n; i++) {
    const last = i === n - 1;
    const cNext = last ? 0 : nuImplicit[i + 1] * sqrtCenters[i + 1];
    const wAbove = last ? wOut : w[i + 1];
    const flowAbove = last ? explicitOuter : rhs[i + 1];
    lower[i] = -implicit * wBelow * cPrev;
    upper[i] = -implicit * wAbove * cNext;
    diag[i] = (sinkDt === null ? area[i] : area[i] * (1 + sinkDt[i])) + implicit * (wBelow + wAbove) * cCur;
    let b = area[i] * sigma[i] + explicit * (flowAbove - flowBelow);
    if (offset !== null) {
      // The known part of the implicit flows, w (offset_{i+1} − offset_i) above minus the same below.
      const oCur = offset[i];
      const oAbove = last ? 0 : offset[i + 1];
      const oBelow = i === 0 ? 0 : offset[i - 1];
      b += implicit * (wAbove * (oAbove - oCur) - wBelow * (oCur - oBelow));
    }
    if (massSource !== null) b += dt * massSource[i];
    if (i === 0 && inner !== null) b -= dt * inner;
    if (last && outer !== null) b += dt * outer;
    rhs[i] = b;
    cPrev = cCur;
    cCur = cNext;
    wBelow = wAbove;
    flowBelow = flowAbove;
  }
  solveTridiagonal(lower, diag, upper, rhs, sigmaOut, scratch, n);

  // Boundary flows over the step, θ-weighted exactly as the rows above book them.
  const x0New = nuImplicit[0] * sigmaOut[0] * sqrtCenters[0] + (offset === null ? 0 : offset[0]);
  const mdotInner = inner !== null ? inner : THREE_PI * (wIn * theta * x0New + (1 - theta) * flowInner);
  const xOutNew = nuImplicit[n - 1] * sigmaOut[n - 1] * sqrtCenters[n - 1] + (offset === null ? 0 : offset[n - 1]);
  const mdotOuter = outer !== null ? -outer : THREE_PI * (wOut * theta * xOutNew - (1 - theta) * explicitOuter);
  return { mdotInner, mdotOuter };
}
