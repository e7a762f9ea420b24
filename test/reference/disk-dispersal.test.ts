/**
 * Disks with winds, end to end: the "UV switch" of Clarke, Gendrin & Sotomayor 2001 (qualitative), Σ that
 * never goes negative, disk lifetimes of typical models in the observed range (Haisch, Lada & Lada 2001), and
 * irradiation that follows L_* = L_phot + L_acc.
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, L_SUN_CGS, M_SUN_CGS, MYR_CGS, YEAR_CGS } from '../../shared/constants.js';
import { parseModelParams } from '../../shared/model-params.js';
import type { DiskState } from '../../worker/kernels/disk/disk-state.js';
import { evolveDisk } from '../../worker/kernels/disk/evolve.js';
import { relaxedAccretionLuminosity } from '../../worker/kernels/disk/stellar-luminosity.js';
import { irradiationTemperature4 } from '../../worker/kernels/disk/thermal-structure.js';
import { euvGravitationalRadius } from '../../worker/kernels/disk/winds/euv-photoevaporation.js';
import { runModel } from '../../worker/model.js';
import { setupModel } from '../../worker/model-setup.js';

const num = (v: unknown): number => {
  if (typeof v !== 'number') throw new Error(`expected a number, got ${String(v)}`);
  return v;
};

describe('the UV switch (Clarke, Gendrin & Sotomayor 2001; qualitative)', () => {
  // A small viscous disk with the EUV wind alone (Φ = 1e42 s^-1 so it happens within 2 Myr).
  const params = parseModelParams({
    initial_state: 'disk', m_disk_msun: 0.01, r1_au: 10, alpha_active: 0.01, xray_wind_scale: 0, euv_wind_scale: 1,
    phi_euv_s: 1e42, t_end_myr: 2, checkpoints_myr: [0.5, 1, 2],
  });
  const setup = setupModel(params).evolve;
  const { grid } = setup;
  interface Sample { t: number; mInner: number; mDisk: number; gapDepth: number; gapRadius: number; open: boolean; rim: number; nuRg: number }
  const samples: Sample[] = [];
  let minSigma = Infinity;
  const observe = (s: DiskState): void => {
    const rg = euvGravitationalRadius(s.mStar);
    let mInner = 0;
    let gapSigma = Infinity;
    let gapRadius = NaN;
    let outerMax = 0;
    let nuRg = NaN;
    for (let i = 0; i < grid.n; i++) {
      const r = grid.centers[i];
      minSigma = Math.min(minSigma, s.sigma[i]);
      if (r < rg) mInner += s.sigma[i] * grid.area[i];
      if (r >= rg && r < 2 * rg && s.sigma[i] < gapSigma) [gapSigma, gapRadius] = [s.sigma[i], r];
      if (r >= 2 * rg && r < 4 * rg) outerMax = Math.max(outerMax, s.sigma[i]);
      if (grid.edges[i] <= rg && rg < grid.edges[i + 1]) nuRg = s.nu[i];
    }
    samples.push({
      t: s.t, mInner, mDisk: s.mDisk, gapDepth: gapSigma / outerMax, gapRadius, open: s.cavity.open, rim: s.cavity.radius, nuRg,
    });
  };
  const outcome = evolveDisk(setup, { onStep: observe });
  const rg = euvGravitationalRadius(M_SUN_CGS);

  it('runs ok and never makes Σ negative', () => {
    expect(outcome.status).toBe('ok');
    expect(minSigma).toBeGreaterThanOrEqual(0);
  });

  it('opens a gap just outside the gravitational radius while the inner disk still holds gas', () => {
    const gap = samples.find((s) => s.gapDepth < 1e-3);
    expect(gap).toBeDefined();
    if (gap === undefined) return;
    // Measured: at 1.20 Myr, at 9.8 AU (R_g = 8.9 AU); the inner disk then holds 2.9e-7 M_sun.
    expect(gap.gapRadius).toBeGreaterThanOrEqual(rg);
    expect(gap.gapRadius).toBeLessThan(1.5 * rg);
    expect(gap.mInner).toBeGreaterThan(1e-7 * M_SUN_CGS);
    expect(gap.open).toBe(false);
  });

  it('then drains the inner disk on its local viscous time R_g^2/nu(R_g), far faster than the disk has lived', () => {
    const iGap = samples.findIndex((s) => s.gapDepth < 1e-3);
    const gap = samples[iGap];
    const drained = samples.slice(iGap).find((s) => s.mInner < 1e-2 * gap.mInner);
    expect(drained).toBeDefined();
    if (drained === undefined) return;
    const tViscous = (rg * rg) / gap.nuRg;
    const tDrain = drained.t - gap.t;
    // A 100-fold drop of a viscously draining disk takes a few of its viscous times or less (common practice:
    // the inner disk's mass falls as a power of t/t_ν, steepened by the cut-off supply). Measured: 7.2e4 yr
    // against t_ν = 1.3e5 yr (ratio 0.55), 1.20 Myr after the start.
    expect(tDrain / tViscous).toBeGreaterThan(0.01);
    expect(tDrain / tViscous).toBeLessThan(3);
    expect(tDrain).toBeLessThan(0.2 * gap.t);
  });

  it('then opens the inner cavity and clears the outer disk from the inside out', () => {
    const first = samples.find((s) => s.open);
    expect(first).toBeDefined();
    if (first === undefined) return;
    const last = samples[samples.length - 1];
    // The outer disk is gone by the end (measured: 7.8e-4 M_sun when the cavity opened at 1.30 Myr with its rim at
    // 16.8 AU; 1.3e-11 M_sun at 2 Myr, rim at 34 AU).
    expect(last.mDisk).toBeLessThan(1e-3 * first.mDisk);
    expect(last.rim).toBeGreaterThan(first.rim);
    expect(first.rim).toBeGreaterThan(rg);
  });

  it('reports the lifetime, the cavity and the wind mass through the output registry', () => {
    const r = runModel(params);
    const opening = samples.find((s) => s.gapDepth < 0.1);
    const first = samples.find((s) => s.open);
    expect(r.status).toBe('ok');
    // Accretion stops (Ṁ_* < 1e-11 M_sun/yr) as the inner disk drains: after the gap began to open (depth 0.1),
    // no later than the cavity.
    const tEnd = num(r.scalars.disk_lifetime_myr) * MYR_CGS;
    expect(tEnd).toBeGreaterThan(opening?.t ?? Infinity);
    expect(tEnd).toBeLessThanOrEqual(first?.t ?? 0);
    expect(num(r.scalars.t_cavity_open_myr) * MYR_CGS).toBeCloseTo(first?.t ?? NaN, -2);
    expect(num(r.scalars.r_cavity_open_au)).toBeCloseTo((first?.rim ?? NaN) / AU_CGS, 10);
    expect(num(r.scalars.m_wind_euv_msun)).toBeGreaterThan(0);
    expect(r.scalars.m_wind_xray_msun).toBe(0);
    expect(r.scalars.m_wind_fuv_msun).toBe(0);
    expect(num(r.scalars.m_wind_msun)).toBeCloseTo(num(r.scalars.m_wind_euv_msun), 14);
  });
});

describe('disk lifetimes with typical parameters (common practice; Haisch, Lada & Lada 2001: a few Myr)', () => {
  // 1 M_sun, L_X = 1e30 erg/s (the default X-ray wind), alpha 1e-3 and 1e-2: the disk ends within 1-10 Myr.
  const cases = [
    { name: 'disk of 0.05 M_sun, R1 = 30 AU, alpha = 1e-2', params: { initial_state: 'disk', alpha_active: 1e-2 } },
    { name: 'disk of 0.05 M_sun, R1 = 30 AU, alpha = 1e-3', params: { initial_state: 'disk', alpha_active: 1e-3 } },
    { name: 'the default infall model (alpha = 1e-2)', params: {} },
  ] as const;
  for (const c of cases) {
    it(`${c.name}: disk_lifetime_myr in 1-10 Myr, and without winds the disk outlives 10 Myr`, () => {
      const base = { t_end_myr: 10, checkpoints_myr: [1, 3, 10], ...c.params };
      const r = runModel(base);
      expect(r.status).toBe('ok');
      // Measured: 1.43, 3.27 and 5.79 Myr.
      expect(num(r.scalars.disk_lifetime_myr)).toBeGreaterThan(1);
      expect(num(r.scalars.disk_lifetime_myr)).toBeLessThan(10);
      expect(num(r.scalars.m_wind_xray_msun)).toBeGreaterThan(0);
      const still = runModel({ ...base, xray_wind_scale: 0 });
      expect(still.scalars.disk_lifetime_myr).toBeNull();
      expect(still.scalars.m_wind_msun).toBe(0);
    });
  }
});

describe('irradiation follows L_* = L_phot + L_acc', () => {
  it('T^4 of an irradiation-only disk is T_irr^4(L_*) + T_floor^4 with the L_* the state reports, at every step', () => {
    const params = parseModelParams({ initial_state: 'disk', kappa_cm2_g: 0, gi_transport: 'off', t_end_myr: 0.3, checkpoints_myr: [0.1] });
    const setup = setupModel(params).evolve;
    let worst = 0;
    let lAccMax = 0;
    evolveDisk(setup, {
      onStep(s) {
        lAccMax = Math.max(lAccMax, s.lAcc);
        expect(s.lStar).toBe(L_SUN_CGS * params.l_phot_lsun + s.lAcc);
        for (const i of [0, 50, 150]) {
          const expected = irradiationTemperature4(setup.grid.centers[i], s.lStar) + params.t_floor_k ** 4;
          worst = Math.max(worst, Math.abs(s.temperature[i] ** 4 / expected - 1));
        }
      },
    });
    expect(worst).toBeLessThan(1e-12);
    // The disk accretes at ~1e-8 M_sun/yr at first: L_acc is a good part of L_sun then.
    expect(lAccMax / L_SUN_CGS).toBeGreaterThan(0.05);
  });

  it('reports L_* and L_acc at checkpoints; accretion_luminosity=off leaves L_phot alone', () => {
    // Without memory, L_acc is the instantaneous value of the step before the checkpoint.
    const on = runModel({ initial_state: 'disk', t_end_myr: 1, checkpoints_myr: [0.1, 1], l_acc_memory_yr: 0 });
    for (const c of on.checkpoints) {
      expect(num(c.l_star_lsun)).toBeCloseTo(1 + num(c.l_acc_lsun), 12);
      expect(num(c.l_acc_lsun)).toBeGreaterThan(0);
    }
    // L_acc = G M Ṁ/R_* (1 − R_*/R_in) with Ṁ of the step before the checkpoint (the state's mdot).
    const c0 = on.checkpoints[0];
    const rStar = 2 * 6.957e10;
    const rIn = 0.05 * AU_CGS;
    const mdot = (num(c0.mdot_star_msun_yr) * M_SUN_CGS) / YEAR_CGS;
    const expected = (6.6743e-8 * num(c0.m_star_msun) * M_SUN_CGS * mdot) / rStar * (1 - rStar / rIn) / L_SUN_CGS;
    expect(num(c0.l_acc_lsun) / expected).toBeCloseTo(1, 10);
    // With memory it relaxes exponentially: after a step dt from L_0 toward L_1, L_1 + (L_0 − L_1) e^{−dt/τ}.
    expect(relaxedAccretionLuminosity(2, 1, 1000, 1000)).toBeCloseTo(1 + Math.exp(-1), 15);
    expect(relaxedAccretionLuminosity(2, 1, 1000, 0)).toBe(1);
    const off = runModel({ initial_state: 'disk', t_end_myr: 1, checkpoints_myr: [0.1, 1], accretion_luminosity: 'off', l_phot_lsun: 2 });
    for (const c of off.checkpoints) expect([c.l_star_lsun, c.l_acc_lsun]).toEqual([2, 0]);
  });
});
