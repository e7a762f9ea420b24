/**
 * The MRI-active column at one radius: the ionization rates (xray-rate, cosmic-ray-rate, radionuclide-rate),
 * the FUV layer, the electron fraction (electron-fraction) and the activity criterion (ohmic-activity) at
 * heights named by their face column (vertical-structure), and the active-layer boundary found by root-finding
 * in ln Σ_col between the samples that bracket it.
 *
 * One boundary per face: the column is symmetric, so the answer is the same for both faces. Along a face the
 * activity number falls monotonically with depth: ζ(Σ_col) = f(Σ_col) + f(Σ − Σ_col) is decreasing on
 * [0, Σ/2] for every convex, decreasing per-face attenuation f (exp(−s/96); exp(−(N/N*)^a) with a < 1 is
 * convex too), ρ rises, x_e depends on ζ/n_H₂ (and falls with n_H₂ for the Saha ions), and Λ ∝ Re/ρ. So the
 * active layer is [0, Σ_a,face]; the boundary is bracketed by bisection over the samples and refined by Brent's
 * method, never taken from the nearest sample. Columns above the first sample (< 1e-4 g cm^-2) share its state.
 */
import { SOUND_SPEED2_PER_K } from '../disk/thermal-structure.js';
import { cosmicRayRate } from './cosmic-ray-rate.js';
import { electronFraction, thermalIons, type Chemistry, type ThermalIons } from './electron-fraction.js';
import { fuvElectronFraction } from './fuv-layer.js';
import { h2NumberDensity, hydrogenColumn } from './gas-composition.js';
import { activityNumber, ohmicDiffusivity, type ActivityCriterion } from './ohmic-activity.js';
import { brentRoot } from '../numerics/root-finding.js';
import type { SahaElement } from './saha.js';
import { columnSampling, faceColumnSamples, midplaneDensity, reducedHeight, sampleColumn, scaleHeight } from './vertical-structure.js';
import { xrayRate, xrayScale, type PreparedXrayFit } from './xray-rate.js';

/** What ionizes the column (cgs; rates per H₂). */
export interface IonizationSources {
  /** Stellar X-ray luminosity, erg s^-1 (0 switches X-rays off). */
  readonly lxErgS: number;
  readonly xrayFit: PreparedXrayFit;
  /** Interstellar cosmic-ray rate ζ_CR, s^-1 (each face gives the full attenuated rate; cosmic-ray-rate.ts). */
  readonly zetaCr: number;
  /** Radionuclide rate at the current time, s^-1. */
  readonly zetaRadio: number;
  /** FUV-ionized layer per face: column (g cm^-2; 0 = none) and its electron fraction. */
  readonly fuvColumn: number;
  readonly fuvXe: number;
}

/** How ionization turns into activity. */
export interface IonizationPhysics {
  readonly chemistry: Chemistry;
  /** Alkali metals in Saha equilibrium (branch (c)), or null. */
  readonly alkalis: readonly SahaElement[] | null;
  readonly criterion: ActivityCriterion;
}

/** The column at one radius (cgs). */
export interface ColumnState {
  /** Total surface density, g cm^-2. */
  readonly sigma: number;
  /** Temperature (vertically isothermal), K. */
  readonly temperature: number;
  /**
   * Temperature the alkali metals of the Saha branch see, K (default: `temperature`); the disk model passes the
   * quiescent temperature here (ionization-active-layer.ts).
   */
  readonly thermalIonizationTemperature?: number;
  /** Radius, cm. */
  readonly radius: number;
  /** Keplerian angular frequency, s^-1. */
  readonly omega: number;
}

/** Per-column quantities computed once and shared by every height. */
export interface ColumnContext {
  readonly state: ColumnState;
  readonly sources: IonizationSources;
  readonly physics: IonizationPhysics;
  readonly soundSpeed2: number;
  readonly scaleHeight: number;
  readonly rho0: number;
  readonly xrayScale: number;
  readonly thermal: ThermalIons | null;
  readonly lnThreshold: number;
}

