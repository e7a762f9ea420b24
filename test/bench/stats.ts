/** Small timing helpers for the bench: a monotonic clock in ns and order statistics of samples. */

/** Monotonic time in nanoseconds (as a double: exact well past the length of any bench). */
export function nowNs(): number {
  return Number(process.hrtime.bigint());
}

/** The q-quantile (0 ≤ q ≤ 1) of the samples by linear interpolation between order statistics. */
export function quantile(samples: readonly number[], q: number): number {
  if (samples.length === 0) throw new RangeError('quantile of no samples');
  const sorted = [...samples].sort((a, b) => a - b);
  const pos = q * (sorted.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (pos - lo) * (sorted[hi] - sorted[lo]);
}

export const median = (samples: readonly number[]): number => quantile(samples, 0.5);

/** Round to `digits` significant digits so the JSON stays readable. */
export function sig(value: number, digits = 4): number {
  return Number.isFinite(value) && value !== 0 ? Number(value.toPrecision(digits)) : value;
}

/** Progress goes to stderr so stdout holds only the one JSON object. */
export function progress(message: string): void {
  process.stderr.write(`[bench] ${message}\n`);
}
