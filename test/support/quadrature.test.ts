import { describe, expect, it } from 'vitest';
import { makeLogGrid } from '../../worker/kernels/disk/grid.js';
import { cellAverages, gaussLegendre, integrate } from './quadrature.js';

describe('Gauss-Legendre quadrature', () => {
  it('integrates polynomials up to degree 2n - 1 exactly and no further', () => {
    // A&S 25.4.29: an n-point rule is exact for degree <= 2n - 1; ∫_0^1 x^k dx = 1/(k+1).
    for (const n of [1, 2, 5, 8, 16]) {
      const rule = gaussLegendre(n);
      for (let k = 0; k <= 2 * n - 1; k++) {
        expect(Math.abs(integrate(rule, 0, 1, (x) => x ** k) - 1 / (k + 1))).toBeLessThan(1e-14);
      }
      // Degree 2n is not exact; its error (A&S 25.4.30) is above 1e-10 only for small n.
      const k = 2 * n;
      if (n <= 5) expect(Math.abs(integrate(rule, 0, 1, (x) => x ** k) - 1 / (k + 1))).toBeGreaterThan(1e-10);
    }
  });

  it('gives exact cell averages of a surface density linear in R', () => {
    // Σ = a + bR: ∫ (a + bR) 2πR dR = π a (R2^2 − R1^2) + (2π b / 3)(R2^3 − R1^3) (exact; degree 2 in R).
    const grid = makeLogGrid(1, 100, 20);
    const avg = cellAverages(grid, gaussLegendre(2), (r) => 3 + 0.5 * r);
    for (let i = 0; i < grid.n; i++) {
      const [r1, r2] = [grid.edges[i], grid.edges[i + 1]];
      const exact = (Math.PI * 3 * (r2 * r2 - r1 * r1) + ((2 * Math.PI * 0.5) / 3) * (r2 ** 3 - r1 ** 3)) / grid.area[i];
      expect(Math.abs(avg[i] / exact - 1)).toBeLessThan(1e-13);
    }
  });

  it('rejects an invalid order', () => {
    expect(() => gaussLegendre(0)).toThrow(RangeError);
  });
});
