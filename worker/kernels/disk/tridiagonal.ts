/**
 * Thomas algorithm for a tridiagonal system a_i x_{i-1} + b_i x_i + c_i x_{i+1} = d_i (Press et al.,
 * Numerical Recipes, §2.4). Stable without pivoting for the diagonally dominant M-matrices the implicit
 * diffusion step produces. O(n), no allocation: `scratch` holds the modified upper diagonal.
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
  let beta = diag[0];
  out[0] = rhs[0] / beta;
  for (let i = 1; i < n; i++) {
    scratch[i] = upper[i - 1] / beta;
    beta = diag[i] - lower[i] * scratch[i];
    out[i] = (rhs[i] - lower[i] * out[i - 1]) / beta;
  }
  for (let i = n - 2; i >= 0; i--) out[i] -= scratch[i + 1] * out[i + 1];
}
