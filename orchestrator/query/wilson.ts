/**
 * The Wilson (1927) score interval for a binomial proportion: the set of p for which |x/n - p| is within z
 * standard errors sqrt(p(1-p)/n). Unlike the Wald interval it stays inside [0, 1] and keeps close to its
 * nominal coverage for small n and for proportions near 0 or 1 (Newcombe 1998, Statistics in Medicine 17,
 * 857, method 3).
 */

/** z for a two-sided 95 % interval: the 0.975 quantile of the standard normal distribution. */
export const Z_95 = 1.959963984540054;

export interface Proportion {
  /** Successes. */
  readonly k: number;
  /** Trials. */
  readonly n: number;
  /** k / n (NaN when n = 0). */
  readonly fraction: number;
  /** Wilson interval at the given z (95 % by default); [0, 1] when n = 0. */
  readonly low: number;
  readonly high: number;
}

/**
 * Wilson score interval: centre (p + z²/2n) / (1 + z²/n), half-width z/(1 + z²/n) · sqrt(p(1-p)/n + z²/4n²)
 * (Wilson 1927, JASA 22, 209; in the form of Newcombe 1998, eq. for method 3).
 */
export function wilson(k: number, n: number, z = Z_95): Proportion {
  if (n <= 0) return { k, n, fraction: Number.NaN, low: 0, high: 1 };
  const p = k / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  // Clamp round-off at the ends (k = 0 gives exactly 0 in exact arithmetic).
  return { k, n, fraction: p, low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}
