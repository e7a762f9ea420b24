/**
 * The fixed-point solver of the midplane temperature, on maps whose fixed point is known in closed form, and
 * in the coefficient pass where plain iteration falls into a period-2 cycle (gravitational instability near
 * marginal stability); its evaluation cap, and what it does with maps outside its contract (increasing ones).
 */
import { describe, expect, it } from 'vitest';
import { G_CGS, M_SUN_CGS, AU_CGS } from '../../../../shared/constants.js';
import { uniformActiveLayer } from '../../../../worker/kernels/disk/active-layer.js';
import { alphaGravitationalInstability } from '../../../../worker/kernels/disk/gravitational-instability.js';
import { evolveDisk } from '../../../../worker/kernels/disk/evolve.js';
import { makeLogGrid } from '../../../../worker/kernels/disk/grid.js';
import { constantOpacity, type Opacity } from '../../../../worker/kernels/disk/opacity.js';
import {
  SOUND_SPEED2_PER_K,
  solveMidplaneTemperature,
  viscousHeatingCoefficient,
} from '../../../../worker/kernels/disk/thermal-structure.js';
import { computeTransportCoefficients, type TransportPhysics } from '../../../../worker/kernels/disk/transport-coefficients.js';
import { brentRoot, nonIncreasingFixedPoint } from '../../../../worker/kernels/numerics/root-finding.js';
import { parseModelParams } from '../../../../shared/model-params.js';
import { setupModel } from '../../../../worker/model-setup.js';

describe('fixed point of a non-increasing map', () => {
  // g(t) = a − b t has the fixed point a / (1 + b) (algebra); plain iteration multiplies the error by −b.
  it.each([0.3, 0.9, 1, 3, 30])('g(t) = 10 − %d t: reaches a/(1 + b) whether or not plain iteration contracts', (b) => {
    const calls: number[] = [];
    const g = (t: number): number => {
      calls.push(t);
      return 10 - b * t;
    };
    const root = nonIncreasingFixedPoint(g, 1, 1e-12, 60);
    expect(Math.abs(root - 10 / (1 + b)) / (10 / (1 + b))).toBeLessThan(1e-10);
    // The last evaluation is at the answer: what g computed on the way belongs to it.
    expect(Math.abs(calls[calls.length - 1] - root) / root).toBeLessThan(1e-10);
  });

  it('a constant map is its own fixed point after two evaluations', () => {
    let n = 0;
    expect(nonIncreasingFixedPoint(() => (n++, 7), 100, 1e-12, 60)).toBe(7);
    expect(n).toBe(2);
  });

  it('a caller that already evaluated g(t0) passes it and the solver does not evaluate g there again', () => {
    const calls: number[] = [];
    const g = (t: number): number => (calls.push(t), 10 - 0.5 * t);
    // g(t) = a − b t: fixed point a / (1 + b) (algebra).
    const root = nonIncreasingFixedPoint(g, 1, 1e-12, 60, g(1));
    expect(Math.abs(root - 10 / 1.5) / (10 / 1.5)).toBeLessThan(1e-10);
    expect(calls.filter((t) => t === 1)).toHaveLength(1);
  });
});

describe('evaluation cap', () => {
  it('brentRoot stops at its cap and says it did not converge', () => {
    // x³ − 2 on [0, 2]: root 2^(1/3) (algebra); 3 evaluations cannot close the bracket to 1e-14.
    let n = 0;
    const f = (x: number): number => (n++, x ** 3 - 2);
    const capped = brentRoot(f, 0, 2, -2, 6, 1e-14, 3);
    expect(capped.converged).toBe(false);
    expect(capped.evaluations).toBe(3);
    expect(n).toBe(3);
    n = 0;
    const free = brentRoot(f, 0, 2, -2, 6, 1e-14);
    expect(free.converged).toBe(true);
    expect(free.evaluations).toBe(n);
    expect(Math.abs(free.x - Math.cbrt(2))).toBeLessThan(1e-13);
  });

  // g(t) = 10 − b t, fixed point 10/(1 + b) (algebra); b = 3 hands over to Brent's method after two evaluations.
  it.each([0.3, 3])('g(t) = 10 − %d t: never more evaluations than the cap; NaN, or the fixed point, within it', (b) => {
    let converged = 0;
    for (let cap = 1; cap <= 40; cap++) {
      let n = 0;
      const root = nonIncreasingFixedPoint((t) => (n++, 10 - b * t), 1, 1e-12, cap);
      expect(n).toBeLessThanOrEqual(cap);
      if (!Number.isNaN(root)) {
        converged++;
        expect(Math.abs(root - 10 / (1 + b)) / (10 / (1 + b))).toBeLessThan(1e-10);
      }
    }
    // Both paths converge well within 40 (so the loop above saw both outcomes).
    expect(converged).toBeGreaterThan(0);
    expect(converged).toBeLessThan(40);
  });

  it('an evaluation g(t0) the caller passes in counts against the cap', () => {
    let n = 0;
    const g = (t: number): number => (n++, 10 - 0.3 * t);
    const gt0 = g(1);
    n = 0;
    expect(nonIncreasingFixedPoint(g, 1, 1e-12, 1, gt0)).toBeNaN();
    expect(n).toBe(0);
  });
});

