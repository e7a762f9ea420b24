/**
 * Electron fraction: (a) molecular ions, (b) Oppenheimer & Dalgarno (1974) metals, (c) Saha alkalis joined by
 * charge neutrality; and the Saha equation itself (NIST ionization energies, a textbook worked example).
 */
import { describe, expect, it } from 'vitest';
import { ELECTRON_VOLT_CGS, K_BOLTZMANN_CGS } from '../../../../shared/constants.js';
import { electronFraction } from '../../../../worker/kernels/ionization/electron-fraction.js';
import {
  CHARGE_TRANSFER_CM3_S, dissociativeRecombination, metalElectronFraction, molecularElectronFraction, radiativeRecombination,
} from '../../../../worker/kernels/ionization/recombination.js';
import { ALKALI_METALS, POTASSIUM, SODIUM, ionizedShare, sahaFactor } from '../../../../worker/kernels/ionization/saha.js';
import { thermalIons } from '../../../../worker/kernels/ionization/electron-fraction.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);
const CASES = [
  // ζ [s^-1], n_H2 [cm^-3], T [K]: a disk surface, a midplane at 1 AU, a cold outer midplane
  [1e-12, 1e9, 300], [1e-18, 3e14, 280], [1e-17, 1e10, 30],
] as const;

describe('(a) molecular ions with dissociative recombination 3e-6 T^-1/2 cm^3 s^-1', () => {
  it.each(CASES)('x_e = sqrt(zeta/(beta n_H2)) exactly: zeta %d, n %d, T %d', (zeta, n, t) => {
    expect(dissociativeRecombination(t)).toBe(3e-6 / Math.sqrt(t));
    expect(molecularElectronFraction(zeta, n, t)).toBe(Math.sqrt(zeta / ((3e-6 / Math.sqrt(t)) * n)));
  });
});

describe('(b) metals: charge transfer and radiative recombination (Oppenheimer & Dalgarno 1974)', () => {
  it.each(CASES)('at zero metals equals (a) to round-off: zeta %d, n %d, T %d', (zeta, n, t) => {
    expect(rel(metalElectronFraction(zeta, n, t, 0), molecularElectronFraction(zeta, n, t))).toBeLessThan(1e-14);
    expect(rel(electronFraction(zeta, n, t, { kind: 'metals', xMetal: 0 }, null), molecularElectronFraction(zeta, n, t))).toBeLessThan(1e-14);
  });

  it.each(CASES)('metals raise x_e, more metals more: zeta %d, n %d, T %d', (zeta, n, t) => {
    const xa = molecularElectronFraction(zeta, n, t);
    let previous = xa;
    for (const xm of [1e-14, 1e-12, 1e-10, 1e-8, 1e-6]) {
      const x = metalElectronFraction(zeta, n, t, xm);
      expect(x).toBeGreaterThan(previous);
      // Never more electrons than metal ions could give plus what radiative recombination alone allows.
      expect(x).toBeLessThanOrEqual(Math.sqrt(zeta / (radiativeRecombination(t) * n)) * (1 + 1e-12));
      previous = x;
    }
  });

  it.each(CASES)('the solution satisfies the three balance equations: zeta %d, n %d, T %d', (zeta, n, t) => {
    const xm = 1e-8;
    const x = metalElectronFraction(zeta, n, t, xm);
    const beta = dissociativeRecombination(t);
    const betaR = radiativeRecombination(t);
    // From x: y from the total recombination, m = x - y; then metal-ion balance and ionization balance.
    const y = (beta * x * x - zeta / n) / (x * (beta - betaR));
    const m = x - y;
    expect(y).toBeGreaterThan(0);
    expect(y).toBeLessThan(xm);
    const chargeTransfer = CHARGE_TRANSFER_CM3_S * m * (xm - y);
    expect(rel(chargeTransfer, betaR * x * y)).toBeLessThan(1e-8);
    expect(rel(beta * x * m + chargeTransfer, zeta / n)).toBeLessThan(1e-10);
  });
});

