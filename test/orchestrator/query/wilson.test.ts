/**
 * Wilson (1927) score interval against the worked examples of Newcombe 1998 (Statistics in Medicine 17, 857),
 * Table I, method 3 (score interval without continuity correction). The table values below are as remembered
 * from that table (not re-read for this test); each was also recomputed by hand from the closed form
 * (p + z²/2n ± z sqrt(p(1-p)/n + z²/4n²)) / (1 + z²/n) with z = 1.959964 and agrees to the 4 decimals quoted.
 */
import { describe, expect, it } from 'vitest';
import { Z_95, wilson } from '../../../orchestrator/query/wilson.js';

describe('wilson', () => {
  it.each([
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0.0, 0.1611],
    [1, 29, 0.0061, 0.1718],
    [29, 29, 0.883, 1.0],
  ])('%i/%i -> [%f, %f] (Newcombe 1998, Table I)', (k, n, low, high) => {
    const w = wilson(k, n);
    expect(w.low).toBeCloseTo(low, 4);
    expect(w.high).toBeCloseTo(high, 4);
    expect(w.fraction).toBe(k / n);
  });

  it('z is the 0.975 normal quantile; n = 0 gives the whole [0, 1]', () => {
    // Phi(1.959964) = 0.975 (standard normal tables, e.g. Abramowitz & Stegun 1964, Table 26.1).
    expect(Z_95).toBeCloseTo(1.959964, 6);
    expect(wilson(0, 0)).toMatchObject({ low: 0, high: 1 });
  });

  it('the interval contains the estimate and shrinks like 1/sqrt(n)', () => {
    const a = wilson(30, 100);
    const b = wilson(3000, 10_000);
    expect(a.low).toBeLessThan(0.3);
    expect(a.high).toBeGreaterThan(0.3);
    expect((a.high - a.low) / (b.high - b.low)).toBeCloseTo(10, 0);
  });
});
