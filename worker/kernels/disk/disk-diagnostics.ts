/**
 * Integrals over the disk state used for outputs and budgets (cgs): mass, angular momentum with the same
 * j_i = (G M_*)^{1/2} R_i^{1/2} the transport books, and radii enclosing a fraction of the disk mass.
 */
import { G_CGS } from '../../../shared/constants.js';
import type { DiskGrid } from './grid.js';

export function diskMass(grid: DiskGrid, sigma: Float64Array): number {
  let m = 0;
  for (let i = 0; i < grid.n; i++) m += sigma[i] * grid.area[i];
  return m;
}

export function diskAngularMomentum(grid: DiskGrid, sigma: Float64Array, mStar: number): number {
  let sum = 0;
  for (let i = 0; i < grid.n; i++) sum += sigma[i] * grid.area[i] * grid.sqrtCenters[i];
  return Math.sqrt(G_CGS * mStar) * sum;
}

/**
 * Radii (cm) enclosing each of `fractions` (ascending, in (0, 1)) of the disk mass; Σ is taken as uniform
 * within a cell, so the enclosed mass is linear in R^2 across it. NaN for an empty disk.
 */
export function massRadii(grid: DiskGrid, sigma: Float64Array, fractions: readonly number[]): number[] {
  const total = diskMass(grid, sigma);
  if (!(total > 0)) return fractions.map(() => NaN);
  const out: number[] = [];
  let k = 0;
  let enclosed = 0;
  for (let i = 0; i < grid.n && k < fractions.length; i++) {
    const cell = sigma[i] * grid.area[i];
    while (k < fractions.length && enclosed + cell >= fractions[k] * total) {
      const share = cell > 0 ? (fractions[k] * total - enclosed) / cell : 0;
      const r0 = grid.edges[i];
      const r1 = grid.edges[i + 1];
      out.push(Math.sqrt(r0 * r0 + share * (r1 * r1 - r0 * r0)));
      k++;
    }
    enclosed += cell;
  }
  while (out.length < fractions.length) out.push(grid.edges[grid.n]);
  return out;
}
