/**
 * Photoevaporative winds against their published total rates, and the accretion luminosity by hand.
 *
 * Each wind's cell rates (worker/kernels/disk/winds/) summed over a grid that covers the profile must equal the
 * published total-rate fit to 1 % (the acceptance), and each cell must carry the integral of the
 * published profile between its edges, computed here independently by Gauss–Legendre quadrature.
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, G_CGS, K_BOLTZMANN_CGS, L_SUN_CGS, M_HYDROGEN_CGS, M_SUN_CGS, R_SUN_CGS, YEAR_CGS } from '../../shared/constants.js';
import { makeLogGrid, type DiskGrid } from '../../worker/kernels/disk/grid.js';
import { accretionLuminosity } from '../../worker/kernels/disk/stellar-luminosity.js';
import {
  euvCellRates,
  euvDirectSurfaceRateAtRim,
  euvDirectTotalRate,
  euvGravitationalRadius,
} from '../../worker/kernels/disk/winds/euv-photoevaporation.js';
import { fuvCellRates, fuvLaunchRadius } from '../../worker/kernels/disk/winds/external-fuv.js';
import {
  xrayCellRates,
  xrayHoleRate,
  xrayHoleShapeTimesR,
  xrayPrimordialRate,
  xrayPrimordialShape,
} from '../../worker/kernels/disk/winds/xray-photoevaporation.js';
import { gaussLegendre, integrate } from '../support/quadrature.js';

const MSUN_PER_YR = M_SUN_CGS / YEAR_CGS;
const sum = (a: Float64Array): number => a.reduce((s, v) => s + v, 0);
/** The default grid of a model (0.05–1e4 AU, 200 cells) and a finer, wider one. */
const GRIDS: readonly [string, DiskGrid][] = [
  ['0.05-1e4 AU, 200 cells', makeLogGrid(0.05 * AU_CGS, 1e4 * AU_CGS, 200)],
  ['0.01-1e6 AU, 1000 cells', makeLogGrid(0.01 * AU_CGS, 1e6 * AU_CGS, 1000)],
];
const log10Edges = (g: DiskGrid): Float64Array => g.edges.map(Math.log10);
const GL = gaussLegendre(16);

/** ∫ f over [a, b] split into `pieces` equal parts in ln, 16-point Gauss–Legendre on each. */
function integrateLog(f: (r: number) => number, a: number, b: number, pieces = 400): number {
  let total = 0;
  const la = Math.log(a);
  const step = (Math.log(b) - la) / pieces;
  for (let k = 0; k < pieces; k++) {
    total += integrate(GL, la + k * step, la + (k + 1) * step, (u) => Math.exp(u) * f(Math.exp(u)));
  }
  return total;
}

