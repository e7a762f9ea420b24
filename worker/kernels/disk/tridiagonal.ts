/**
 * Thomas algorithm for a tridiagonal system a_i x_{i-1} + b_i x_i + c_i x_{i+1} = d_i (Press et al.,
 * Numerical Recipes, §2.4). Stable without pivoting for the diagonally dominant M-matrices the implicit
 * diffusion step produces. O(n), no allocation: `scratch` holds the modified upper diagonal.
 * Reciprocals keep the sign and magnitude arguments of the M-matrix case: every pivot stays positive, and
 * with a non-negative right-hand side every x_i ≥ 0 (so backward Euler keeps Σ ≥ 0).
 */
export function solveTridiagonal(
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  rhs: Float64Array,
  out: Float64Array,
  scratch: Float64Array,
  n: number,
): void {
  // One division per row: the pivot's reciprocal serves both the eliminated upper entry and the solution.
  let inv = 1 / diag[0];
  out[0] = rhs[0] * inv;
  for (let i = 1; i < n; i++) {
    scratch[i] = upper[i - 1] * inv;
    inv = 1 / (diag[i] - lower[i] * scratch[i]);
    out[i] = (rhs[i] - lower[i] * out[i - 1]) * inv;
  }
  for (let i = n - 2; i >= 0; i--) out[i] -= scratch[i + 1] * out[i + 1];
}
