/**
 * Cross-checks of the constants against relations and values that do not come from the same table.
 */
import { describe, expect, it } from 'vitest';
import {
  AU_CGS, GM_SUN_CGS, G_CGS, H_PLANCK_CGS, K_BOLTZMANN_CGS, M_HYDROGEN_CGS, M_SUN_CGS, SIGMA_SB_CGS, YEAR_CGS,
} from '../../shared/constants.js';

const C_LIGHT_CGS = 2.99792458e10; // exact by the SI definition of the metre

describe('constants', () => {
  it('σ_SB equals 2π^5 k^4 / (15 h^3 c^2) (exact relation in the 2019 SI; CODATA 2018 quotes it to 10 digits)', () => {
    const derived = (2 * Math.PI ** 5 * K_BOLTZMANN_CGS ** 4) / (15 * H_PLANCK_CGS ** 3 * C_LIGHT_CGS ** 2);
    expect(Math.abs(derived / SIGMA_SB_CGS - 1)).toBeLessThan(1e-9);
  });

  it('the solar mass GM_sun/G is 1.9884e33 g (IAU 2015 B3 with CODATA 2018 G; Astronomical Almanac value, from memory)', () => {
    expect(Math.abs(M_SUN_CGS / 1.9884e33 - 1)).toBeLessThan(5e-5);
    expect(G_CGS * M_SUN_CGS).toBeCloseTo(GM_SUN_CGS, -18);
  });

  it('light crosses 1 AU in 499.004784 s (IAU 2012 B2 value of the light time, from memory)', () => {
    expect(AU_CGS / C_LIGHT_CGS).toBeCloseTo(499.004784, 5);
  });

  it('the Julian year is 31 557 600 s; m_H (standard atomic weight 1.00784 u) is within 2e-5 of the 1H atom', () => {
    expect(YEAR_CGS).toBe(31_557_600);
    // 1H atomic mass 1.00782503 u = 1.6735575e-24 g (CODATA/AME, from memory); the standard atomic weight is
    // larger by the deuterium admixture, 1.5e-5 relative.
    expect(Math.abs(M_HYDROGEN_CGS / 1.6735575e-24 - 1)).toBeLessThan(2e-5);
  });
});
