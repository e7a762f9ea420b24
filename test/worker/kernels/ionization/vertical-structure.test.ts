/**
 * The vertically isothermal column (ρ = ρ₀ exp(−z²/2H²); e.g. Frank, King & Raine 2002 §5.3): heights from
 * columns through erfc⁻¹, checked against a quadrature of the Gaussian that does not use erfc at all.
 */
import { describe, expect, it } from 'vitest';
import { gaussLegendre, integrate } from '../../../support/quadrature.js';
import {
  columnAboveHeight, faceColumnSamples, heightOfColumn, midplaneDensity, scaleHeight,
} from '../../../../worker/kernels/ionization/vertical-structure.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('vertical structure', () => {
  const sigma = 1700;
  const h = scaleHeight(1e5, 2e-7);
  const rho0 = midplaneDensity(sigma, h);
  const rule = gaussLegendre(64);
  /** ∫_z^{z+10H} ρ dz by Gauss–Legendre in 20 panels: the column above z, independent of erfc. */
  const columnByQuadrature = (z: number): number => {
    let sum = 0;
    const panel = (10 * h) / 20;
    for (let k = 0; k < 20; k++) sum += integrate(rule, z + k * panel, z + (k + 1) * panel, (x) => rho0 * Math.exp(-(x * x) / (2 * h * h)));
    return sum;
  };

  it('the Gaussian holds Σ/2 above the midplane', () => {
    expect(rel(columnByQuadrature(0), sigma / 2)).toBeLessThan(1e-12);
  });

  it.each([0.3, 1, 2, 3, 4.5])('the column above z = %d H is (Σ/2) erfc(z/√2H), and erfcinv takes it back', (zh) => {
    const z = zh * h;
    const col = columnAboveHeight(z, sigma, h);
    expect(rel(col, columnByQuadrature(z))).toBeLessThan(1e-10);
    expect(rel(heightOfColumn(col, sigma, h), z)).toBeLessThan(1e-10);
  });

  it('samples are log-spaced in column from 1e-4 g cm^-2 to exactly Σ/2', () => {
    const s = faceColumnSamples(sigma, 33);
    expect(s[0]).toBe(1e-4);
    expect(s[32]).toBe(sigma / 2);
    const ratio = s[1] / s[0];
    for (let k = 1; k < 33; k++) expect(rel(s[k] / s[k - 1], ratio)).toBeLessThan(1e-10);
    expect(heightOfColumn(s[32], sigma, h)).toBe(0);
    // A column thinner than 0.2 g cm^-2 starts three decades below its midplane.
    expect(faceColumnSamples(0.02, 8)[0]).toBeCloseTo(1e-5, 18);
  });
});
