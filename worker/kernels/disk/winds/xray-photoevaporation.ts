/**
 * Internal X-ray photoevaporation: the fits of Owen, Clarke & Ercolano 2012 (appendix B) to the radiation-
 * hydrodynamic models of Owen, Ercolano & Clarke 2011 (X-ray + EUV irradiation), for a primordial disk and for
 * a disk with an inner hole. All coefficients below are from memory.
 *
 * Total rates (M_sun/yr): primordial 6.25e-9 (M_* /M_sun)^-0.068 (L_X/1e30 erg/s)^1.14 (eq. B1);
 * inner hole 4.8e-9 (M_* /M_sun)^-0.148 (L_X/1e30 erg/s)^1.14 (eq. B4).
 * Profiles: primordial in x = 0.85 (R/AU)(M_* /M_sun)^-1, zero for x < 0.7 (eqs. B2–B3), the derivative of the
 * fitted cumulative rate 10^{P(log x)}, tapered by exp[−(x/100)^10]; inner hole in
 * y = 0.95 (R − R_hole)/AU (M_* /M_sun)^-1, zero for y < 0, tapered by exp[−(y/57)^10] (eqs. B5–B6).
 * Each profile is normalised so that it integrates to its total rate; a cell's rate is the total times the
 * share of the profile between its edges (cumulative-table.ts), so any grid that covers the profile carries
 * exactly the published total.
 */
import { AU_CGS, M_SUN_CGS, YEAR_CGS } from '../../../../shared/constants.js';
import type { DiskGrid } from '../grid.js';
import { cellRatesFromCumulative, fractionAt, makeCumulativeTable, type CumulativeTable } from './cumulative-table.js';

const MSUN_PER_YR = M_SUN_CGS / YEAR_CGS;
const LN10 = Math.LN10;

/** Owen, Clarke & Ercolano 2012, eq. B1 (from memory): g s^-1. */
export function xrayPrimordialRate(mStarMsun: number, lxErgS: number): number {
  return 6.25e-9 * mStarMsun ** -0.068 * (lxErgS / 1e30) ** 1.14 * MSUN_PER_YR;
}

/** Owen, Clarke & Ercolano 2012, eq. B4 (from memory): g s^-1. */
export function xrayHoleRate(mStarMsun: number, lxErgS: number): number {
  return 4.8e-9 * mStarMsun ** -0.148 * (lxErgS / 1e30) ** 1.14 * MSUN_PER_YR;
}

/** Polynomial coefficients a1…g1 of eq. B2 (highest power first; from memory). */
const PRIMORDIAL = [0.15138, -1.2182, 3.4046, -3.5717, -0.32762, 3.6064, -2.4918] as const;
/** a2…f2 of eq. B5 (from memory). */
const HOLE = { a: -0.438226, b: -0.10658387, c: 0.5699464, d: 0.010732277, e: -0.131809597, f: -1.32285709 } as const;
export const XRAY_PRIMORDIAL_X_MIN = 0.7;

/** Inner edge of the primordial profile, x = 0.7, in cm. */
export function xrayLaunchRadius(mStar: number): number {
  return (XRAY_PRIMORDIAL_X_MIN / 0.85) * AU_CGS * (mStar / M_SUN_CGS);
}

/**
 * Unnormalised Σ̇(x) of the primordial disk (eq. B2): 10^{P(log x)} times the bracket of eq. B3, which is
 * P'(log x)/(x² ln²10), times the taper; zero inside x = 0.7 and where the fit turns negative.
 */
export function xrayPrimordialShape(x: number): number {
  if (x < XRAY_PRIMORDIAL_X_MIN) return 0;
  const u = Math.log10(x);
  const [a, b, c, d, e, f, g] = PRIMORDIAL;
  const p = ((((((a * u + b) * u + c) * u + d) * u + e) * u + f) * u + g);
  const dp = (((((6 * a * u + 5 * b) * u + 4 * c) * u + 3 * d) * u + 2 * e) * u + f);
  const value = (10 ** p * dp) / (x * x * LN10 * LN10) * Math.exp(-((x / 100) ** 10));
  return Math.max(0, value);
}

/** Unnormalised R Σ̇ of the inner-hole disk as a function of y (eq. B5 times R, so R drops out). */
export function xrayHoleShapeTimesR(y: number): number {
  if (y < 0) return 0;
  const { a, b, c, d, e, f } = HOLE;
  const value = a * b * Math.exp(b * y) + c * d * Math.exp(d * y) + e * f * Math.exp(f * y);
  return Math.max(0, value * Math.exp(-((y / 57) ** 10)));
}

/** Beyond these the tapers are below e^-50: the tables end there. */
const X_MAX = 100 * 50 ** 0.1;
const Y_MAX = 57 * 50 ** 0.1;

/** dṀ/d(log x) ∝ R² Σ̇ ∝ x² Σ̇(x) (dR = R ln10 d log x). */
const PRIMORDIAL_TABLE: CumulativeTable = makeCumulativeTable(
  (u) => {
    const x = 10 ** u;
    return x * x * xrayPrimordialShape(x);
  },
  Math.log10(XRAY_PRIMORDIAL_X_MIN),
  Math.log10(X_MAX),
  4096,
);
/** dṀ/dy ∝ R Σ̇ (dR ∝ dy). */
const HOLE_TABLE: CumulativeTable = makeCumulativeTable(xrayHoleShapeTimesR, 0, Y_MAX, 8192);

export interface XrayWindInput {
  readonly grid: DiskGrid;
  /** g. */
  readonly mStar: number;
  /** erg s^-1. */
  readonly lx: number;
  /** Multiplies the published rates. */
  readonly scale: number;
  /** Radius of the inner hole, cm, or null for a primordial disk. */
  readonly holeRadius: number | null;
  /** log10 of the grid edges in cm (computed once per run: the primordial profile is read in log x). */
  readonly log10Edges: Float64Array;
}

/** Rate of each cell, g s^-1, into `out`; returns the sum over the grid. */
export function xrayCellRates(input: XrayWindInput, out: Float64Array): number {
  const { grid, mStar, lx, scale, holeRadius, log10Edges } = input;
  const m = mStar / M_SUN_CGS;
  if (holeRadius === null) {
    const logK = Math.log10(0.85 / (AU_CGS * m));
    return cellRatesFromCumulative(grid.n, scale * xrayPrimordialRate(m, lx), (e) => fractionAt(PRIMORDIAL_TABLE, logK + log10Edges[e]), out);
  }
  const k = 0.95 / (AU_CGS * m);
  return cellRatesFromCumulative(grid.n, scale * xrayHoleRate(m, lx), (e) => fractionAt(HOLE_TABLE, k * (grid.edges[e] - holeRadius)), out);
}
