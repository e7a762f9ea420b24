/**
 * Local (per-cell) physics: the temperature root, the layered α rule, the GI α and the grid geometry.
 */
import { describe, expect, it } from 'vitest';
import { fixedColumnActiveLayer, layeredAlpha, uniformActiveLayer } from '../../../../worker/kernels/disk/active-layer.js';
import { alphaGravitationalInstability, toomreQ } from '../../../../worker/kernels/disk/gravitational-instability.js';
import { makeLogGrid } from '../../../../worker/kernels/disk/grid.js';
import { irradiationTemperature4, solveMidplaneTemperature } from '../../../../worker/kernels/disk/thermal-structure.js';
import { AU_CGS, L_SUN_CGS } from '../../../../shared/constants.js';

describe('midplane temperature T^4 = A T + C', () => {
  it.each([
    [0, 1e8], [1e6, 0], [1e3, 1e8], [1e9, 1e4], [1e-3, 1e12], [1e12, 1e20],
  ])('A = %d, C = %d: the root satisfies the equation to round-off', (a, c) => {
    const t = solveMidplaneTemperature(a, c);
    expect(t).toBeGreaterThan(0);
    expect(Math.abs(t ** 4 - a * t - c) / t ** 4).toBeLessThan(1e-12);
  });

  it.each([
    ['far above', 1e6], ['just above', 1.0001], ['at', 1], ['just below', 0.9999], ['below', 0.5], ['far below', 1e-6],
    ['0', 0], ['NaN', NaN], ['Infinity', Infinity], ['past overflow', 1e100],
  ])('a start guess %s the root gives the same root (to 1e-13) as the closed-form start', (_label, factor) => {
    // A = 1e9, C = 1e4 (viscous heating dominates): the root is near A^{1/3} = 1000 K. T^4 − A T − C has one
    // positive root (Descartes' rule of signs: one sign change), so every start must find the same one; the
    // 1e-13 is the solver's stated convergence (thermal-structure.ts), no physics source.
    for (const [a, c] of [[1e9, 1e4], [1e3, 1e8], [0, 81e8], [27e6, 0]]) {
      const root = solveMidplaneTemperature(a, c);
      const t = solveMidplaneTemperature(a, c, factor * root);
      expect(Math.abs(t - root) / root).toBeLessThan(1e-13);
      expect(Math.abs(t ** 4 - a * t - c) / t ** 4).toBeLessThan(1e-12);
    }
    expect(solveMidplaneTemperature(0, 0, factor)).toBe(0);
  });

  it('limits: C^{1/4} without heating, A^{1/3} without irradiation, 0 for neither', () => {
    expect(solveMidplaneTemperature(0, 81e8)).toBeCloseTo(300, 10);
    expect(solveMidplaneTemperature(27e6, 0)).toBeCloseTo(300, 10);
    expect(solveMidplaneTemperature(0, 0)).toBe(0);
  });

  it('irradiation follows 280 K (R/AU)^{-1/2} (L/L_sun)^{1/4} (Hayashi 1981)', () => {
    expect(irradiationTemperature4(AU_CGS, L_SUN_CGS) ** 0.25).toBeCloseTo(280, 10);
    expect(irradiationTemperature4(4 * AU_CGS, 16 * L_SUN_CGS) ** 0.25).toBeCloseTo(280, 10);
  });
});

describe('layered transport (Gammie 1996)', () => {
  it('α_eff Σ = α_active Σ_a + α_dead (Σ − Σ_a) where the column exceeds the active layer', () => {
    const sigma = 1000;
    const sigmaA = fixedColumnActiveLayer.create({ sigmaActiveFace: 100 })({ sigma, temperature: 100, radius: AU_CGS, omega: 2e-7, time: 0, index: 0 });
    expect(sigmaA).toBe(200);
    const alpha = layeredAlpha(sigma, sigmaA, 1e-2, 1e-5);
    expect(alpha * sigma).toBeCloseTo(1e-2 * 200 + 1e-5 * 800, 12);
  });

  it('a column thinner than the active layer is fully active, also when empty', () => {
    expect(layeredAlpha(50, 200, 1e-2, 0)).toBe(1e-2);
    expect(layeredAlpha(0, 200, 1e-2, 0)).toBe(1e-2);
    expect(uniformActiveLayer.create({})({ sigma: 5e4, temperature: 10, radius: AU_CGS, omega: 2e-7, time: 0, index: 0 })).toBe(5e4);
  });
});

describe('gravitational-instability α', () => {
  const cs = 3e4;
  const omega = 2e-8;
  const sigmaForQ = (q: number) => (cs * omega) / (Math.PI * 6.6743e-8 * q);

  it('is 0.01 [(Q_crit/Q)^2 − 1] below Q_crit and zero above it', () => {
    expect(toomreQ(cs, omega, sigmaForQ(1))).toBeCloseTo(1, 12);
    expect(alphaGravitationalInstability(cs, omega, sigmaForQ(1), 2, 1)).toBeCloseTo(0.03, 12);
    expect(alphaGravitationalInstability(cs, omega, sigmaForQ(2.5), 2, 1)).toBe(0);
    expect(alphaGravitationalInstability(cs, omega, 0, 2, 1)).toBe(0);
  });

  it('is capped', () => {
    expect(alphaGravitationalInstability(cs, omega, sigmaForQ(0.1), 2, 0.1)).toBe(0.1);
  });
});

describe('log grid', () => {
  it('spans R_in to R_out with equal ln R spacing and annulus areas summing to π(R_out² − R_in²)', () => {
    const g = makeLogGrid(AU_CGS, 100 * AU_CGS, 50);
    expect(g.edges[0]).toBe(AU_CGS);
    expect(g.edges[50]).toBe(100 * AU_CGS);
    const ratios = Array.from({ length: 50 }, (_, e) => g.edges[e + 1] / g.edges[e]);
    for (const r of ratios) expect(r).toBeCloseTo(100 ** (1 / 50), 12);
    const area = g.area.reduce((a, b) => a + b, 0);
    expect(area / (Math.PI * (g.edges[50] ** 2 - g.edges[0] ** 2))).toBeCloseTo(1, 12);
  });

  it('rejects a degenerate grid', () => {
    expect(() => makeLogGrid(10, 5, 10)).toThrow(RangeError);
    expect(() => makeLogGrid(1, 5, 1)).toThrow(RangeError);
  });
});
