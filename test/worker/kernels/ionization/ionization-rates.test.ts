/**
 * Ionization rates by source, each against its published form: cosmic rays (Umebayashi & Nakano 1981),
 * stellar X-rays (Bai & Goodman 2009 fit to Igea & Glassgold 1999), radionuclides (Umebayashi & Nakano 2009)
 * and the FUV layer (Perez-Becker & Chiang 2011).
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, M_HYDROGEN_CGS } from '../../../../shared/constants.js';
import { cosmicRayRate, cosmicRayRateFace } from '../../../../worker/kernels/ionization/cosmic-ray-rate.js';
import { fuvElectronFraction } from '../../../../worker/kernels/ionization/fuv-layer.js';
import { hydrogenColumn } from '../../../../worker/kernels/ionization/gas-composition.js';
import { AL26_MEAN_LIFE_MYR, radionuclideRate } from '../../../../worker/kernels/ionization/radionuclide-rate.js';
import { XRAY_FIT_3KEV, XRAY_FIT_5KEV, prepareXrayFit, xrayRate, xrayRateFace, xrayScale } from '../../../../worker/kernels/ionization/xray-rate.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('cosmic rays (Umebayashi & Nakano 1981)', () => {
  const zetaCr = 1e-17;
  it('the rate from one face at a face column of 96 g cm^-2 is zeta_CR/e for that face', () => {
    // Convention (cosmic-ray-rate.ts): each face gives the full attenuated interstellar rate.
    expect(cosmicRayRateFace(zetaCr, 0)).toBe(zetaCr);
    expect(rel(cosmicRayRateFace(zetaCr, 96), zetaCr / Math.E)).toBeLessThan(1e-15);
    expect(rel(cosmicRayRateFace(zetaCr, 192), zetaCr / Math.E ** 2)).toBeLessThan(1e-15);
  });

  it('the two faces add: a thin column gets 2 zeta_CR; a thick one is shielded', () => {
    expect(rel(cosmicRayRate(zetaCr, 0, 1e-6), 2 * zetaCr)).toBeLessThan(1e-7);
    expect(rel(cosmicRayRate(zetaCr, 96, 96 * 3), zetaCr / Math.E + zetaCr / Math.E ** 3)).toBeLessThan(1e-15);
    expect(cosmicRayRate(zetaCr, 1000, 1000)).toBeLessThan(1e-4 * zetaCr);
    expect(cosmicRayRate(0, 0, 0)).toBe(0);
  });
});

// The published coefficients, typed here from the sources named in xray-rate.ts, not from the code: per H2,
// per face, at L_X = 1e29 erg/s and 1 AU. 3 keV: Bai & Goodman 2009, eq. 21. 5 keV: the per-H row of the
// public astrochemistry module named in xray-rate.ts (2.0e-12, 3.0e21, 0.5; 1.5e-15, 1.0e24, 0.7) x 2 (per H -> per H2).
const PUBLISHED = {
  '3 keV': { fit: XRAY_FIT_3KEV, z1: 6.0e-12, n1: 1.5e21, a: 0.4, z2: 1.0e-15, n2: 7.0e23, b: 0.65 },
  '5 keV': { fit: XRAY_FIT_5KEV, z1: 2 * 2.0e-12, n1: 3.0e21, a: 0.5, z2: 2 * 1.5e-15, n2: 1.0e24, b: 0.7 },
} as const;

describe.each(Object.entries(PUBLISHED))('stellar X-rays, %s row (Bai & Goodman 2009, eq. 21; fit to Igea & Glassgold 1999)', (_, c) => {
  const fit = prepareXrayFit(c.fit);
  const published = (n: number): number => c.z1 * Math.exp(-((n / c.n1) ** c.a)) + c.z2 * Math.exp(-((n / c.n2) ** c.b));
  // The coefficients are per H2 already: no further factor, the scale is 1 at L_X = 1e29 erg/s and 1 AU.
  const scale = xrayScale(1e29, AU_CGS);

  it('scale is 1 at L_X = 1e29 erg/s, 1 AU (the rows are per H2 as published)', () => {
    expect(rel(scale, 1)).toBeLessThan(1e-15);
  });

  it.each([0, 1e20, 1.5e21, 3e21, 1e22, 1e23, 7.0e23, 1e24, 3e24])('reproduces the published coefficients at N = %d cm^-2', (n) => {
    expect(rel(xrayRateFace(scale, n, fit), published(n))).toBeLessThan(1e-13);
  });

  it('the absorbed term falls by e at N1 and the scattered one by e at N2', () => {
    expect(rel(xrayRateFace(1, c.n1, fit) - xrayRateFace(1, c.n1, { ...fit, row: { ...fit.row, zeta1: 0 } }), c.z1 / Math.E)).toBeLessThan(1e-13);
    expect(rel(xrayRateFace(1, c.n2, fit) - xrayRateFace(1, c.n2, { ...fit, row: { ...fit.row, zeta2: 0 } }), c.z2 / Math.E)).toBeLessThan(1e-13);
  });

  it('is proportional to L_X and to (r/AU)^-2.2 (Bai & Goodman 2009)', () => {
    const n = hydrogenColumn(10); // 10 g cm^-2 from the face
    const base = xrayRate(xrayScale(1e30, AU_CGS), n, 1e25, fit);
    expect(rel(xrayRate(xrayScale(3e30, AU_CGS), n, 1e25, fit), 3 * base)).toBeLessThan(1e-14);
    expect(rel(xrayRate(xrayScale(1e30, 5 * AU_CGS), n, 1e25, fit), base * 5 ** -2.2)).toBeLessThan(1e-13);
    expect(rel(xrayRate(xrayScale(1e30, 0.1 * AU_CGS), n, 1e25, fit), base * 0.1 ** -2.2)).toBeLessThan(1e-13);
  });

  it('both faces add, and a column from a face in g cm^-2 counts 1.4 m_H per H nucleus', () => {
    expect(rel(hydrogenColumn(1), 1 / (1.4 * M_HYDROGEN_CGS))).toBeLessThan(1e-15);
    const s = xrayScale(1e30, AU_CGS);
    expect(xrayRate(s, 1e22, 2e22, fit)).toBe(xrayRateFace(s, 1e22, fit) + xrayRateFace(s, 2e22, fit));
  });
});

describe('the two spectra', () => {
  it('the harder 5 keV spectrum ionizes less at the face and more deep down (scattered component)', () => {
    const soft = prepareXrayFit(XRAY_FIT_3KEV);
    const hard = prepareXrayFit(XRAY_FIT_5KEV);
    expect(xrayRateFace(1, 0, hard)).toBeLessThan(xrayRateFace(1, 0, soft));
    expect(xrayRateFace(1, 1e24, hard)).toBeGreaterThan(xrayRateFace(1, 1e24, soft));
  });
});

describe('radionuclides (Umebayashi & Nakano 2009)', () => {
  const tau = AL26_MEAN_LIFE_MYR * 3.15576e13;
  it('26Al decays with its 1.03 Myr mean life (half-life 0.717 Myr, from memory); 40K stays', () => {
    expect(rel(AL26_MEAN_LIFE_MYR, 0.717 / Math.LN2)).toBeLessThan(5e-3);
    expect(radionuclideRate(7.6e-19, 0, tau, 0)).toBe(7.6e-19);
    expect(rel(radionuclideRate(7.6e-19, 0, tau, tau), 7.6e-19 / Math.E)).toBeLessThan(1e-15);
    expect(rel(radionuclideRate(7.6e-19, 1.1e-22, tau, 0.717 * 3.15576e13), 3.8e-19 + 1.1e-22)).toBeLessThan(5e-3);
    expect(radionuclideRate(0, 1.1e-22, tau, 1e20)).toBe(1.1e-22);
  });
});

describe('FUV layer (Perez-Becker & Chiang 2011)', () => {
  it('sets x_e within the layer column of a face and nothing below it', () => {
    expect(fuvElectronFraction(0.03, 1e-5, 0.01)).toBe(1e-5);
    expect(fuvElectronFraction(0.03, 1e-5, 0.03)).toBe(1e-5);
    expect(fuvElectronFraction(0.03, 1e-5, 0.0301)).toBe(0);
    expect(fuvElectronFraction(0, 1e-5, 1e-6)).toBe(0);
  });
});
