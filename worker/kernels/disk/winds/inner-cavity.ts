/**
 * Whether the disk has an inner cavity, and where its rim is. Radiation from the star reaches the outer disk's
 * rim directly once the gas inside is optically thin along the midplane; for X-rays that is a hydrogen column
 * of about 1e22 cm^-2 (Owen, Clarke & Ercolano 2012 switch the wind profile there; from memory). The column
 * from R_in outward is ∫ n_H dR with the midplane density ρ_0 = Σ/(√(2π) H), H = c_s/Ω, n_H = ρ_0/(1.4 m_H).
 *
 * The cavity is open when the gas inside the radius where the internal wind opens its gap (`checkRadius`: where
 * its primordial profile starts) is thinner than N_crit: then the inner disk has drained and the star sees the
 * outer disk. (Counting from R_in alone would not do: the zero-torque inner edge keeps the first cells' Σ low, so
 * a still accreting inner disk would look open there.) The rim is where the column from R_in reaches N_crit, or
 * half the disk's whole column when even the whole disk is thinner than that (a remnant the star sees through;
 * the two agree at a total of 2 N_crit). An empty disk has no cavity.
 *
 * Once open, a cavity stays open and its rim only moves outward (`advanceCavity`): the disk is cleared from the
 * inside out (Clarke et al. 2001; Alexander et al. 2006). Without that, the cell at the rim flickers between
 * "rim, eaten by the wind" and "cavity, refilled by viscous spreading" from one step to the next.
 */
import { M_HYDROGEN_CGS } from '../../../../shared/constants.js';
import type { DiskGrid } from '../grid.js';
import { SOUND_SPEED2_PER_K } from '../thermal-structure.js';

/** Gas mass per hydrogen nucleus in units of m_H (X ≈ 0.71; common practice). */
const MASS_PER_H = 1.4;
const SQRT_2PI = Math.sqrt(2 * Math.PI);

export interface InnerCavity {
  readonly open: boolean;
  /** Rim radius, cm (the grid's inner edge when closed). */
  readonly radius: number;
}

export function findInnerCavity(
  grid: DiskGrid,
  sigma: Float64Array,
  temperature: Float64Array,
  omega: Float64Array,
  criticalColumn: number,
  /** cm. */
  checkRadius: number,
): InnerCavity {
  const closed: InnerCavity = { open: false, radius: grid.edges[0] };
  // Column of each cell = n_H ΔR; summed until N_crit, or over the whole disk when it never gets there.
  const cellColumn = (i: number): number => {
    const h = Math.sqrt(SOUND_SPEED2_PER_K * temperature[i]) / omega[i];
    return (sigma[i] / (SQRT_2PI * h * MASS_PER_H * M_HYDROGEN_CGS)) * (grid.edges[i + 1] - grid.edges[i]);
  };
  let total = 0;
  let reached = -1;
  for (let i = 0; i < grid.n && reached < 0; i++) {
    total += cellColumn(i);
    if (total >= criticalColumn) reached = i;
    if (reached >= 0 && grid.centers[i] < checkRadius) return closed;
  }
  if (!(total > 0)) return closed;
  const target = reached >= 0 ? criticalColumn : 0.5 * total;
  let below = 0;
  for (let i = 0; i < grid.n; i++) {
    const c = cellColumn(i);
    if (below + c >= target) {
      const share = c > 0 ? (target - below) / c : 0;
      return { open: true, radius: grid.edges[i] + share * (grid.edges[i + 1] - grid.edges[i]) };
    }
    below += c;
  }
  return closed;
}

/** The cavity after a step: what `findInnerCavity` sees, but an open cavity never closes or shrinks. */
export function advanceCavity(previous: InnerCavity, found: InnerCavity): InnerCavity {
  if (!previous.open) return found;
  if (!found.open || found.radius <= previous.radius) return previous;
  return found;
}