export function prepareColumn(state: ColumnState, sources: IonizationSources, physics: IonizationPhysics): ColumnContext {
  const soundSpeed2 = SOUND_SPEED2_PER_K * state.temperature;
  const h = scaleHeight(Math.sqrt(soundSpeed2), state.omega);
  return {
    state, sources, physics, soundSpeed2, scaleHeight: h,
    rho0: midplaneDensity(state.sigma, h),
    xrayScale: sources.lxErgS > 0 ? xrayScale(sources.lxErgS, state.radius) : 0,
    thermal: physics.alkalis === null ? null : thermalIons(physics.alkalis, state.thermalIonizationTemperature ?? state.temperature),
    lnThreshold: Math.log(physics.criterion.threshold),
  };
}

/** Everything known at one height; written in place by `evaluatePoint`. */
export interface PointValues {
  /** Column from the nearer face, g cm^-2. */
  faceColumn: number;
  /** Height above the midplane, cm. */
  z: number;
  /** ρ/ρ₀. */
  densityRatio: number;
  rho: number;
  nH2: number;
  zetaX: number;
  zetaCr: number;
  zetaRadio: number;
  zeta: number;
  xe: number;
  eta: number;
  activity: number;
  active: boolean;
}

export const emptyPoint = (): PointValues => ({
  faceColumn: 0, z: 0, densityRatio: 0, rho: 0, nH2: 0, zetaX: 0, zetaCr: 0, zetaRadio: 0, zeta: 0, xe: 0, eta: 0,
  activity: 0, active: false,
});

/** Evaluate every quantity at face column `faceColumn` (0 < Σ_col ≤ Σ/2) into `out`. */
export function evaluatePoint(ctx: ColumnContext, faceColumn: number, out: PointValues): PointValues {
  const { state, sources, physics } = ctx;
  const far = state.sigma - faceColumn;
  const xi = reducedHeight(faceColumn, state.sigma);
  const densityRatio = Math.exp(-xi * xi);
  const rho = ctx.rho0 * densityRatio;
  const nH2 = h2NumberDensity(rho);
  const zetaX = ctx.xrayScale > 0 ? xrayRate(ctx.xrayScale, hydrogenColumn(faceColumn), hydrogenColumn(far), sources.xrayFit) : 0;
  const zetaCr = sources.zetaCr > 0 ? cosmicRayRate(sources.zetaCr, faceColumn, far) : 0;
  const zeta = zetaX + zetaCr + sources.zetaRadio;
  const xeChem = electronFraction(zeta, nH2, state.temperature, physics.chemistry, ctx.thermal);
  const xe = Math.max(xeChem, fuvElectronFraction(sources.fuvColumn, sources.fuvXe, faceColumn));
  const eta = ohmicDiffusivity(state.temperature, xe);
  const activity = activityNumber(physics.criterion, ctx.soundSpeed2, state.omega, eta, densityRatio);
  out.faceColumn = faceColumn;
  out.z = Math.SQRT2 * ctx.scaleHeight * xi;
  out.densityRatio = densityRatio;
  out.rho = rho;
  out.nH2 = nH2;
  out.zetaX = zetaX;
  out.zetaCr = zetaCr;
  out.zetaRadio = sources.zetaRadio;
  out.zeta = zeta;
  out.xe = xe;
  out.eta = eta;
  out.activity = activity;
  out.active = activity >= physics.criterion.threshold;
  return out;
}

/** ln(activity/threshold) at face column Σ_col: ≥ 0 where active. */
function activityMargin(ctx: ColumnContext, faceColumn: number, scratch: PointValues): number {
  const a = evaluatePoint(ctx, faceColumn, scratch).activity;
  // Floored so that gas with no ionization at all (activity 0) still gives a finite number to interpolate on.
  return Math.max(Math.log(a) - ctx.lnThreshold, MARGIN_FLOOR);
}

/** Numerical floor, not physics: e^-700 is still a normal double (they end near e^-708). */
const MARGIN_FLOOR = -700;

