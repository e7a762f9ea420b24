/**
 * The numerical building blocks: the Thomas solve against a dense reference, and mass radii against the
 * closed form for a uniform disk.
 */
import { describe, expect, it } from 'vitest';
import { massRadii } from '../../../../worker/kernels/disk/disk-diagnostics.js';
import { makeLogGrid } from '../../../../worker/kernels/disk/grid.js';
import { solveTridiagonal } from '../../../../worker/kernels/disk/tridiagonal.js';

/** Deterministic pseudo-random numbers in [0, 1) (a 32-bit LCG, Numerical Recipes' constants). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('Thomas algorithm', () => {
  it('solves a diagonally dominant system to round-off (residual of A x = d)', () => {
    const n = 300;
    const rnd = lcg(42);
    const lower = Float64Array.from({ length: n }, () => -rnd());
    const upper = Float64Array.from({ length: n }, () => -rnd());
    const diag = Float64Array.from({ length: n }, () => 2.5 + rnd()); // |lower| + |upper| < 2: dominant
    const rhs = Float64Array.from({ length: n }, () => rnd() * 10);
    const x = new Float64Array(n);
    solveTridiagonal(lower, diag, upper, rhs, x, new Float64Array(n), n);
    let worst = 0;
    for (let i = 0; i < n; i++) {
      const ax = (i > 0 ? lower[i] * x[i - 1] : 0) + diag[i] * x[i] + (i < n - 1 ? upper[i] * x[i + 1] : 0);
      worst = Math.max(worst, Math.abs(ax - rhs[i]) / Math.abs(rhs[i]));
    }
    expect(worst).toBeLessThan(1e-13);
  });
});

describe('mass radii', () => {
  it('for uniform Σ, the radius enclosing a fraction f is sqrt(R_in² + f (R_out² − R_in²))', () => {
    const g = makeLogGrid(1, 100, 80);
    const sigma = new Float64Array(80).fill(3);
    const fs = [0.5, 0.68, 0.9];
    const radii = massRadii(g, sigma, fs);
    fs.forEach((f, k) => expect(radii[k] / Math.sqrt(1 + f * (100 ** 2 - 1))).toBeCloseTo(1, 12));
  });

  it('is NaN for an empty disk', () => {
    const g = makeLogGrid(1, 100, 10);
    expect(massRadii(g, new Float64Array(10), [0.5]).every(Number.isNaN)).toBe(true);
  });
});
