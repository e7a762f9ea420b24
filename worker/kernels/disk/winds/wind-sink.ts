/**
 * Photoevaporative winds as a sink of the disk: the rates of the selected wind models (each in its own module),
 * and how a step applies them.
 *
 * The rates R_i (g s^-1 per cell) are evaluated from the state at the start of the step (the cavity, M_*, and
 * for the external wind the mass distribution). The step applies them as a linear sink inside the implicit
 * transport solve (viscous-transport.ts, `sinkDt`), with λ_i dt = R_i dt / max(M*_i − R_i dt, M*_i/2), where
 * M*_i is the cell's mass after the same step without winds (a predictor solve). On its own a cell then loses
 * exactly R_i dt while that is at most half of M*_i, and a smoothly limited part of M*_i beyond (never more than
 * it holds, never negative). Coupled to transport, the sink only lowers the solution of that M-matrix system
 * (θ = 1), so a cell loses at most λ_i dt M*_i ≤ 2 R_i dt. (λ = R/M* alone would never exceed R_i dt but takes
 * only R dt/(1 + R dt/M*) on its own: 20 % too little near gap opening at the default step control, which
 * moved disk lifetimes by 20 %; the form above agrees with step_change = 0.01 to 0.2 %.) The mass each cell lost
 * is read back exactly from the solution (A_i λ_i dt Σ'_i). Being inside the implicit step,
 * a cell where inflow and wind balance (the rim of a cavity) settles smoothly instead of being emptied and
 * refilled in turn, which an explicit, clipped sink does and which the step control then chases with tiny steps.
 * What is removed is booked cell by cell with the cell's own j_i = (G M_*)^{1/2} R_i^{1/2}, the j that J_disk
 * sums, so the budgets close to round-off.
 */
import type { DiskGrid } from '../grid.js';
import { euvCellRates, euvGravitationalRadius } from './euv-photoevaporation.js';
import { fuvCellRates } from './external-fuv.js';
import type { InnerCavity } from './inner-cavity.js';
import { xrayCellRates, xrayLaunchRadius } from './xray-photoevaporation.js';

export interface WindSetup {
  /** Internal X-ray photoevaporation (Owen et al. 2011, 2012), or null. */
  readonly xray: { readonly lx: number; readonly scale: number } | null;
  /** Internal EUV photoevaporation (Hollenbach et al. 1994; Alexander et al. 2006), or null. */
  readonly euv: { readonly phi: number; readonly scale: number } | null;
  /** External FUV photoevaporation (Adams et al. 2004): total rate g s^-1, gas temperature K; or null. */
  readonly fuv: { readonly mdot: number; readonly temperatureK: number } | null;
  /** Midplane hydrogen column (cm^-2) inside which the star sees the outer disk directly (inner-cavity.ts). */
  readonly cavityColumn: number;
}

/** Per-run arrays of the sink. */
export interface WindWorkspace {
  /** Rate of each wind in each cell, g s^-1, for the current step. */
  readonly xray: Float64Array;
  readonly euv: Float64Array;
  readonly fuv: Float64Array;
  /** λ_i dt of the current try. */
  readonly sinkDt: Float64Array;
  /** What the winds could take from each cell in the current try, R_i dt / A_i, g cm^-2. */
  readonly capacity: Float64Array;
  /** 1 where the winds could take all the cell would hold after the try without them (R_i dt ≥ M*_i). */
  readonly windDominated: Uint8Array;
  /** Mass removed from each cell by the current try, g. */
  readonly removed: Float64Array;
  readonly log10Edges: Float64Array;
}

export function makeWindWorkspace(grid: DiskGrid): WindWorkspace {
  const n = grid.n;
  return {
    xray: new Float64Array(n), euv: new Float64Array(n), fuv: new Float64Array(n),
    sinkDt: new Float64Array(n), capacity: new Float64Array(n), windDominated: new Uint8Array(n), removed: new Float64Array(n), log10Edges: grid.edges.map(Math.log10),
  };
}

/**
 * Radius inside which the gas must have drained before the star sees the outer disk (inner-cavity.ts): where
 * the innermost internal wind's primordial profile starts; null without an internal wind (no cavity is tracked).
 */