describe('Saha equation', () => {
  it('uses the NIST Atomic Spectra Database ionization energies: K 4.34066 eV, Na 5.13908 eV', () => {
    expect(rel(POTASSIUM.chi, 4.34066 * 1.602176634e-12)).toBeLessThan(1e-15);
    expect(rel(SODIUM.chi, 5.13908 * 1.602176634e-12)).toBeLessThan(1e-15);
    expect(POTASSIUM.weightRatio).toBe(1); // 2 g+/g0 = 2 x 1 / 2
  });

  it('uses the solar abundances of Asplund et al. 2009 (log eps K 5.03, Na 6.24), per H2', () => {
    expect(rel(POTASSIUM.abundancePerH2, 2 * 1.0715e-7)).toBeLessThan(1e-4);
    expect(rel(SODIUM.abundancePerH2, 2 * 1.7378e-6)).toBeLessThan(1e-4);
  });

  it('pure hydrogen at P_e = 200 dyn cm^-2 is half ionized at 9555 +/- 10 K with 2 g+/g0 = 1', () => {
    // Carroll & Ostlie, An Introduction to Modern Astrophysics (2nd ed.), Saha-equation example and Fig. 8.7:
    // half ionization near 9600 K at P_e = 20 N m^-2 (from memory). chi_H = 13.598434 eV (NIST ASD).
    const chiH = 13.598434 * ELECTRON_VOLT_CGS;
    const share = (t: number): number => ionizedShare(sahaFactor(t, chiH, 1), 200 / (K_BOLTZMANN_CGS * t));
    let lo = 5000;
    let hi = 20000;
    for (let k = 0; k < 80; k++) {
      const mid = 0.5 * (lo + hi);
      if (share(mid) > 0.5) hi = mid;
      else lo = mid;
    }
    expect(Math.abs(lo - 9555)).toBeLessThan(10);
    expect(Math.abs(lo - 9600)).toBeLessThan(100);
  });

  it('limits in disk gas: (a) when cold, all potassium and sodium ionized when hot', () => {
    const zeta = 1e-19;
    const n = 1e14;
    const thermal = (t: number) => thermalIons(ALKALI_METALS, t);
    // Cold: the alkali electrons are negligible, so (c) returns (a) exactly.
    expect(electronFraction(zeta, n, 300, { kind: 'molecular' }, thermal(300))).toBe(molecularElectronFraction(zeta, n, 300));
    // Hot (5000 K, S_Na ~ 6e15 cm^-3 >> n_e): x_e -> x_K + x_Na.
    const total = POTASSIUM.abundancePerH2 + SODIUM.abundancePerH2;
    expect(rel(electronFraction(zeta, n, 5000, { kind: 'molecular' }, thermal(5000)), total)).toBeLessThan(1e-3);
    // In between x_e rises steeply with T, and potassium (lower chi) is ahead of sodium.
    const x1 = electronFraction(zeta, n, 1000, { kind: 'molecular' }, thermal(1000));
    const x2 = electronFraction(zeta, n, 1200, { kind: 'molecular' }, thermal(1200));
    expect(x1).toBeGreaterThan(molecularElectronFraction(zeta, n, 1000));
    expect(x2).toBeGreaterThan(10 * x1);
    const ne = x2 * n;
    expect(ionizedShare(sahaFactor(1200, POTASSIUM.chi, 1), ne)).toBeGreaterThan(ionizedShare(sahaFactor(1200, SODIUM.chi, 1), ne));
  });

  it('charge neutrality holds in the combined solution', () => {
    const zeta = 1e-17;
    const n = 1e13;
    const t = 1100;
    const th = thermalIons(ALKALI_METALS, t);
    const x = electronFraction(zeta, n, t, { kind: 'molecular' }, th);
    const molecular = zeta / (dissociativeRecombination(t) * x * n);
    const alkali = ALKALI_METALS.reduce((acc, e, k) => acc + e.abundancePerH2 * ionizedShare(th.sahaS[k], x * n), 0);
    expect(rel(molecular + alkali, x)).toBeLessThan(1e-10);
  });
});