describe('maps that increase with t (outside the contract): no silent wrong answer', () => {
  // g(t) = a + s t with s > 0: fixed point a/(1 − s) = 10 000 (algebra). Plain iteration creeps towards it by a
  // factor s per evaluation (s = 0.95: 40 evaluations leave ~13 % of the gap) or runs away (s > 1).
  it.each([
    [0.95, 500],
    [1.5, -5000],
  ])('slope %d: NaN within the cap of 40, not a value short of the root or Infinity', (s, a) => {
    let n = 0;
    expect(nonIncreasingFixedPoint((t) => (n++, a + s * t), 1, 1e-10, 40)).toBeNaN();
    expect(n).toBeLessThanOrEqual(40);
  });

  // κ = κ_1 (T / 1 K)^4 at fixed Σ: T_visc³ ∝ κ (thermal-structure.ts, T_visc⁴ = A T with A ∝ κ), so T_eq ∝ T^(4/3)
  // where viscous heating dominates, and the fixed point T = T_eq(T) repels plain iteration.
  const risingOpacity: Opacity = { name: 'rising', kappa: (_rho, t) => 1e-8 * t ** 4, isConstant: false };

  it('a coefficient pass with an opacity law that breaks the contract gives NaN T and ν in the cells it cannot solve', () => {
    const r = 1 * AU_CGS;
    const omega = Math.sqrt((G_CGS * M_SUN_CGS) / r ** 3);
    const grid = makeLogGrid(0.99 * r, 1.01 * r, 2);
    const physics: TransportPhysics = {
      alphaActive: 1e-2, alphaDead: 1e-2, activeColumn: uniformActiveLayer.create({}), opacity: risingOpacity, gi: null,
      baseTemperature4: Float64Array.of(100 ** 4, 100 ** 4),
    };
    const fields = { nu: new Float64Array(2), temperature: Float64Array.of(300, 300) };
    computeTransportCoefficients(grid, Float64Array.of(1e3, 1e3), Float64Array.of(omega, omega), physics, fields);
    expect(fields.temperature[0]).toBeNaN();
    expect(fields.nu[0]).toBeNaN();
  });

  it('a run with that law ends with a failure status, not with a thrown error or a wrong temperature', () => {
    const base = setupModel(parseModelParams({ initial_state: 'disk', n_cells: 40, t_end_myr: 0.01, checkpoints_myr: [0.01] })).evolve;
    const outcome = evolveDisk({ ...base, transport: { ...base.transport, opacity: risingOpacity } });
    // Every try from the NaN ν is non-finite; the retries shrink the step until it collapses (measured: step_collapse
    // at t = 0, 17 of 40 cells unsolved).
    expect(['step_collapse', 'non_finite']).toContain(outcome.status);
    expect(outcome.state.steps).toBe(0);
    expect(Array.from(outcome.state.temperature).some(Number.isNaN)).toBe(true);
  });
});