describe('internal X-ray photoevaporation (Owen, Clarke & Ercolano 2012, appendix B; coefficients from memory)', () => {
  // Owen, Clarke & Ercolano 2012 eq. B2: the fitted cumulative rate is 10^{P(log x)}; eq. B3 is its derivative.
  const P = [0.15138, -1.2182, 3.4046, -3.5717, -0.32762, 3.6064, -2.4918];
  const poly = (u: number): number => P.reduce((acc, c) => acc * u + c, 0);

  it('codes the primordial profile as the derivative of its fitted cumulative rate (eqs. B2–B3)', () => {
    // x Σ̇(x) ln²10 = d/dx 10^{P(log10 x)} × exp[−(x/100)^10], checked by a central difference (h = 1e-5 x).
    for (const x of [0.8, 1.5, 3, 10, 30, 60]) {
      const h = 1e-5 * x;
      const derivative = (10 ** poly(Math.log10(x + h)) - 10 ** poly(Math.log10(x - h))) / (2 * h);
      const expected = (derivative * Math.exp(-((x / 100) ** 10))) / (x * Math.LN10 ** 2);
      expect(Math.abs(xrayPrimordialShape(x) / expected - 1)).toBeLessThan(1e-8);
    }
    expect(xrayPrimordialShape(0.69)).toBe(0);
  });

  for (const [name, grid] of GRIDS) {
    for (const mStar of [0.5, 1, 1.5]) {
      for (const lx of [1e29, 1e30, 1e31]) {
        it(`primordial: cells over ${name} sum to 6.25e-9 M^-0.068 L30^1.14 M_sun/yr (M = ${mStar}, L_X = ${lx}) to 1 %`, () => {
          const out = new Float64Array(grid.n);
          const total = xrayCellRates({ grid, mStar: mStar * M_SUN_CGS, lx, scale: 1, holeRadius: null, log10Edges: log10Edges(grid) }, out);
          const published = 6.25e-9 * mStar ** -0.068 * (lx / 1e30) ** 1.14;
          expect(Math.abs(sum(out) / MSUN_PER_YR / published - 1)).toBeLessThan(0.01);
          expect(total).toBeCloseTo(sum(out), 0);
          expect(Math.abs(xrayPrimordialRate(mStar, lx) / MSUN_PER_YR / published - 1)).toBeLessThan(1e-14);
        });
      }
    }
  }

  it('primordial: every cell carries the quadrature of the published profile between its edges (1e-4 relative)', () => {
    const [, grid] = GRIDS[0];
    const mStar = 0.8;
    const out = new Float64Array(grid.n);
    xrayCellRates({ grid, mStar: mStar * M_SUN_CGS, lx: 1e30, scale: 1, holeRadius: null, log10Edges: log10Edges(grid) }, out);
    // In R: Σ̇(R) ∝ shape(x(R)), x = 0.85 (R/AU)/M; the normalisation is the integral over the whole profile.
    const ring = (r: number): number => 2 * Math.PI * r * xrayPrimordialShape((0.85 * r) / (AU_CGS * mStar));
    const rMin = (0.7 / 0.85) * mStar * AU_CGS;
    const rMax = (160 / 0.85) * mStar * AU_CGS;
    const norm = integrateLog(ring, rMin, rMax, 2000);
    const rate = xrayPrimordialRate(mStar, 1e30);
    let checked = 0;
    for (let i = 0; i < grid.n; i++) {
      const a = Math.max(grid.edges[i], rMin);
      const b = Math.min(grid.edges[i + 1], rMax);
      const expected = b > a ? (rate * integrateLog(ring, a, b, 8)) / norm : 0;
      if (expected > 1e-3 * rate / grid.n) {
        expect(Math.abs(out[i] / expected - 1)).toBeLessThan(1e-4);
        checked++;
      } else {
        expect(out[i]).toBeLessThan(2e-3 * rate / grid.n);
      }
    }
    expect(checked).toBeGreaterThan(40);
  });

  for (const holeAu of [2, 10, 30]) {
    it(`inner hole at ${holeAu} AU: cells sum to 4.8e-9 M^-0.148 L30^1.14 M_sun/yr to 1 %, nothing inside the hole`, () => {
      for (const [, grid] of GRIDS) {
        for (const mStar of [0.5, 1]) {
          const out = new Float64Array(grid.n);
          xrayCellRates({ grid, mStar: mStar * M_SUN_CGS, lx: 2e30, scale: 1, holeRadius: holeAu * AU_CGS, log10Edges: log10Edges(grid) }, out);
          const published = 4.8e-9 * mStar ** -0.148 * 2 ** 1.14;
          expect(Math.abs(sum(out) / MSUN_PER_YR / published - 1)).toBeLessThan(0.01);
          expect(Math.abs(xrayHoleRate(mStar, 2e30) / MSUN_PER_YR / published - 1)).toBeLessThan(1e-14);
          for (let i = 0; i < grid.n; i++) if (grid.edges[i + 1] <= holeAu * AU_CGS) expect(out[i]).toBe(0);
          // Cell by cell against the quadrature of eq. B5 (R Σ̇ is a function of y alone, dR = M AU/0.95 dy).
          const k = 0.95 / (AU_CGS * mStar);
          const norm = integrate(gaussLegendre(200), 0, 90, xrayHoleShapeTimesR);
          const total = xrayHoleRate(mStar, 2e30);
          for (let i = 0; i < grid.n; i++) {
            const ya = Math.max(0, k * (grid.edges[i] - holeAu * AU_CGS));
            const yb = Math.min(90, k * (grid.edges[i + 1] - holeAu * AU_CGS));
            if (yb <= ya) continue;
            const expected = (total * integrate(GL, ya, yb, xrayHoleShapeTimesR)) / norm;
            if (expected > 1e-4 * total) expect(Math.abs(out[i] / expected - 1)).toBeLessThan(1e-3);
          }
        }
      }
    });
  }
});

