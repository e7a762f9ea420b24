import { describe, expect, it } from 'vitest';
import {
  besselIScaled,
  besselIScaledAsymptotic,
  besselIScaledSeries,
  besselSwitchPoint,
} from './bessel.js';

// The helper promises 1e-10 relative; the closed forms below are evaluated without cancellation, so they are
// good to a few ulps and any excess is the helper's.
const TOL = 1e-10;

const relErr = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

/** x from 1e-3 to 1e3, 24 points per decade, plus the switch neighbourhood of the small orders. */
function arguments_(): number[] {
  const xs: number[] = [];
  for (let k = 0; k <= 6 * 24; k++) xs.push(10 ** (-3 + k / 24));
  for (const s of [besselSwitchPoint(0.5), besselSwitchPoint(1.5), besselSwitchPoint(0.25)]) {
    xs.push(s * (1 - 1e-12), s, s * (1 + 1e-12));
  }
  return xs;
}

/** e^{-x} sinh x = −expm1(−2x)/2, exact to an ulp for every x > 0. */
const scaledSinh = (x: number): number => -0.5 * Math.expm1(-2 * x);
/** e^{-x} cosh x = (1 + e^{−2x})/2. */
const scaledCosh = (x: number): number => 0.5 * (1 + Math.exp(-2 * x));

/**
 * e^{-x} (cosh x − sinh x / x). For x < 1/2 the difference cancels (it is ~x^2/3), so use its Taylor series
 * Σ_{k≥1} 2k x^{2k} / (2k+1)!, obtained by subtracting the series of cosh and sinh/x term by term.
 */
function scaledCoshMinusSinhOverX(x: number): number {
  if (x >= 0.5) return scaledCosh(x) - scaledSinh(x) / x;
  let sum = 0;
  let power = 1; // x^{2k}
  let factorial = 1; // (2k+1)!
  for (let k = 1; k <= 20; k++) {
    power *= x * x;
    factorial *= 2 * k * (2 * k + 1);
    sum += (2 * k * power) / factorial;
  }
  return Math.exp(-x) * sum;
}

describe('exponentially scaled modified Bessel function e^{-x} I_nu(x)', () => {
  it('matches I_{1/2}(x) = sqrt(2/(pi x)) sinh x from 1e-3 to 1e3', () => {
    // Abramowitz & Stegun 10.2.13 with 10.2.2 (i_0(z) = sinh z / z, i_n(z) = sqrt(pi/(2z)) I_{n+1/2}(z)).
    let worst = 0;
    for (const x of arguments_()) {
      const exact = Math.sqrt(2 / (Math.PI * x)) * scaledSinh(x);
      worst = Math.max(worst, relErr(besselIScaled(0.5, x), exact));
    }
    expect(worst).toBeLessThan(TOL);
  });

  it('matches I_{3/2}(x) = sqrt(2/(pi x)) (cosh x - sinh x / x) from 1e-3 to 1e3', () => {
    // A&S 10.2.13 with 10.2.2 (i_1(z) = cosh z / z − sinh z / z^2); equivalently the recurrence A&S 9.6.26
    // I_{3/2} = I_{−1/2} − I_{1/2}/x with I_{−1/2}(x) = sqrt(2/(pi x)) cosh x (A&S 10.2.14).
    let worst = 0;
    for (const x of arguments_()) {
      const exact = Math.sqrt(2 / (Math.PI * x)) * scaledCoshMinusSinhOverX(x);
      worst = Math.max(worst, relErr(besselIScaled(1.5, x), exact));
    }
    expect(worst).toBeLessThan(TOL);
  });

  it('satisfies the recurrence I_{nu-1} - I_{nu+1} = (2 nu / x) I_nu for the quarter orders the ring uses', () => {
    // A&S 9.6.26. With nu = 5/4 it ties I_{1/4} (the spreading ring) to I_{9/4} and I_{5/4}, across both branches.
    let worst = 0;
    for (const x of arguments_()) {
      if (x < 0.05) continue; // below this I_{9/4} is ~1e-4 of I_{1/4}: the left side cancels, not the helper's error
      const lhs = besselIScaled(0.25, x) - besselIScaled(2.25, x);
      const rhs = ((2 * 1.25) / x) * besselIScaled(1.25, x);
      worst = Math.max(worst, relErr(lhs, rhs));
    }
    expect(worst).toBeLessThan(TOL);
  });

  it('reproduces tabulated integer-order values', () => {
    // Values from memory (A&S Table 9.8 gives e^{-x} I_n(x); these are the unscaled I_0, I_1).
    expect(relErr(Math.exp(1) * besselIScaled(0, 1), 1.2660658777520082)).toBeLessThan(TOL);
    expect(relErr(Math.exp(1) * besselIScaled(1, 1), 0.5651591039924851)).toBeLessThan(TOL);
    expect(relErr(Math.exp(10) * besselIScaled(0, 10), 2815.716628466254)).toBeLessThan(TOL);
    expect(relErr(Math.exp(10) * besselIScaled(1, 10), 2670.988303701255)).toBeLessThan(TOL);
  });

  it('has both branches agree across the switch point', () => {
    // Common practice, no source: an overlap test of the two expansions where both are accurate.
    for (const nu of [0, 0.25, 1.25, 3]) {
      const s = besselSwitchPoint(nu);
      for (const x of [0.8 * s, s, 1.5 * s]) {
        expect(relErr(besselIScaledSeries(nu, x), besselIScaledAsymptotic(nu, x))).toBeLessThan(1e-12);
      }
    }
  });

  it('handles x = 0 and rejects invalid input', () => {
    expect(besselIScaled(0, 0)).toBe(1);
    expect(besselIScaled(0.25, 0)).toBe(0);
    expect(() => besselIScaled(-0.5, 1)).toThrow(RangeError);
    expect(() => besselIScaled(0.25, -1)).toThrow(RangeError);
    expect(() => besselIScaled(0.25, Number.NaN)).toThrow(RangeError);
  });
});
