/**
 * The active-column solve: the boundary is a root of the activity criterion (not a sample), it does not
 * depend on how many samples bracket it, the profile is monotone as the solver assumes, and the Elsasser
 * criterion relates to the Reynolds one as Λ = Re · 2ρ₀/(β₀ρ).
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, GM_SUN_CGS } from '../../../../shared/constants.js';
import {
  columnProfile, emptyPoint, evaluatePoint, prepareColumn, solveActiveColumn, type IonizationPhysics, type IonizationSources,
} from '../../../../worker/kernels/ionization/active-column.js';
import { ALKALI_METALS } from '../../../../worker/kernels/ionization/saha.js';
import { XRAY_FIT_5KEV, prepareXrayFit } from '../../../../worker/kernels/ionization/xray-rate.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);
const SOURCES: IonizationSources = {
  lxErgS: 1e30, xrayFit: prepareXrayFit(XRAY_FIT_5KEV), zetaCr: 1e-17, zetaRadio: 1e-19, fuvColumn: 0.03, fuvXe: 1e-5,
};
const REYNOLDS: IonizationPhysics = { chemistry: { kind: 'molecular' }, alkalis: null, criterion: { kind: 'reynolds', threshold: 100 } };
const column = (rAu: number, sigma: number, t: number) => ({
  sigma, temperature: t, radius: rAu * AU_CGS, omega: Math.sqrt(GM_SUN_CGS / (rAu * AU_CGS) ** 3),
});

describe('active column', () => {
  const physicsCases: [string, IonizationPhysics][] = [
    ['reynolds, molecular', REYNOLDS],
    ['reynolds, metals', { ...REYNOLDS, chemistry: { kind: 'metals', xMetal: 1e-12 } }],
    ['elsasser', { ...REYNOLDS, criterion: { kind: 'elsasser', threshold: 1, betaMidplane: 1e4 } }],
    ['reynolds, saha', { ...REYNOLDS, alkalis: ALKALI_METALS }],
  ];

  it.each(physicsCases)('%s: at the boundary the activity number equals the threshold', (_, physics) => {
    const ctx = prepareColumn(column(1, 1700, 280), SOURCES, physics);
    const r = solveActiveColumn(ctx, 32);
    expect(r.midplaneDead).toBe(true);
    expect(r.sigmaActiveFace).toBeGreaterThan(0);
    expect(r.sigmaActive).toBe(2 * r.sigmaActiveFace);
    const at = evaluatePoint(ctx, r.sigmaActiveFace, emptyPoint()).activity;
    expect(rel(at, physics.criterion.threshold)).toBeLessThan(1e-8);
  });

  it('the boundary does not depend on the number of samples (root-finding, not the nearest sample)', () => {
    const ctx = prepareColumn(column(1, 1700, 280), SOURCES, REYNOLDS);
    const values = [4, 8, 32, 256].map((nz) => solveActiveColumn(ctx, nz).sigmaActiveFace);
    for (const v of values) expect(rel(v, values[3])).toBeLessThan(1e-8);
    // ... while the nearest of 8 samples would be off by up to half a sample spacing (a factor 10^(6.9/14)).
    const profile = columnProfile(ctx, 8);
    const nearest = profile.reduce((best, p) => (Math.abs(Math.log(p.faceColumn / values[3])) < Math.abs(Math.log(best / values[3])) ? p.faceColumn : best), 1e300);
    expect(rel(nearest, values[3])).toBeGreaterThan(1e-3);
  });

  it('the profile falls monotonically with depth, the premise of the bracketing', () => {
    for (const [, physics] of physicsCases) {
      const p = columnProfile(prepareColumn(column(0.5, 4800, 400), SOURCES, physics), 64);
      for (let k = 1; k < p.length; k++) {
        expect(p[k].zeta).toBeLessThanOrEqual(p[k - 1].zeta * (1 + 1e-12));
        expect(p[k].activity).toBeLessThanOrEqual(p[k - 1].activity * (1 + 1e-12));
      }
    }
  });

  it('the sampled states agree with the solved boundary', () => {
    const ctx = prepareColumn(column(1, 1700, 280), SOURCES, REYNOLDS);
    const r = solveActiveColumn(ctx, 32);
    for (const p of columnProfile(ctx, 32)) expect(p.active).toBe(p.faceColumn <= r.sigmaActiveFace);
  });

  it('a thin column is active through its midplane; a column with no ionization at all is dead', () => {
    const thin = solveActiveColumn(prepareColumn(column(10, 5, 90), SOURCES, REYNOLDS), 32);
    expect(thin).toMatchObject({ sigmaActive: 5, sigmaActiveFace: 2.5, midplaneDead: false, evaluations: 1 });
    const none = { ...SOURCES, lxErgS: 0, zetaCr: 0, zetaRadio: 0, fuvColumn: 0 };
    const dark = solveActiveColumn(prepareColumn(column(1, 1700, 280), none, REYNOLDS), 32);
    expect(dark).toMatchObject({ sigmaActive: 0, midplaneDead: true });
  });

  it('Elsasser = Reynolds x 2 rho0/(beta0 rho) (field uniform in height)', () => {
    const beta0 = 300;
    const re = prepareColumn(column(1, 1700, 280), SOURCES, REYNOLDS);
    const el = prepareColumn(column(1, 1700, 280), SOURCES, { ...REYNOLDS, criterion: { kind: 'elsasser', threshold: 1, betaMidplane: beta0 } });
    for (const s of [0.01, 1, 100, 850]) {
      const a = evaluatePoint(re, s, emptyPoint());
      const b = evaluatePoint(el, s, emptyPoint());
      expect(rel(b.activity, (a.activity * 2) / (beta0 * a.densityRatio))).toBeLessThan(1e-13);
    }
  });

  it('eta = 234 T^1/2 / x_e and Re = c_s H / eta at every sample (Blaes & Balbus 1994)', () => {
    const ctx = prepareColumn(column(1, 1700, 280), SOURCES, REYNOLDS);
    for (const p of columnProfile(ctx, 16)) {
      expect(rel(p.eta, (234 * Math.sqrt(280)) / p.xe)).toBeLessThan(1e-14);
      expect(rel(p.activity, (Math.sqrt(ctx.soundSpeed2) * ctx.scaleHeight) / p.eta)).toBeLessThan(1e-13);
    }
  });
});
