/**
 * Logarithmically spaced finite-volume grid in cylindrical radius (cgs). Cell i spans edges[i]..edges[i+1];
 * its centre is the geometric mean of its edges, the natural midpoint in ln R.
 *
 * The viscous flux is written in j ∝ R^{1/2} (see viscous-transport.ts), so the grid also stores R^{1/2} at
 * centres and edges and the edge weights 1/(R^{1/2}_{outer} - R^{1/2}_{inner}) the flux needs.
 */
export interface DiskGrid {
  readonly n: number;
  /** Cell edges, n + 1 values, cm. */
  readonly edges: Float64Array;
  /** Cell centres, n values, cm. */
  readonly centers: Float64Array;
  /** Annulus area π (R_{i+1/2}^2 - R_{i-1/2}^2), cm^2. */
  readonly area: Float64Array;
  /** R^{1/2} at centres, cm^{1/2}; specific angular momentum is j_i = (G M_*)^{1/2} sqrtCenters[i]. */
  readonly sqrtCenters: Float64Array;
  /** R^{1/2} at edges, cm^{1/2}. */
  readonly sqrtEdges: Float64Array;
  /**
   * Edge weights, n + 1 values, cm^{-1/2}: w_0 = 1/(√R_0 - √R_{-1/2}) (zero-torque point at the inner edge),
   * w_e = 1/(√R_e - √R_{e-1}) between centres, w_n = 1/(√R_{n-1/2} - √R_{n-1}) (zero-torque point at the outer edge).
   */
  readonly edgeWeight: Float64Array;
}

export function makeLogGrid(rInCm: number, rOutCm: number, n: number): DiskGrid {
  if (!(rInCm > 0 && rOutCm > rInCm && Number.isInteger(n) && n >= 2)) {
    throw new RangeError(`makeLogGrid: need 0 < rIn < rOut and n >= 2 (got ${rInCm}, ${rOutCm}, ${n})`);
  }
  const edges = new Float64Array(n + 1);
  const logIn = Math.log(rInCm);
  const dlog = (Math.log(rOutCm) - logIn) / n;
  for (let e = 0; e <= n; e++) edges[e] = Math.exp(logIn + e * dlog);
  // Pin the ends exactly so R_in and R_out are what the user asked for.
  edges[0] = rInCm;
  edges[n] = rOutCm;
  const centers = new Float64Array(n);
  const area = new Float64Array(n);
  const sqrtCenters = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    centers[i] = Math.sqrt(edges[i] * edges[i + 1]);
    area[i] = Math.PI * (edges[i + 1] * edges[i + 1] - edges[i] * edges[i]);
    sqrtCenters[i] = Math.sqrt(centers[i]);
  }
  const sqrtEdges = edges.map(Math.sqrt);
  const edgeWeight = new Float64Array(n + 1);
  edgeWeight[0] = 1 / (sqrtCenters[0] - sqrtEdges[0]);
  for (let e = 1; e < n; e++) edgeWeight[e] = 1 / (sqrtCenters[e] - sqrtCenters[e - 1]);
  edgeWeight[n] = 1 / (sqrtEdges[n] - sqrtCenters[n - 1]);
  return { n, edges, centers, area, sqrtCenters, sqrtEdges, edgeWeight };
}
