/**
 * Layered accretion in the minimum-mass solar nebula (Gammie 1996; common practice): Σ = 1700 (R/AU)^{-3/2}
 * g cm^-2, T = 280 K (R/AU)^{-1/2} (Hayashi 1981), ionized by cosmic rays only (Umebayashi & Nakano 1981),
 * chemistry (a), critical magnetic Reynolds number 1. Gammie's picture: an active layer of order 100 g cm^-2
 * per face over a dead midplane near 1 AU, no dead zone where the column is thin enough (5 AU), and the whole
 * column active where the midplane is hot enough for thermal ionization.
 */
import { describe, expect, it } from 'vitest';
import { parseModelParams } from '../../shared/model-params.js';
import { runProbe } from '../../worker/probe.js';

const COSMIC_RAYS_ONLY = {
  lx_erg_s: 0, zeta_al26_s: 0, zeta_k40_s: 0, sigma_fuv_face_g_cm2: 0, zeta_cr_s: 1e-17,
  ion_chemistry: 'molecular', mri_criterion: 'reynolds', reynolds_crit: 1,
} as const;
const mmsn = (rAu: number) => ({ r_au: rAu, sigma_g_cm2: 1700 * rAu ** -1.5, t_k: 280 * rAu ** -0.5, m_star_msun: 1, t_myr: 0 });
const probe = (rAu: number, extra: Record<string, unknown> = {}) => runProbe(parseModelParams({ ...COSMIC_RAYS_ONLY, ...extra }), mmsn(rAu));

describe('layered accretion in the minimum-mass solar nebula (Gammie 1996; Hayashi 1981)', () => {
  it('at 1 AU the active layer holds 100-1000 g cm^-2 per face over a dead midplane', () => {
    const r = probe(1);
    // Measured: 360 g cm^-2 per face (each face gives the full attenuated zeta_CR) (Gammie 1996 takes ~100 g cm^-2, the cosmic-ray stopping column).
    expect(r.sigma_active_face_g_cm2).toBeGreaterThan(100);
    expect(r.sigma_active_face_g_cm2).toBeLessThan(1000);
    expect(r.midplane_dead).toBe(true);
  });

  it('at 5 AU (152 g cm^-2) cosmic rays reach the midplane: no dead zone', () => {
    const r = probe(5);
    expect(r.midplane_dead).toBe(false);
    expect(r.sigma_active_g_cm2).toBe(r.inputs.sigma_g_cm2);
  });

  it('raising the critical Reynolds number shrinks the active layer', () => {
    const layers = [1, 10, 100, 1e3, 1e4].map((re) => probe(1, { reynolds_crit: re }).sigma_active_face_g_cm2);
    for (let k = 1; k < layers.length; k++) expect(layers[k]).toBeLessThan(layers[k - 1]);
  });

  it('the dead zone vanishes where the midplane passes the thermal threshold (1000 K at 0.078 AU)', () => {
    // T = 280 (R/AU)^-1/2 reaches 1025 K (the top of the 1000 +/- 25 K blend) at 0.0746 AU and 975 K at 0.0825 AU.
    const hot = probe(0.06); // 1143 K
    expect(hot.thermal_weight).toBe(1);
    expect(hot.midplane_dead).toBe(false);
    expect(probe(0.06, { thermal_ionization: 'none' }).midplane_dead).toBe(true);
    expect(probe(0.09).midplane_dead).toBe(true); // 933 K
    // The inner edge of the dead zone lies between the two ends of the blend.
    const radii = Array.from({ length: 41 }, (_, k) => 0.06 * (0.1 / 0.06) ** (k / 40));
    const firstDead = radii.find((r) => probe(r).midplane_dead);
    expect(firstDead).toBeGreaterThan(0.0746);
    expect(firstDead).toBeLessThan(0.0825 * 1.02);
  });
});