describe('internal EUV photoevaporation (coefficients from memory)', () => {
  it('diffuse field: the Clarke et al. (2001) profile integrates to Hollenbach et al. (1994) 4.4e-10 Φ41^1/2 M^1/2 M_sun/yr to 1 %', () => {
    // By hand for 1 M_sun, Φ = 1e41: R_g = G M/(10 km/s)² = 1.3271e14 cm; n_0 = 5.7e4 × 1.3271^-1.5 = 3.728e4 cm^-3;
    // Σ̇(R_g) = 2 n_0 m_H c_s = 1.2479e-13 g cm^-2 s^-1; 4π R_g² Σ̇(R_g) = 2.762e16 g/s = 4.383e-10 M_sun/yr
    // (0.4 % below the quoted 4.4e-10). On the wide grid the tail beyond 1e6 AU, (R_g/R_out)^1/2 = 0.3 %, is missing.
    const grid = GRIDS[1][1];
    for (const mStar of [0.5, 1, 2]) {
      for (const phi of [1e41, 1e42]) {
        const out = new Float64Array(grid.n);
        euvCellRates({ grid, mStar: mStar * M_SUN_CGS, phi, scale: 1, holeRadius: null }, out);
        const published = 4.4e-10 * Math.sqrt(phi / 1e41) * Math.sqrt(mStar);
        expect(Math.abs(sum(out) / MSUN_PER_YR / published - 1)).toBeLessThan(0.01);
      }
    }
    expect(euvGravitationalRadius(M_SUN_CGS) / 1.3271e14).toBeCloseTo(1, 4);
    // No loss inside R_g (Clarke, Gendrin & Sotomayor 2001).
    const out = new Float64Array(grid.n);
    euvCellRates({ grid, mStar: M_SUN_CGS, phi: 1e41, scale: 1, holeRadius: null }, out);
    for (let i = 0; i < grid.n; i++) if (grid.edges[i + 1] <= 1.3271e14) expect(out[i]).toBe(0);
  });

  it('direct field (Alexander, Clarke & Pringle 2006): cells carry 2π R_h² Σ̇(R_h)/(a − 2) ∝ R_h^1/2; by hand 1.32e-9 M_sun/yr at 3 AU', () => {
    // By hand for R_h = 3 AU = 4.4879e13 cm, Φ = 1e41: n = [Φ/(4π α_B 0.05 R_h³)]^1/2 = 2.60e6 cm^-3;
    // Σ̇ = 2 × 0.235 × 1.35 × m_H × 1e6 cm/s × n = 2.76e-12 g cm^-2 s^-1; total = 2π R_h² Σ̇ / 0.42 = 1.32e-9 M_sun/yr.
    expect(euvDirectTotalRate(3 * AU_CGS, 1e41) / MSUN_PER_YR).toBeGreaterThan(1.30e-9);
    expect(euvDirectTotalRate(3 * AU_CGS, 1e41) / MSUN_PER_YR).toBeLessThan(1.34e-9);
    expect(euvDirectTotalRate(12 * AU_CGS, 1e41) / euvDirectTotalRate(3 * AU_CGS, 1e41)).toBeCloseTo(2, 10);
    const grid = GRIDS[1][1];
    for (const holeAu of [1, 5, 20]) {
      const out = new Float64Array(grid.n);
      euvCellRates({ grid, mStar: M_SUN_CGS, phi: 1e41, scale: 1, holeRadius: holeAu * AU_CGS }, out);
      const expected = euvDirectTotalRate(holeAu * AU_CGS, 1e41);
      // The profile falls as R^-2.42, so the part beyond 1e6 AU is (R_h/1e6 AU)^0.42 ≤ 1.5 % at 20 AU: compare with it removed.
      const inside = 1 - (holeAu / 1e6) ** 0.42;
      expect(Math.abs(sum(out) / (expected * inside) - 1)).toBeLessThan(1e-10);
      // And against quadrature of the profile over the cell holding 2 R_h.
      const i = grid.edges.findIndex((e) => e > 2 * holeAu * AU_CGS) - 1;
      const sigma0 = euvDirectSurfaceRateAtRim(holeAu * AU_CGS, 1e41);
      const q = integrate(GL, grid.edges[i], grid.edges[i + 1], (r) => 2 * Math.PI * r * sigma0 * (r / (holeAu * AU_CGS)) ** -2.42);
      expect(Math.abs(out[i] / q - 1)).toBeLessThan(1e-10);
    }
  });
});

