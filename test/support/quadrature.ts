/**
 * Gauss–Legendre quadrature (Abramowitz & Stegun 25.4.29) and the cell averages of an analytic surface density
 * over the annuli of a disk grid, for starting and scoring finite-volume runs against analytic solutions.
 * Nodes are the roots of P_n found by Newton's method from Tricomi's first guess cos(π(k − 1/4)/(n + 1/2))
 * (Numerical Recipes §4.6); weights w_k = 2 / ((1 − x_k^2) P_n'(x_k)^2).
 */
import type { DiskGrid } from '../../worker/kernels/disk/grid.js';

export interface QuadratureRule {
  /** Nodes on [−1, 1]. */
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

export function gaussLegendre(n: number): QuadratureRule {
  if (!(Number.isInteger(n) && n >= 1 && n <= 200)) throw new RangeError(`gaussLegendre: need 1 <= n <= 200 (got ${n})`);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let k = 1; k <= n; k++) {
    let x = Math.cos((Math.PI * (k - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      // P_n(x) and P_{n−1}(x) by the three-term recurrence (A&S 22.7.10).
      let p0 = 1;
      let p1 = x;
      for (let m = 2; m <= n; m++) {
        const p2 = ((2 * m - 1) * x * p1 - (m - 1) * p0) / m;
        p0 = p1;
        p1 = p2;
      }
      const pn = n === 1 ? x : p1;
      const pnm1 = n === 1 ? 1 : p0;
      dp = (n * (x * pn - pnm1)) / (x * x - 1);
      const step = pn / dp;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    nodes[k - 1] = x;
    weights[k - 1] = 2 / ((1 - x * x) * dp * dp);
  }
  return { nodes, weights };
}

/** ∫_a^b f(R) dR with the given rule mapped onto [a, b]. */
export function integrate(rule: QuadratureRule, a: number, b: number, f: (r: number) => number): number {
  const mid = 0.5 * (a + b);
  const half = 0.5 * (b - a);
  let sum = 0;
  for (let k = 0; k < rule.nodes.length; k++) sum += rule.weights[k] * f(mid + half * rule.nodes[k]);
  return half * sum;
}

/** Cell averages ⟨Σ⟩_i = ∫ Σ(R) 2πR dR / A_i over each annulus, with the rule applied per cell in R. */
export function cellAverages(grid: DiskGrid, rule: QuadratureRule, sigma: (r: number) => number): Float64Array {
  const out = new Float64Array(grid.n);
  for (let i = 0; i < grid.n; i++) {
    const mass = integrate(rule, grid.edges[i], grid.edges[i + 1], (r) => 2 * Math.PI * r * sigma(r));
    out[i] = mass / grid.area[i];
  }
  return out;
}

/** Mass-weighted relative L1 distance Σ_i A_i |Σ_i − Σ_i^ref| / Σ_i A_i |Σ_i^ref| over the selected cells. */
export function relativeL1(
  grid: DiskGrid,
  sigma: Float64Array,
  reference: Float64Array,
  include: (i: number) => boolean = () => true,
): number {
  let diff = 0;
  let norm = 0;
  for (let i = 0; i < grid.n; i++) {
    if (!include(i)) continue;
    diff += grid.area[i] * Math.abs(sigma[i] - reference[i]);
    norm += grid.area[i] * Math.abs(reference[i]);
  }
  return diff / norm;
}
