/**
 * Brent's method for a root of f on a bracket [a, b] with f(a) f(b) ≤ 0 (Brent 1973, ch. 4; the "zeroin"
 * scheme of inverse quadratic interpolation, secant and bisection). The numerical method lives here, apart
 * from the physics it is used for, and stays within the bracket, so a jump in f (the FUV layer edge) still
 * converges, to the jump.
 */

export interface BracketedRoot {
  readonly x: number;
  readonly evaluations: number;
  /** False when the evaluation cap ran out before the bracket closed to the tolerance (x is then the best guess). */
  readonly converged: boolean;
}

/**
 * Root of f in [a, b], given fa = f(a), fb = f(b) of opposite signs (or one of them zero), to an absolute
 * tolerance `tol` in x, with at most `maxEvaluations` evaluations of f. Returns the end with f = 0 when there
 * is one.
 */
export function brentRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number,
  fb: number,
  tol: number,
  maxEvaluations = 200,
): BracketedRoot {
  if (fa === 0) return { x: a, evaluations: 0, converged: true };
  if (fb === 0) return { x: b, evaluations: 0, converged: true };
  if ((fa > 0) === (fb > 0)) throw new RangeError(`brentRoot: f(${a}) = ${fa} and f(${b}) = ${fb} do not bracket a root`);
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  let evaluations = 0;
  for (;;) {
    if ((fb > 0) === (fc > 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b; b = c; c = a;
      fa = fb; fb = fc; fc = fa;
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol1 || fb === 0) return { x: b, evaluations, converged: true };
    if (evaluations >= maxEvaluations) return { x: b, evaluations, converged: false };
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      // Interpolate: secant when only two points are distinct, inverse quadratic otherwise.
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : m > 0 ? tol1 : -tol1;
    fb = f(b);
    evaluations++;
  }
}

/**
 * Solution of t = g(t) from a first guess t0 > 0, to a relative tolerance, with at most `maxEvaluations`
 * evaluations of g (counting `gt0`). Requires a g that does not increase with t: t − g(t) then increases, the
 * root is unique, and the root lies between t and g(t) for every t. Plain iteration t ← g(t) is kept while it
 * contracts (the usual case, and the cheapest); where |g′| nears or passes 1 it oscillates about the root,
 * possibly forever (a period-2 cycle), so it hands over to Brent's method on that free bracket.
 *
 * Returns g at the last point evaluated, so side effects of g (what it computed on the way) belong to the answer:
 * on the plain path that point is within `relTol` of g there; on the Brent path it is within a quarter of
 * `relTol` of the root (g there is off the root by up to |g′| times that). Returns NaN when it did not converge
 * within the cap, which is what a g that increases with t leads to: with slope s < 1 plain iteration creeps
 * towards the root by a factor s per evaluation and stops short of it, and with s > 1 it runs away. The caller
 * decides what a NaN means for it (transport-coefficients.ts lets it through ν, and the run ends with a failure
 * status).
 * `gt0`, when given, is g(t0) already evaluated by the caller (the last evaluation of g before the call).
 */
export function nonIncreasingFixedPoint(
  g: (t: number) => number,
  t0: number,
  relTol: number,
  maxEvaluations: number,
  gt0?: number,
): number {
  let t = t0;
  let gt = gt0 ?? g(t);
  let evaluations = 1;
  for (;;) {
    if (Math.abs(gt - t) <= relTol * Math.abs(gt)) return gt;
    if (evaluations >= maxEvaluations) return NaN;
    const ggt = g(gt);
    evaluations++;
    // Contraction by less than half: bracket instead. F(x) = x − g(x) changes sign between t and g(t).
    const fLow = t - gt;
    const fHigh = gt - ggt;
    if (Math.abs(fHigh) > 0.5 * Math.abs(fLow) && fHigh !== 0 && (fLow > 0) !== (fHigh > 0)) {
      // One evaluation is kept back for g at the root.
      const brentCap = maxEvaluations - evaluations - 1;
      if (brentCap < 0) return NaN;
      // The tolerance from the magnitudes: g may step below 0 (not a temperature, but a map this accepts), and a
      // negative tolerance would never be met.
      const tol = 0.25 * relTol * Math.min(Math.abs(t), Math.abs(gt));
      const root = brentRoot((x) => x - g(x), t, gt, fLow, fHigh, tol, brentCap);
      return root.converged ? g(root.x) : NaN;
    }
    t = gt;
    gt = ggt;
  }
}
