/**
 * Mass and angular-momentum budgets of full model runs close to round-off: the j-flux form of viscous-transport.ts makes
 * interior fluxes telescope in both mass and Σ_i j_i ΔM_i (Lynden-Bell & Pringle 1974; Pringle 1981 §3,
 * in conservative form), so the disk changes only by what its two edges, infall and the growth of M_* book.
 *
 * Tolerance 1e-10 relative: round-off over 10^2–10^4 steps gives 1e-16–1e-13 (measured over these cases:
 * mass ≤ 9e-15, J ≤ 1.4e-13, the latter for θ = ½ from a disk, 1.7e4 steps), while a booking that does not
 * match the discrete fluxes (j at a cell centre instead of the edge, a θ-weight that differs from the rows',
 * a missed deposit inside R_in, a rescale with the wrong M_*) is far above it: booking the accreted j at the
 * first cell centre instead of R_in fails every case here.
 *
 * Each case is checked twice: through `runModel` (the result's own mass_budget_rel_err, j_budget_rel_err) and
 * through the same setup driven by `evolveDisk`, where the test books the edge angular momentum itself from
 * the per-step mass flows, sums J_disk from Σ itself, and closes the star's mass budget as well. The default
 * X-ray wind is on in every case (and the EUV and external FUV winds in the last ones): the test books the
 * angular momentum the winds carried itself, from the mass each cell lost and that cell's j_i.
 */
import { describe, expect, it } from 'vitest';
import { G_CGS } from '../../shared/constants.js';
import { parseModelParams } from '../../shared/model-params.js';
import { budgetErrors, type DiskState } from '../../worker/kernels/disk/disk-state.js';
import { evolveDisk } from '../../worker/kernels/disk/evolve.js';
import type { DiskGrid } from '../../worker/kernels/disk/grid.js';
import { runModel } from '../../worker/model.js';
import { setupModel } from '../../worker/model-setup.js';

const TOL = 1e-10;

interface BudgetCase {
  readonly name: string;
  readonly params: Record<string, unknown>;
}

// Moderate resolution and 2 Myr keep the suite fast; budgets are a property of every step, not of the length.
const BASE = { n_cells: 120, t_end_myr: 2, checkpoints_myr: [0.1, 0.5, 1, 2] };

const CASES: readonly BudgetCase[] = [
  { name: 'disk start, fixed star', params: { initial_state: 'disk', star_mass: 'fixed' } },
  { name: 'disk start, growing star (j-rescale line)', params: { initial_state: 'disk', star_mass: 'growing' } },
  { name: 'infall start, fixed star', params: { initial_state: 'infall', star_mass: 'fixed' } },
  { name: 'infall start, growing star (j-rescale line)', params: { initial_state: 'infall', star_mass: 'growing' } },
  { name: 'disk start, growing star, theta = 1/2', params: { initial_state: 'disk', star_mass: 'growing', theta: 0.5 } },
  {
    // θ = ½ with infall is held to 0.2 Myr: Crank–Nicolson is not L-stable, its stiff inner cells ring and
    // the step control then takes sub-year steps (≈1e4 steps per 0.2 Myr at 120 cells).
    name: 'infall start, growing star, theta = 1/2',
    params: { initial_state: 'infall', star_mass: 'growing', theta: 0.5, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] },
  },
  { name: 'infall start, growing star, 2 Newton iterations', params: { initial_state: 'infall', star_mass: 'growing', newton_iterations: 2 } },
  {
    name: 'disk start, fixed star, theta = 1/2 and 2 Newton iterations',
    params: { initial_state: 'disk', star_mass: 'fixed', theta: 0.5, newton_iterations: 2 },
  },
  // Transport from the ionization kernel (a dead zone; irradiation-heated so the thermal switch stays quiet).
  { name: 'disk start, growing star, ionization dead zone', params: { initial_state: 'disk', active_layer: 'ionization', kappa_cm2_g: 0 } },
  {
    name: 'infall start, growing star, ionization dead zone, no thermal switch',
    params: { initial_state: 'infall', active_layer: 'ionization', thermal_ionization: 'none' },
  },
  // Every wind at once, strong enough that an inner cavity opens and the outer disk is eroded within the run.
  {
    name: 'disk start, growing star, X-ray + EUV + external FUV winds, cavity opens',
    params: {
      initial_state: 'disk', m_disk_msun: 0.01, r1_au: 10, xray_wind_scale: 3, euv_wind_scale: 1, phi_euv_s: 1e42,
      fuv_wind_mdot_msun_yr: 1e-8, t_end_myr: 3, checkpoints_myr: [0.5, 1, 3],
    },
  },
  {
    // θ = ½ (the wind sink stays fully implicit); the external wind clears the whole disk within the run.
    name: 'disk start, fixed star, theta = 1/2, all winds',
    params: { initial_state: 'disk', star_mass: 'fixed', theta: 0.5, euv_wind_scale: 1, fuv_wind_mdot_msun_yr: 1e-7 },
  },
];

/** J_disk summed here from Σ with j_i = (G M_* R_i)^{1/2}, the same j the transport books (disk-diagnostics.ts). */
function angularMomentumOf(grid: DiskGrid, sigma: Float64Array, mStar: number): number {
  let j = 0;
  for (let i = 0; i < grid.n; i++) j += sigma[i] * grid.area[i] * Math.sqrt(G_CGS * mStar * grid.centers[i]);
  return j;
}

