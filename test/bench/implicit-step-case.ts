/**
 * The implicit viscous-transport step in isolation: a fixed, deterministic input (the same one
 * implicit-step.c builds), timed in batches of steps, and solved once for the comparison with C.
 *
 * Input, n log-spaced cells from 0.05 to 1000 AU (makeLogGrid):
 *   Σ_i = 1000 g cm^-2 · e^{-x}/x with x = R_i/30 AU;  ν_i = 10^15 cm^2 s^-1 · R_i/AU (lagged: ν' = ν);
 *   dt = 1000 yr.
 * Case "timed": θ = 1, zero-torque edges, no source — what a model step after infall does.
 * Case "branches": θ = ½, a source S_i = 10^18 g s^-1 · e^{-R_i/10 AU}, prescribed flows of 10^18 g s^-1 in
 * at R_in and 10^16 g s^-1 out at R_out — every other branch of the row assembly.
 */
import { AU_CGS, YEAR_CGS } from '../../shared/constants.js';
import { makeLogGrid } from '../../worker/kernels/disk/grid.js';
import {
  makeTransportWorkspace,
  viscousStep,
  type BoundaryFlows,
  type TransportStepInput,
} from '../../worker/kernels/disk/viscous-transport.js';
import { nowNs } from './stats.js';

export type StepCaseName = 'timed' | 'branches';

export function makeStepCase(n: number, name: StepCaseName): TransportStepInput {
  const grid = makeLogGrid(0.05 * AU_CGS, 1000 * AU_CGS, n);
  const sigma = new Float64Array(n);
  const nu = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = grid.centers[i] / (30 * AU_CGS);
    sigma[i] = (1000 * Math.exp(-x)) / x;
    nu[i] = 1e15 * (grid.centers[i] / AU_CGS);
  }
  const dt = 1000 * YEAR_CGS;
  // Literals written out in full (no spread): every call then builds an object of the same hidden class.
  if (name === 'timed') {
    return { grid, sigma, nuExplicit: nu, nuImplicit: nu, massSource: null, dt, theta: 1, inner: null, outer: null };
  }
  const source = new Float64Array(n);
  for (let i = 0; i < n; i++) source[i] = 1e18 * Math.exp(-grid.centers[i] / (10 * AU_CGS));
  return { grid, sigma, nuExplicit: nu, nuImplicit: nu, massSource: source, dt, theta: 0.5, inner: 1e18, outer: -1e16 };
}

/** One step of a case: the flows, Σ' and the cell areas (for a mass checksum). */
export function solveStepCase(
  n: number,
  name: StepCaseName,
): { flows: BoundaryFlows; sigma: Float64Array; area: Float64Array } {
  const input = makeStepCase(n, name);
  const sigma = new Float64Array(n);
  const flows = viscousStep(input, makeTransportWorkspace(n), sigma);
  return { flows, sigma, area: input.grid.area };
}

/** Per-batch timings of one run of the step loop: ns per cell per step of each batch. */
export interface StepSamples {
  readonly n: number;
  /** Steps per batch. */
  readonly reps: number;
  readonly nsPerCellStep: readonly number[];
}

/**
 * A timer for the step loop implicit-step.c runs: each call times `batches` batches of `reps` steps of the
 * "timed" case on n cells, after a tenth as many warm-up batches. The input is built once and reused by every
 * call, so the kernel always sees the same objects (a fresh input per call changed hidden classes and cost
 * V8 deoptimisations that made later calls ~1.5x slower than the first). Every step starts from the same Σ;
 * part of each result feeds a sink that is checked, so no work is dead.
 */
export function makeStepTimer(n: number, reps: number): (batches: number) => StepSamples {
  const input = makeStepCase(n, 'timed');
  const ws = makeTransportWorkspace(n);
  const out = new Float64Array(n);
  return (batches) => {
    const nsPerCellStep: number[] = [];
    let sink = 0;
    const warmup = Math.floor(batches / 10) + 1;
    for (let b = -warmup; b < batches; b++) {
      const t0 = nowNs();
      for (let k = 0; k < reps; k++) {
        const flows = viscousStep(input, ws, out);
        sink += out[k % n] + flows.mdotInner;
      }
      const t1 = nowNs();
      if (b >= 0) nsPerCellStep.push((t1 - t0) / (reps * n));
    }
    if (!Number.isFinite(sink)) throw new Error(`viscousStep produced a non-finite result at n = ${n}`);
    return { n, reps, nsPerCellStep };
  };
}