export interface ActiveColumnResult {
  /** Active column per face, g cm^-2 (0 ≤ Σ_a,face ≤ Σ/2). */
  readonly sigmaActiveFace: number;
  /** Both faces, g cm^-2 (≤ Σ). */
  readonly sigmaActive: number;
  readonly midplaneDead: boolean;
  /** Height evaluations spent. */
  readonly evaluations: number;
}

/** Tolerance of the boundary in ln Σ_col (a relative 1e-10 in the column). */
const LN_COLUMN_TOL = 1e-10;

/** Half-width, in ln Σ_col, of the bracket tried around a previous boundary (a factor 1.15 either way). */
const HINT_SPAN = Math.log(1.15);

/**
 * Σ_a of one column; `nz` (≥ 2) log-spaced samples bracket the boundary. Evaluations: 1 for a fully active
 * column, 2 for a dead surface, else 2 + ⌈log₂(nz − 1)⌉ for the bracket and a few for Brent. `hintFace`, the
 * boundary of an earlier solve of a similar column (g cm^-2), is tried first: when the boundary lies within a
 * factor 1.15 of it, two evaluations bracket it instead of the bisection over samples. The root is the same
 * either way, to the tolerance.
 */
export function solveActiveColumn(ctx: ColumnContext, nz: number, scratch: PointValues = emptyPoint(), hintFace = NaN): ActiveColumnResult {
  const sigma = ctx.state.sigma;
  const sampling = columnSampling(sigma, nz);
  let evaluations = 1;
  let marginHi = activityMargin(ctx, sampling.half, scratch);
  if (marginHi >= 0) {
    return { sigmaActiveFace: 0.5 * sigma, sigmaActive: sigma, midplaneDead: false, evaluations };
  }
  evaluations++;
  let marginLo = activityMargin(ctx, sampling.low, scratch);
  if (marginLo < 0) return { sigmaActiveFace: 0, sigmaActive: 0, midplaneDead: true, evaluations };
  const f = (lnS: number): number => activityMargin(ctx, Math.exp(lnS), scratch);
  const finish = (a: number, b: number, fa: number, fb: number): ActiveColumnResult => {
    const root = brentRoot(f, a, b, fa, fb, LN_COLUMN_TOL);
    const face = Math.min(0.5 * sigma, Math.exp(root.x));
    return { sigmaActiveFace: face, sigmaActive: 2 * face, midplaneDead: true, evaluations: evaluations + root.evaluations };
  };
  if (hintFace > sampling.low && hintFace < sampling.half) {
    const lnLow = Math.log(sampling.low);
    const lnHalf = Math.log(sampling.half);
    const lnHint = Math.log(hintFace);
    const mHint = f(lnHint);
    evaluations++;
    const lnOther = mHint >= 0 ? Math.min(lnHint + HINT_SPAN, lnHalf) : Math.max(lnHint - HINT_SPAN, lnLow);
    const mOther = lnOther === lnHalf ? marginHi : lnOther === lnLow ? marginLo : f(lnOther);
    if (lnOther !== lnHalf && lnOther !== lnLow) evaluations++;
    if ((mHint >= 0) !== (mOther >= 0)) {
      return mHint >= 0 ? finish(lnHint, lnOther, mHint, mOther) : finish(lnOther, lnHint, mOther, mHint);
    }
  }
  // Invariant: sample lo is active, sample hi dead.
  let lo = 0;
  let hi = nz - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    const m = activityMargin(ctx, sampleColumn(sampling, mid), scratch);
    evaluations++;
    if (m >= 0) {
      lo = mid;
      marginLo = m;
    } else {
      hi = mid;
      marginHi = m;
    }
  }
  return finish(Math.log(sampleColumn(sampling, lo)), Math.log(sampleColumn(sampling, hi)), marginLo, marginHi);
}

/** The sampled profile from a face to the midplane (what `disksweep probe` prints). */
export function columnProfile(ctx: ColumnContext, nz: number): PointValues[] {
  const samples = faceColumnSamples(ctx.state.sigma, nz);
  return Array.from(samples, (s) => evaluatePoint(ctx, s, emptyPoint()));
}