describe('external FUV photoevaporation (Adams et al. 2004)', () => {
  it('takes exactly the given rate, only outside 0.2 G M/a_s² (a_s for T_FUV, μ = 1.3), in proportion to mass', () => {
    // By hand, 1 M_sun and 1000 K: a_s² = k T/(1.3 m_H) = 1.3806e-13/2.1756e-24 = 6.346e10 cm² s^-2;
    // 0.2 G M/a_s² = 0.2 × 1.3271e26/6.346e10 = 4.183e14 cm = 27.96 AU.
    const rLaunch = fuvLaunchRadius(M_SUN_CGS, 1000);
    expect(rLaunch / AU_CGS).toBeCloseTo((0.2 * G_CGS * M_SUN_CGS) / ((K_BOLTZMANN_CGS * 1000) / (1.3 * M_HYDROGEN_CGS)) / AU_CGS, 10);
    expect(rLaunch / AU_CGS).toBeGreaterThan(27.9);
    expect(rLaunch / AU_CGS).toBeLessThan(28.0);
    const grid = GRIDS[0][1];
    const sigma = grid.centers.map((r) => 100 * (r / AU_CGS) ** -1 * Math.exp(-r / (100 * AU_CGS)));
    const out = new Float64Array(grid.n);
    const mdot = 1e-8 * MSUN_PER_YR;
    fuvCellRates({ grid, sigma, mStar: M_SUN_CGS, mdot, temperatureK: 1000 }, out);
    expect(Math.abs(sum(out) / mdot - 1)).toBeLessThan(1e-12);
    for (let i = 0; i < grid.n; i++) {
      if (grid.centers[i] < rLaunch) expect(out[i]).toBe(0);
      else expect(out[i] / (sigma[i] * grid.area[i])).toBeCloseTo(out[grid.n - 1] / (sigma[grid.n - 1] * grid.area[grid.n - 1]), 20);
    }
    // A disk that lies entirely inside the launch radius loses nothing.
    const compact = grid.centers.map((r) => (r < 10 * AU_CGS ? 100 : 0));
    expect(fuvCellRates({ grid, sigma: compact, mStar: M_SUN_CGS, mdot, temperatureK: 1000 }, out)).toBe(0);
  });
});

describe('accretion luminosity (Gullbring et al. 1998, eq. 8, from memory)', () => {
  it('Mdot = 1e-8 M_sun/yr onto 0.5 M_sun and 2 R_sun gives 0.0785 L_sun, 0.0628 L_sun with R_in = 5 R_*', () => {
    // By hand: G M = 6.6743e-8 × 9.9420e32 = 6.6356e25 cm³ s^-2; Ṁ = 1e-8 × 1.98841e33 / 3.15576e7 = 6.3009e17 g/s;
    // R_* = 1.3914e11 cm: G M Ṁ / R_* = 3.0049e32 erg/s = 0.07850 L_sun (L_sun = 3.828e33, IAU 2015 B3) ≈ 0.08 L_sun.
    // With the (1 − R_*/R_in) factor for R_in = 5 R_*: × 0.8 = 0.06280 L_sun.
    const mdot = (1e-8 * M_SUN_CGS) / YEAR_CGS;
    const rStar = 2 * R_SUN_CGS;
    const without = accretionLuminosity(0.5 * M_SUN_CGS, mdot, rStar, Infinity) / L_SUN_CGS;
    const with5 = accretionLuminosity(0.5 * M_SUN_CGS, mdot, rStar, 5 * rStar) / L_SUN_CGS;
    expect(Math.abs(without / 0.0785 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(with5 / 0.0628 - 1)).toBeLessThan(1e-3);
    expect(with5 / without).toBeCloseTo(0.8, 14);
  });
});
