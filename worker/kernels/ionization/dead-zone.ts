/**
 * The dead zone of the whole disk from the per-cell active columns: a cell is dead where its midplane is
 * (Σ_a < Σ). Dead cells next to each other form a band; a disk may have none, one or several (a thermally
 * active ring inside a dead region splits it). Edges are the grid's cell edges, so they are resolved to one
 * cell (Δln R = ln(R_out/R_in)/N, 5 % at the default grid).
 */
import type { DiskGrid } from '../disk/grid.js';

export interface DeadZoneSummary {
  /** Number of dead bands. */
  readonly bands: number;
  /** Inner and outer edge of the outermost band, cm (NaN without a dead zone). */
  readonly innerEdge: number;
  readonly outerEdge: number;
  /** Mass in the dead parts of the columns, Σ_i (Σ_i − Σ_a,i) A_i, g. */
  readonly deadMass: number;
}

export function deadZoneSummary(grid: DiskGrid, sigma: Float64Array, sigmaActive: Float64Array): DeadZoneSummary {
  let bands = 0;
  let innerEdge = NaN;
  let outerEdge = NaN;
  let deadMass = 0;
  let inBand = false;
  for (let i = 0; i < grid.n; i++) {
    const dead = sigmaActive[i] < sigma[i];
    if (dead) {
      deadMass += (sigma[i] - sigmaActive[i]) * grid.area[i];
      if (!inBand) {
        bands++;
        innerEdge = grid.edges[i];
      }
      outerEdge = grid.edges[i + 1];
    }
    inBand = dead;
  }
  return { bands, innerEdge, outerEdge, deadMass };
}
