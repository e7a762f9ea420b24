/**
 * The numerical method behind the tabulated wind profiles (kept apart from the physics): the cumulative
 * fraction G(u) = ∫_{u0}^{u} f / ∫_{u0}^{u1} f of a non-negative density f on a uniform table in u, by
 * composite Simpson per interval, read back by linear interpolation. A cell's share of a wind is then
 * G(u_outer) − G(u_inner): shares of adjacent cells telescope, so the shares of any grid sum to exactly the
 * table's G over the grid's span, and a grid that covers the profile carries all of it.
 */
export interface CumulativeTable {
  readonly u0: number;
  readonly step: number;
  /** G at u0 + k·step, from 0 to 1. */
  readonly fraction: Float64Array;
}

/** Tabulate G for a density `f` on [u0, u1] with `intervals` intervals (f is clipped at 0). */
export function makeCumulativeTable(f: (u: number) => number, u0: number, u1: number, intervals: number): CumulativeTable {
  const step = (u1 - u0) / intervals;
  const fraction = new Float64Array(intervals + 1);
  const g = (u: number): number => Math.max(0, f(u));
  let sum = 0;
  let left = g(u0);
  for (let k = 0; k < intervals; k++) {
    const a = u0 + k * step;
    const right = g(a + step);
    sum += (step / 6) * (left + 4 * g(a + 0.5 * step) + right);
    fraction[k + 1] = sum;
    left = right;
  }
  if (!(sum > 0)) throw new RangeError('makeCumulativeTable: the density integrates to zero');
  for (let k = 1; k <= intervals; k++) fraction[k] /= sum;
  return { u0, step, fraction };
}

/**
 * Rates of n cells from a cumulative fraction F known at the n + 1 cell edges: rate·(F(e+1) − F(e)) into `out`.
 * Returns their sum, which telescopes to rate·(F(n) − F(0)).
 */
export function cellRatesFromCumulative(n: number, rate: number, cumulativeAtEdge: (e: number) => number, out: Float64Array): number {
  let total = 0;
  let below = cumulativeAtEdge(0);
  for (let i = 0; i < n; i++) {
    const above = cumulativeAtEdge(i + 1);
    out[i] = rate * (above - below);
    total += out[i];
    below = above;
  }
  return total;
}

/** G(u), 0 below the table and 1 above it. */
export function fractionAt(table: CumulativeTable, u: number): number {
  const x = (u - table.u0) / table.step;
  if (!(x > 0)) return 0;
  const last = table.fraction.length - 1;
  if (x >= last) return 1;
  const k = Math.floor(x);
  const w = x - k;
  return table.fraction[k] + w * (table.fraction[k + 1] - table.fraction[k]);
}
