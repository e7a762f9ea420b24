/**
 * A point inside stratum k of n equal strata of [0, 1): u = (k + j)/n for a jitter j in [0, 1), nudged by
 * whole ulps where rounding would otherwise put it in a neighbour, so that floor(u · n) = k holds in
 * floating point exactly as it does on paper. The nudge runs only when k + j rounds across a boundary.
 */

const scratch = new Float64Array(1);
const bits = new BigInt64Array(scratch.buffer);

/** The adjacent double in the direction of `step` (+1 up, −1 down), for finite x >= 0. */
function adjacent(x: number, step: 1 | -1): number {
  if (x === 0) return step > 0 ? Number.MIN_VALUE : 0;
  scratch[0] = x;
  bits[0] += step > 0 ? 1n : -1n;
  return scratch[0];
}

export function pointInStratum(k: number, n: number, jitter: number): number {
  let u = (k + jitter) / n;
  while (u >= 1 || Math.floor(u * n) > k) u = adjacent(u, -1);
  while (Math.floor(u * n) < k) u = adjacent(u, 1);
  return u;
}