describe('midplane temperature under gravitational instability near marginal stability', () => {
  // A cell at 1.9 AU around 0.5 M_sun, κ = 1 cm²/g, α_dead-like α = 1e-4 plus α_GI (q_crit 2, cap 0.1),
  // irradiated to 204 K: the state a piling-up dead zone reaches (numbers chosen to sit near Q = q_crit).
  const r = 1.9 * AU_CGS;
  const omega = Math.sqrt((G_CGS * 0.5 * M_SUN_CGS) / r ** 3);
  const base4 = 204 ** 4;
  const balance = (sigma: number) => (t: number): number => {
    const alpha = 1e-4 + alphaGravitationalInstability(Math.sqrt(SOUND_SPEED2_PER_K * t), omega, sigma, 2, 0.1);
    return solveMidplaneTemperature(viscousHeatingCoefficient(1, sigma, alpha, omega), base4);
  };
  const physics: TransportPhysics = {
    alphaActive: 1e-4, alphaDead: 1e-4, activeColumn: uniformActiveLayer.create({}), opacity: constantOpacity(1),
    gi: { qCrit: 2, alphaMax: 0.1 }, baseTemperature4: Float64Array.of(base4, base4),
  };
  // Two cells of the same state (a grid needs two); Ω is the one at r for both.
  const grid = makeLogGrid(0.99 * r, 1.01 * r, 2);
  // Σ where α_GI just switches on: Q = q_crit at the temperature without GI.
  const coefficientsAt = (sigma: number, tStart: number) => {
    const fields = { nu: new Float64Array(2), temperature: Float64Array.of(tStart, tStart) };
    computeTransportCoefficients(grid, Float64Array.of(sigma, sigma), Float64Array.of(omega, omega), physics, fields);
    return { t: fields.temperature[0], nu: fields.nu[0] };
  };

  it('plain iteration cycles there, and the coefficient pass still returns the fixed point T = T_eq(α(T))', () => {
    // Find a Σ where plain iteration does not converge in 40 passes (so the check below can fail).
    let cycling = NaN;
    for (let sigma = 1e4; sigma < 1e5 && Number.isNaN(cycling); sigma *= 1.01) {
      let t = 1200;
      for (let k = 0; k < 40; k++) t = balance(sigma)(t);
      if (Math.abs(balance(sigma)(t) - t) > 1e-3 * t) cycling = sigma;
    }
    expect(Number.isNaN(cycling)).toBe(false);
    for (const tStart of [300, 1200, 5000]) {
      const { t } = coefficientsAt(cycling, tStart);
      expect(Math.abs(balance(cycling)(t) - t) / t).toBeLessThan(1e-9);
    }
  });

  it('where Q ≥ q_crit at the answer, the pass returns T_eq of α without GI, from cold or hot starts', () => {
    // Σ = 10³ g cm⁻² at 1.9 AU: T ≈ 212 K and Q ≈ 22 (c_s Ω / (π G Σ), Toomre 1964), far above q_crit = 2.
    const sigma = 1e3;
    const expected = solveMidplaneTemperature(viscousHeatingCoefficient(1, sigma, 1e-4, omega), base4);
    expect(alphaGravitationalInstability(Math.sqrt(SOUND_SPEED2_PER_K * expected), omega, sigma, 2, 0.1)).toBe(0);
    // 1 K: so cold that α_GI > 0 at the first guess, and the iteration has to leave it.
    expect(alphaGravitationalInstability(Math.sqrt(SOUND_SPEED2_PER_K * 1), omega, sigma, 2, 0.1)).toBeGreaterThan(0);
    for (const tStart of [1, 150, expected, 5000]) {
      const { t, nu } = coefficientsAt(sigma, tStart);
      // To the 1e-13 of the quartic's Newton solve (its last bits depend on where it starts).
      expect(Math.abs(t - expected) / expected).toBeLessThan(1e-13);
      expect(Math.abs(nu - (1e-4 * SOUND_SPEED2_PER_K * expected) / omega) / nu).toBeLessThan(1e-13);
    }
  });

  it('ν is a continuous function of Σ there: no jump between Σ and Σ (1 + 10⁻³), whatever the last temperature', () => {
    let worst = 0;
    for (let sigma = 1e4; sigma < 1e5; sigma *= 1.001) {
      const a = coefficientsAt(sigma, 1200).nu;
      const b = coefficientsAt(sigma * 1.001, 300).nu;
      worst = Math.max(worst, Math.abs(Math.log(b / a)));
    }
    // ν ∝ α T with T ∝ Σ² under marginal GI regulation at most (Q = c_s Ω / (π G Σ) held near q_crit, Toomre 1964,
    // so c_s ∝ Σ): a 10⁻³ step of Σ moves ln T by ~2e-3; the bound 0.05 leaves room for α_GI's own change (a margin,
    // common practice, no source); the period-2 cycle made ln ν jump by ~1.
    expect(worst).toBeLessThan(0.05);
  });
});
