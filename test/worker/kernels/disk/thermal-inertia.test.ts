/**
 * Thermal inertia of the midplane (thermal-inertia.ts): the one-zone energy equation dT/dt = k (A T + C − T⁴)
 * stepped by backward Euler, checked against its analytic limits and one analytic solution.
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, GM_SUN_CGS, K_BOLTZMANN_CGS, MEAN_MOLECULAR_WEIGHT, M_HYDROGEN_CGS, SIGMA_SB_CGS } from '../../../../shared/constants.js';
import { uniformActiveLayer } from '../../../../worker/kernels/disk/active-layer.js';
import { makeLogGrid } from '../../../../worker/kernels/disk/grid.js';
import { constantOpacity } from '../../../../worker/kernels/disk/opacity.js';
import { computeTransportCoefficients } from '../../../../worker/kernels/disk/transport-coefficients.js';
import { runModel } from '../../../../worker/model.js';
import { GAMMA_ADIABATIC } from '../../../../worker/kernels/disk/gravitational-instability.js';
import {
  SPECIFIC_HEAT_CGS,
  coolingRateCoefficient,
  coolingTime,
  relaxTemperature,
} from '../../../../worker/kernels/disk/thermal-inertia.js';
import { solveMidplaneTemperature, viscousHeatingCoefficient } from '../../../../worker/kernels/disk/thermal-structure.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('the one-zone energy equation (Pringle 1981; Frank, King & Raine 2002)', () => {
  it('c_v = k_B/((γ − 1) μ m_H) with γ = 7/5 (H2-dominated gas; common practice)', () => {
    expect(GAMMA_ADIABATIC).toBe(1.4);
    expect(rel(SPECIFIC_HEAT_CGS, K_BOLTZMANN_CGS / (0.4 * MEAN_MOLECULAR_WEIGHT * M_HYDROGEN_CGS))).toBeLessThan(1e-14);
  });

  it('t_cool = 3 κ Σ² c_v / (16 σ T³) (optically thick, τ = κΣ/2)', () => {
    const [kappa, sigma, t] = [1, 3000, 1000];
    expect(rel(coolingTime(kappa, sigma, t), (3 * kappa * sigma ** 2 * SPECIFIC_HEAT_CGS) / (16 * SIGMA_SB_CGS * t ** 3))).toBeLessThan(1e-14);
    // Near a dead-zone edge at 0.2-0.3 AU the cooling time is decades to centuries, not zero (header of thermal-inertia.ts).
    const yr = 3.15576e7;
    expect(coolingTime(1, 1000, 1000) / yr).toBeGreaterThan(5);
    expect(coolingTime(1, 6000, 1000) / yr).toBeLessThan(400);
  });

  it('where viscous heating holds the balance, t_cool = 4/(9 (γ − 1) α Ω): the thermal time ~ 1/(α Ω)', () => {
    const [kappa, sigma, alpha, omega] = [1, 2000, 0.01, 2e-7];
    const a = viscousHeatingCoefficient(kappa, sigma, alpha, omega);
    const t = solveMidplaneTemperature(a, 0); // T⁴ = A T: viscous heating only
    expect(rel(coolingTime(kappa, sigma, t), 4 / (9 * (GAMMA_ADIABATIC - 1) * alpha * omega))).toBeLessThan(1e-12);
  });
});

describe('backward-Euler relaxation', () => {
  const [a, c] = [2e7, 1e11]; // K^3, K^4: T_eq ≈ 690 K
  const tEq = solveMidplaneTemperature(a, c);

  it('an infinitely long step (or no earlier temperature) gives the equilibrium; a zero step keeps T', () => {
    expect(relaxTemperature(a, c, 300, Infinity, tEq)).toBe(tEq);
    expect(relaxTemperature(a, c, 0, 1e-9, tEq)).toBe(tEq);
    expect(relaxTemperature(a, c, 300, 0, tEq)).toBe(300);
  });

  it('solves T − T_old = h (A T + C − T⁴) and lies between T_old and T_eq, from below and from above', () => {
    for (const tOld of [200, 2000]) {
      for (const h of [1e-13, 1e-11, 1e-9, 1e-6]) {
        const t = relaxTemperature(a, c, tOld, h, tEq);
        expect(Math.abs(t - tOld - h * (a * t + c - t ** 4)) / t).toBeLessThan(1e-12);
        expect(t).toBeGreaterThanOrEqual(Math.min(tOld, tEq));
        expect(t).toBeLessThanOrEqual(Math.max(tOld, tEq));
      }
    }
  });

  it('a finite but enormous h (a nearly empty cell: k ∝ 1/Σ²) gives the root, not NaN from h T⁴ overflowing', () => {
    // Numerical property of the solver (common practice, no source): h T_old⁴ ~ 1e309 overflows in g as written.
    const [aTiny, hHuge] = [4.06e-304, 1.01e300];
    const eq = solveMidplaneTemperature(aTiny, 0);
    for (const tOld of [100, 150, 200]) {
      const t = relaxTemperature(aTiny, 0, tOld, hHuge, eq);
      expect(Number.isFinite(t)).toBe(true);
      expect(t).toBeGreaterThan(eq);
      expect(t).toBeLessThan(tOld);
      // The step's equation divided by h: T⁴ + (1/h − A) T − T_old/h − C = 0; its terms are ~T_old/h.
      expect(Math.abs(t ** 4 + (1 / hHuge - aTiny) * t - tOld / hHuge) / (tOld / hHuge)).toBeLessThan(1e-12);
    }
    // An ordinary cell with a huge h: the old temperature is forgotten, T is the equilibrium (to round-off).
    expect(Math.abs(relaxTemperature(a, c, 300, 1e300, tEq) / tEq - 1)).toBeLessThan(1e-15);
  });

  it('pure radiative cooling follows T(t) = T₀ (1 + 3 k T₀³ t)^(-1/3) with first-order error', () => {
    // dT/dt = −k T⁴ (A = C = 0) has this closed form; backward Euler converges to it at order 1.
    const k = coolingRateCoefficient(1, 1000);
    const t0 = 1500;
    const tEnd = 3 * coolingTime(1, 1000, t0);
    const exact = t0 * (1 + 3 * k * t0 ** 3 * tEnd) ** (-1 / 3);
    const errorWith = (steps: number): number => {
      let t = t0;
      for (let s = 0; s < steps; s++) t = relaxTemperature(0, 0, t, k * (tEnd / steps), 0);
      return Math.abs(t - exact) / exact;
    };
    const coarse = errorWith(200);
    const fine = errorWith(400);
    expect(coarse).toBeLessThan(5e-3);
    expect(coarse / fine).toBeGreaterThan(1.9);
    expect(coarse / fine).toBeLessThan(2.1);
  });
});

describe('thermal inertia in the coefficient pass and in a model', () => {
  it('a short step keeps the temperature near its old value, a long one reaches the equilibrium', () => {
    const grid = makeLogGrid(0.9 * AU_CGS, 1.1 * AU_CGS, 2);
    const sigma = Float64Array.of(2000, 2000);
    const omega = grid.centers.map((r) => Math.sqrt(GM_SUN_CGS / r ** 3));
    const physics = {
      alphaActive: 0.01, alphaDead: 0.01, activeColumn: uniformActiveLayer.create({}), opacity: constantOpacity(1), gi: null,
      baseTemperature4: Float64Array.of(100 ** 4, 100 ** 4), thermalInertia: true,
    };
    const equilibrium = { nu: new Float64Array(2), temperature: new Float64Array(2) };
    computeTransportCoefficients(grid, sigma, omega, physics, equilibrium);
    const tEq = equilibrium.temperature[0];
    const tCool = coolingTime(1, 2000, tEq);
    const short = { nu: new Float64Array(2), temperature: Float64Array.of(300, 300) };
    computeTransportCoefficients(grid, sigma, omega, physics, short, 0, 1e-3 * tCool);
    expect(short.temperature[0]).toBeGreaterThan(300);
    expect(short.temperature[0]).toBeLessThan(305);
    const long = { nu: new Float64Array(2), temperature: Float64Array.of(300, 300) };
    computeTransportCoefficients(grid, sigma, omega, physics, long, 0, 1e4 * tCool);
    expect(Math.abs(long.temperature[0] - tEq) / tEq).toBeLessThan(1e-3);
  });

  it('thermal_inertia=on changes a disk model (with its dead zone) little (t_cool << t_visc) and keeps its budgets', () => {
    const off = runModel({ initial_state: 'disk', n_cells: 100, t_end_myr: 1, checkpoints_myr: [0.1, 1] });
    const on = runModel({ initial_state: 'disk', n_cells: 100, t_end_myr: 1, checkpoints_myr: [0.1, 1], thermal_inertia: 'on' });
    expect(on.status).toBe('ok');
    expect(on.scalars.mass_budget_rel_err).toBeLessThanOrEqual(1e-10);
    expect(on.scalars.j_budget_rel_err).toBeLessThanOrEqual(1e-10);
    const last = (r: typeof on) => r.checkpoints[r.checkpoints.length - 1];
    expect(Math.abs((last(on).m_disk_msun as number) / (last(off).m_disk_msun as number) - 1)).toBeLessThan(0.01);
  });
});