export function cavityCheckRadius(setup: WindSetup, mStar: number): number | null {
  const x = setup.xray !== null ? xrayLaunchRadius(mStar) : Infinity;
  const e = setup.euv !== null ? euvGravitationalRadius(mStar) : Infinity;
  const r = Math.min(x, e);
  return Number.isFinite(r) ? r : null;
}

/** Fill the workspace's rates for a step from the state at its start. */
export function computeWindRates(
  setup: WindSetup, grid: DiskGrid, sigma: Float64Array, mStar: number, cavity: InnerCavity, ws: WindWorkspace,
): void {
  const holeRadius = cavity.open ? cavity.radius : null;
  if (setup.xray !== null) {
    xrayCellRates({ grid, mStar, lx: setup.xray.lx, scale: setup.xray.scale, holeRadius, log10Edges: ws.log10Edges }, ws.xray);
  }
  if (setup.euv !== null) euvCellRates({ grid, mStar, phi: setup.euv.phi, scale: setup.euv.scale, holeRadius }, ws.euv);
  if (setup.fuv !== null) fuvCellRates({ grid, sigma, mStar, mdot: setup.fuv.mdot, temperatureK: setup.fuv.temperatureK }, ws.fuv);
}

/** λ dt of a cell that would hold nothing but has a wind (it stays empty to 1e-12). */
const EMPTY_CELL_SINK_DT = 1e12;

/**
 * λ_i dt = R_i dt / M*_i for a try of length dt into `ws.sinkDt` (M*_i from `sigmaPredicted`, the step without
 * winds), and the capacity R_i dt / A_i into `ws.capacity`.
 */
export function fillSinkDt(setup: WindSetup, grid: DiskGrid, sigmaPredicted: Float64Array, dt: number, ws: WindWorkspace): Float64Array {
  const rate = totalRate(setup, ws);
  for (let i = 0; i < grid.n; i++) {
    const r = rate(i);
    const m = sigmaPredicted[i] * grid.area[i];
    ws.capacity[i] = (r * dt) / grid.area[i];
    const want = r * dt;
    ws.windDominated[i] = r > 0 && want >= m ? 1 : 0;
    ws.sinkDt[i] = r > 0 ? (m > 0 ? Math.min(want / Math.max(m - want, 0.5 * m), EMPTY_CELL_SINK_DT) : EMPTY_CELL_SINK_DT) : 0;
  }
  return ws.sinkDt;
}

function totalRate(setup: WindSetup, ws: WindWorkspace): (i: number) => number {
  const { xray, euv, fuv } = ws;
  const x = setup.xray !== null;
  const e = setup.euv !== null;
  const f = setup.fuv !== null;
  return (i) => (x ? xray[i] : 0) + (e ? euv[i] : 0) + (f ? fuv[i] : 0);
}

/** What one step removed: mass per wind (g) and Σ_i ΔM_i R_i^{1/2} (times (G M_*)^{1/2} gives J). */
export interface WindRemoval {
  xray: number;
  euv: number;
  fuv: number;
  total: number;
  massSqrtR: number;
}

/**
 * The mass each cell lost in the solve that produced `sigmaNew`, A_i λ_i dt Σ'_i, into `ws.removed`, shared
 * among the winds in proportion to their rates.
 */
export function windRemoval(setup: WindSetup, grid: DiskGrid, sigmaNew: Float64Array, ws: WindWorkspace): WindRemoval {
  const rate = totalRate(setup, ws);
  const out: WindRemoval = { xray: 0, euv: 0, fuv: 0, total: 0, massSqrtR: 0 };
  for (let i = 0; i < grid.n; i++) {
    const taken = ws.sinkDt[i] > 0 ? ws.sinkDt[i] * grid.area[i] * sigmaNew[i] : 0;
    ws.removed[i] = taken;
    if (taken === 0) continue;
    const perRate = taken / rate(i);
    if (setup.xray !== null) out.xray += ws.xray[i] * perRate;
    if (setup.euv !== null) out.euv += ws.euv[i] * perRate;
    if (setup.fuv !== null) out.fuv += ws.fuv[i] * perRate;
    out.total += taken;
    out.massSqrtR += taken * grid.sqrtCenters[i];
  }
  return out;
}
