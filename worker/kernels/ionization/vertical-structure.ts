/**
 * Vertically isothermal hydrostatic column (e.g. Frank, King & Raine 2002 §5.3; common practice):
 * ρ(z) = ρ₀ exp(−z²/2H²), H = c_s/Ω, ρ₀ = Σ/(√(2π) H). The column from the upper face down to height z is
 * Σ_col(z) = (Σ/2) erfc(z/(√2 H)), so a height is found from its column by the inverse, z = √2 H erfcinv(2Σ_col/Σ),
 * and ρ = ρ₀ exp(−ξ²) with ξ = erfcinv(2Σ_col/Σ). The column is symmetric about the midplane; a position is named
 * by its column from the nearer face, 0 < Σ_col ≤ Σ/2; the far face then lies Σ − Σ_col away.
 *
 * Heights are sampled by column, logarithmically from ~1e-4 g cm^-2 to Σ/2: active layers of 0.01–100 g cm^-2
 * sit within a fraction of H of the surface, where evenly spaced heights would put almost no samples.
 */
import erfc from '@stdlib/math-base-special-erfc';
import erfcinv from '@stdlib/math-base-special-erfcinv';

const SQRT_2 = Math.SQRT2;
const SQRT_2PI = Math.sqrt(2 * Math.PI);

/** Smallest sampled face column, g cm^-2 (or a thousandth of Σ/2 for columns thinner than 0.2 g cm^-2). */
export const FACE_COLUMN_MIN_G_CM2 = 1e-4;

/** Pressure scale height H = c_s/Ω, cm. */
export function scaleHeight(soundSpeed: number, omega: number): number {
  return soundSpeed / omega;
}

/** Midplane density ρ₀ = Σ/(√(2π) H), g cm^-3. */
export function midplaneDensity(sigma: number, height: number): number {
  return sigma / (SQRT_2PI * height);
}

/** ξ = z/(√2 H) of the point with face column Σ_col in a column of total Σ (Σ_col ≤ Σ/2 gives ξ ≥ 0). */
export function reducedHeight(faceColumn: number, sigma: number): number {
  return erfcinv((2 * faceColumn) / sigma);
}

/** Height z (cm) above the midplane of the point with face column Σ_col. */
export function heightOfColumn(faceColumn: number, sigma: number, height: number): number {
  return SQRT_2 * height * reducedHeight(faceColumn, sigma);
}

/** Column above height z ≥ 0 (g cm^-2): (Σ/2) erfc(z/(√2 H)). */
export function columnAboveHeight(z: number, sigma: number, height: number): number {
  return 0.5 * sigma * erfc(z / (SQRT_2 * height));
}

/** ρ/ρ₀ at face column Σ_col: exp(−ξ²). */
export function densityRatioAtColumn(faceColumn: number, sigma: number): number {
  const xi = reducedHeight(faceColumn, sigma);
  return Math.exp(-xi * xi);
}

/** Log-spaced face columns from min(1e-4, 1e-3·Σ/2) to exactly Σ/2 (the midplane): sample k of nz ≥ 2. */
export interface ColumnSampling {
  readonly low: number;
  readonly half: number;
  readonly step: number;
  readonly nz: number;
}

export function columnSampling(sigma: number, nz: number): ColumnSampling {
  const half = 0.5 * sigma;
  const low = Math.min(FACE_COLUMN_MIN_G_CM2, 1e-3 * half);
  return { low, half, step: Math.log(half / low) / (nz - 1), nz };
}

/** Face column of sample k (0 ≤ k < nz), g cm^-2; the two ends are exact. */
export function sampleColumn(sampling: ColumnSampling, k: number): number {
  if (k <= 0) return sampling.low;
  if (k >= sampling.nz - 1) return sampling.half;
  return sampling.low * Math.exp(k * sampling.step);
}

/** All nz sample columns, ascending. */
export function faceColumnSamples(sigma: number, nz: number): Float64Array {
  const sampling = columnSampling(sigma, nz);
  return Float64Array.from({ length: nz }, (_, k) => sampleColumn(sampling, k));
}