/** |a − b| / max(|a|, |b|), 0 when both are 0 (an empty disk before infall reaches R_in). */
function relDiff(a: number, b: number): number {
  return a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

function massOf(grid: DiskGrid, sigma: Float64Array): number {
  let m = 0;
  for (let i = 0; i < grid.n; i++) m += sigma[i] * grid.area[i];
  return m;
}

interface Closure {
  status: string;
  steps: number;
  /** budgetErrors() of the final state. */
  kernel: { mass: number; angularMomentum: number };
  /** The test's own closures. */
  diskMass: number;
  /** The per-wind lines add up to the total. */
  windMass: number;
  starMass: number;
  /** Growing star only. */
  totalMass: number | null;
  edgeJ: number;
  diskJ: number;
}

function closeBudgetsIndependently(params: Record<string, unknown>): Closure {
  const setup = setupModel(parseModelParams(params)).evolve;
  const { grid } = setup;
  const rIn = grid.edges[0];
  const rOut = grid.edges[grid.n];
  const m0 = massOf(grid, setup.sigma0);
  const j0 = angularMomentumOf(grid, setup.sigma0, setup.mStar0);
  // Edge angular momentum booked here from the per-step mass flows and M_* at the start of each step:
  // what crosses R_in carries (G M_* R_in)^{1/2}, what leaves R_out carries (G M_* R_out)^{1/2} (viscous-transport.ts).
  let prevAccreted = 0;
  let prevLost = 0;
  let prevMStar = setup.mStar0;
  let jAccreted = 0;
  let jLost = 0;
  let jWind = 0;
  let worstJ = 0;
  const onStep = (s: DiskState): void => {
    const b = s.budget;
    jAccreted += (b.massAccreted - prevAccreted) * Math.sqrt(G_CGS * prevMStar * rIn);
    jLost += (b.massLost - prevLost) * Math.sqrt(G_CGS * prevMStar * rOut);
    // Wind: each cell's loss in this step with that cell's j_i at the M_* the step used.
    for (let i = 0; i < grid.n; i++) jWind += s.windLoss[i] * Math.sqrt(G_CGS * prevMStar * grid.centers[i]);
    [prevAccreted, prevLost, prevMStar] = [b.massAccreted, b.massLost, s.mStar];
    // J_disk the state reports is the sum over Σ (not a running total).
    worstJ = Math.max(worstJ, relDiff(s.jDisk, angularMomentumOf(grid, s.sigma, s.mStar)));
  };
  const outcome = evolveDisk(setup, { onStep });
  const s = outcome.state;
  const b = s.budget;
  const mDisk = massOf(grid, s.sigma);
  const jDisk = angularMomentumOf(grid, s.sigma, s.mStar);
  const massIn = m0 + b.massInfallDisk;
  const infallTotal = b.massInfallDisk + b.massInfallStar;
  // A growing star gains exactly what crosses R_in plus the infall landing inside it; a fixed one nothing.
  const starExpected = setup.mStar0 + (setup.starGrows ? b.massAccreted + b.massInfallStar : 0);
  // Everything there is, for a growing star: star + disk + lost = seed (or initial star) + initial disk + infall.
  const totalIn = setup.mStar0 + m0 + infallTotal;
  const jExpected = j0 + b.jInfallDisk + b.jRescale - jAccreted - jLost - jWind;
  return {
    status: outcome.status,
    steps: s.steps,
    kernel: budgetErrors(s),
    diskMass: Math.abs(mDisk - (massIn - b.massAccreted - b.massLost - b.massWind)) / massIn,
    windMass: Math.abs(b.massWind - (b.massWindXray + b.massWindEuv + b.massWindFuv)) / Math.max(b.massWind, 1e-300),
    starMass: Math.abs(s.mStar - starExpected) / s.mStar,
    totalMass: setup.starGrows ? Math.abs(s.mStar + mDisk + b.massLost + b.massWind - totalIn) / totalIn : null,
    edgeJ: Math.max(
      relDiff(b.jAccreted, jAccreted),
      Math.abs(b.jLost - jLost) / jAccreted,
      Math.abs(b.jWind - jWind) / jAccreted,
      worstJ,
    ),
    diskJ: Math.abs(jDisk - jExpected) / (j0 + b.jInfallDisk + Math.abs(b.jRescale)),
  };
}

describe('mass and angular-momentum budgets of full runs close to round-off', () => {
  for (const c of CASES) {
    describe(c.name, () => {
      const params = { ...BASE, ...c.params };

      it('runModel reports budget errors <= 1e-10 and status ok', () => {
        const result = runModel(params);
        expect(result.status).toBe('ok');
        expect(result.scalars.mass_budget_rel_err).toBeLessThanOrEqual(TOL);
        expect(result.scalars.j_budget_rel_err).toBeLessThanOrEqual(TOL);
        // The budget must have something to close: mass really moved through the edges or arrived by infall.
        const { m_accreted_msun: accreted, m_infall_msun: infall } = result.scalars;
        expect(typeof accreted === 'number' && typeof infall === 'number' && accreted + infall > 1e-3).toBe(true);
      });

      it('closes when booked independently from the per-step flows', () => {
        const r = closeBudgetsIndependently(params);
        expect(r.status).toBe('ok');
        expect(r.kernel.mass).toBeLessThanOrEqual(TOL);
        expect(r.kernel.angularMomentum).toBeLessThanOrEqual(TOL);
        expect(r.diskMass).toBeLessThanOrEqual(TOL);
        expect(r.windMass).toBeLessThanOrEqual(TOL);
        expect(r.starMass).toBeLessThanOrEqual(TOL);
        if (r.totalMass !== null) expect(r.totalMass).toBeLessThanOrEqual(TOL);
        expect(r.edgeJ).toBeLessThanOrEqual(TOL);
        expect(r.diskJ).toBeLessThanOrEqual(TOL);
      });
    });
  }
});
