/**
 * The Σ_a providers behind layered transport: one conformance suite for all of them (uniform, fixed_column,
 * ionization), then what only the ionization provider does: the floor, the thermal threshold blend, and the
 * refresh cache, which must keep results a function of the inputs.
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, GM_SUN_CGS } from '../../../../shared/constants.js';
import { DisksweepError } from '../../../../shared/errors.js';
import { parseModelParams } from '../../../../shared/model-params.js';
import { fixedColumnActiveLayer, uniformActiveLayer, type ActiveColumn, type ActiveLayerInput } from '../../../../worker/kernels/disk/active-layer.js';
import { makeLogGrid } from '../../../../worker/kernels/disk/grid.js';
import { constantOpacity } from '../../../../worker/kernels/disk/opacity.js';
import { computeTransportCoefficients, type TransportPhysics } from '../../../../worker/kernels/disk/transport-coefficients.js';
import { prepareColumn, solveActiveColumn } from '../../../../worker/kernels/ionization/active-column.js';
import { createIonizationActiveColumn } from '../../../../worker/kernels/ionization/ionization-active-layer.js';
import { blendThermal, thermalWeight } from '../../../../worker/kernels/ionization/thermal-activation.js';
import { ionizationOptionsFromParams } from '../../../../worker/model-setup.js';

const cell = (rAu: number, sigma: number, temperature: number, index = 0, time = 0): ActiveLayerInput => ({
  sigma, temperature, radius: rAu * AU_CGS, omega: Math.sqrt(GM_SUN_CGS / (rAu * AU_CGS) ** 3), time, index,
});
const ionOptions = (extra: Record<string, unknown> = {}) => ionizationOptionsFromParams(parseModelParams({ active_layer: 'ionization', ...extra }), 8);
const CELLS = [cell(0.1, 5e4, 700, 0), cell(1, 1700, 280, 1), cell(5, 150, 125, 2), cell(30, 3, 50, 3), cell(1, 0, 280, 4), cell(0.05, 1e5, 1500, 5)];

const PROVIDERS: [string, () => ActiveColumn][] = [
  ['uniform', () => uniformActiveLayer.create({})],
  ['fixed_column', () => fixedColumnActiveLayer.create({ sigmaActiveFace: 100 })],
  ['ionization', () => createIonizationActiveColumn(ionOptions())],
  ['ionization, elsasser + saha', () => createIonizationActiveColumn(ionOptions({ mri_criterion: 'elsasser', thermal_ionization: 'saha' }))],
];

describe.each(PROVIDERS)('Σ_a provider conformance: %s', (_, make) => {
  it('gives a finite, non-negative Σ_a; as used, min(Σ_a, Σ) lies in [0, Σ]', () => {
    const p = make();
    for (const c of CELLS) {
      const a = p(c);
      expect(Number.isFinite(a) && a >= 0).toBe(true);
      expect(Math.min(a, c.sigma)).toBeLessThanOrEqual(c.sigma);
    }
  });

  it('is a function of its inputs: the same calls after reset give the same numbers, in any cell order', () => {
    const p = make();
    const first = CELLS.map((c) => p(c));
    p.reset?.();
    const again = CELLS.map((c) => p(c));
    expect(again).toEqual(first);
    const fresh = make();
    const reversed = [...CELLS].reverse().map((c) => fresh(c)).reverse();
    expect(reversed).toEqual(first);
  });
});

describe('ionization provider', () => {
  it('with tolerance 0 returns the kernel\'s Σ_a for the column', () => {
    const o = ionOptions({ ion_refresh_tol: 0 });
    const p = createIonizationActiveColumn(o);
    const c = cell(1, 1700, 280);
    const direct = solveActiveColumn(prepareColumn(c, { ...o.sources, zetaRadio: 7.6e-19 + 1.1e-22 }, o.physics), o.nz).sigmaActive;
    expect(p(c)).toBe(direct);
    expect(direct).toBeGreaterThan(0);
    expect(direct).toBeLessThan(1700);
  });

  it('skips columns at or below the floor and counts them active', () => {
    const p = createIonizationActiveColumn(ionOptions({ sigma_ion_floor_g_cm2: 10 }));
    expect(p(cell(1, 10, 280))).toBe(10);
    expect(p.stats.refreshes).toBe(0);
  });

  it('a derivative probe (the flux-linearisation pass) answers from the cache, even at tolerance 0', () => {
    const p = createIonizationActiveColumn(ionOptions({ ion_refresh_tol: 0 }));
    const a = p(cell(1, 1700, 280));
    expect(p(cell(2, 600, 200, 1))).toBeGreaterThan(0);
    // Ω²R³ of the two cells differs in the last bits: that is not a change of M_*.
    expect(p.stats.globalRefreshes).toBe(1);
    expect(p({ ...cell(1, 1700 * (1 + 1e-4), 280), derivativeProbe: true })).toBe(a);
    expect(p.stats.refreshes).toBe(2);
    p(cell(1, 1700 * (1 + 1e-4), 280)); // the same change, not a probe: tolerance 0 re-runs the kernel
    expect(p.stats.refreshes).toBe(3);
  });

  it('re-evaluates a cell only when Σ or T moved by more than the tolerance', () => {
    const p = createIonizationActiveColumn(ionOptions({ ion_refresh_tol: 0.05 }));
    const a = p(cell(1, 1700, 280));
    expect(p.stats.refreshes).toBe(1);
    expect(p(cell(1, 1750, 285))).toBe(a); // 2.9 % and 1.8 %: kept
    expect(p.stats.refreshes).toBe(1);
    p(cell(1, 1800, 280)); // 5.9 %: refreshed
    expect(p.stats.refreshes).toBe(2);
    p(cell(1, 1800, 300)); // T 7 %: refreshed
    expect(p.stats.refreshes).toBe(3);
  });

  it('refreshes every cell when M_* or the radionuclide rate moved by more than the tolerance', () => {
    const p = createIonizationActiveColumn(ionOptions({ ion_refresh_tol: 0.05 }));
    p(cell(1, 1700, 280, 0));
    p(cell(2, 600, 200, 1));
    expect(p.stats.refreshes).toBe(2);
    const mean = 1.03 * 3.15576e13;
    p(cell(1, 1700, 280, 0, 0.01 * mean)); // ζ_R down 1 %: nothing
    expect(p.stats.refreshes).toBe(2);
    p(cell(1, 1700, 280, 0, 0.1 * mean)); // ζ_R down 9.5 %: a new generation, both cells refresh
    p(cell(2, 600, 200, 1, 0.1 * mean));
    expect(p.stats.globalRefreshes).toBe(2);
    expect(p.stats.refreshes).toBe(4);
  });

  it('blends the thermal threshold smoothly over T_MRI ± ΔT and is the whole column above', () => {
    expect(thermalWeight(974.9, 1000, 25)).toBe(0);
    expect(thermalWeight(1000, 1000, 25)).toBe(0.5);
    expect(thermalWeight(1025, 1000, 25)).toBe(1);
    expect(thermalWeight(999, 1000, 0)).toBe(0);
    expect(thermalWeight(1000, 1000, 0)).toBe(1);
    // Continuous and monotone across the ramp, with a vanishing slope at its ends (smoothstep).
    let previous = 0;
    for (let t = 975; t <= 1025; t += 0.5) {
      const w = thermalWeight(t, 1000, 25);
      expect(w).toBeGreaterThanOrEqual(previous);
      expect(w - previous).toBeLessThan(0.016);
      previous = w;
    }
    expect(blendThermal(1000, 100, 1)).toBe(1000);
    expect(blendThermal(1000, 100, 0)).toBe(100);
    expect(blendThermal(1000, 100, 0.5)).toBe(550);
    const p = createIonizationActiveColumn(ionOptions());
    const dense = cell(0.1, 5e4, 1100);
    expect(p(dense)).toBe(5e4);
    const none = createIonizationActiveColumn(ionOptions({ thermal_ionization: 'none' }));
    expect(none(dense)).toBeLessThan(5e4);
  });
});

describe('which temperature the thermal switch sees (activity_temperature)', () => {
  const hot = (quiescentTemperature: number): ActiveLayerInput => ({ ...cell(0.3, 1000, 1200), quiescentTemperature });

  it('quiescent (the default): the switch reads the dead column\'s temperature, the kernel the midplane one', () => {
    const p = createIonizationActiveColumn(ionOptions());
    expect(p.quiescentFrom).toBe(975);
    const ionOnly = createIonizationActiveColumn(ionOptions({ thermal_ionization: 'none' }))(cell(0.3, 1000, 1200));
    expect(ionOnly).toBeLessThan(1000);
    expect(p(hot(800))).toBe(ionOnly); // hot midplane, cool quiescent column: not thermally active
    expect(p(hot(1100))).toBe(1000);
    const mid = createIonizationActiveColumn(ionOptions({ activity_temperature: 'midplane' }));
    expect(mid.quiescentFrom).toBeUndefined();
    expect(mid(hot(800))).toBe(1000); // the midplane switch ignores it
  });

  it('Saha branch, quiescent: the whole kernel sees the dead column\'s temperature, at every midplane temperature', () => {
    const o = ionOptions({ thermal_ionization: 'saha', ion_refresh_tol: 0 });
    const p = createIonizationActiveColumn(o);
    expect(p.quiescentFrom).toBe(0);
    const zeta = { ...o.sources, zetaRadio: 7.6e-19 + 1.1e-22 };
    const c = cell(0.3, 1000, 1400);
    const kernel = (t: number, saha: number) =>
      solveActiveColumn(prepareColumn({ ...c, temperature: t, thermalIonizationTemperature: saha }, zeta, o.physics), o.nz).sigmaActive;
    // The choice matters at these temperatures, for the alkali ions and for the rest of the kernel alike (else the
    // checks below could not fail).
    expect(kernel(900, 900)).toBeLessThan(kernel(900, 1100));
    expect(kernel(900, 1100)).toBeLessThan(kernel(1100, 1100));
    expect(kernel(1400, 900)).toBeGreaterThan(kernel(900, 900));
    expect(p({ ...c, quiescentTemperature: 900 })).toBe(kernel(900, 900));
    expect(p({ ...c, quiescentTemperature: 1100, index: 1 })).toBe(kernel(1100, 1100));
    // The midplane temperature (1400 K in `c`, the column's own solve) does not enter.
    expect(p({ ...c, temperature: 3000, quiescentTemperature: 900, index: 2 })).toBe(kernel(900, 900));
  });

  it('the cache re-runs the kernel for a new quiescent temperature alone only where the kernel reads it (Saha)', () => {
    // Threshold switch: the kernel sees the midplane temperature only; the switch's weight is taken at every call.
    const threshold = createIonizationActiveColumn(ionOptions({ ion_refresh_tol: 0 }));
    const below = threshold(hot(900));
    expect(threshold(hot(950))).toBe(below);
    const blended = threshold(hot(1000)); // inside the blend (975–1025 K): the weight moved, the kernel did not run
    expect(blended).toBeGreaterThan(below);
    expect(blended).toBeLessThan(1000);
    expect(threshold.stats.refreshes).toBe(1);
    // Saha branch: the kernel reads it (below the 800 K from which the cache is bypassed altogether).
    const saha = createIonizationActiveColumn(ionOptions({ thermal_ionization: 'saha', ion_refresh_tol: 0 }));
    saha(hot(600));
    saha(hot(650));
    expect(saha.stats.refreshes).toBe(2);
  });

  it('Saha branch: where alkali ions can matter, even a derivative probe re-runs the kernel (Σ_a follows T steeply)', () => {
    const p = createIonizationActiveColumn(ionOptions({ thermal_ionization: 'saha' }));
    p({ ...cell(0.3, 1000, 1400), quiescentTemperature: 1000 });
    p({ ...cell(0.3, 1000 * (1 + 1e-4), 1400), quiescentTemperature: 1000, derivativeProbe: true });
    expect(p.stats.refreshes).toBe(2);
    p({ ...cell(1, 1700, 280, 1), quiescentTemperature: 280 });
    p({ ...cell(1, 1700 * (1 + 1e-4), 280, 1), quiescentTemperature: 280, derivativeProbe: true });
    expect(p.stats.refreshes).toBe(3); // a cool cell's probe answers from the cache
  });

  it('a column heated into activity by its own MRI is bistable with the midplane switch, single-valued with the quiescent one', () => {
    // 0.3 AU, Σ = 1000 g cm^-2, κ = 1: alpha_active heating alone gives ~1500 K, alpha_dead heating ~320 K.
    // Two states with the midplane switch: the thermal S-curve bistability (Bell & Lin 1994, from memory); one
    // with the quiescent switch: this model's design (ionization-active-layer.ts header), no source.
    const grid = makeLogGrid(0.299 * AU_CGS, 0.301 * AU_CGS, 2);
    const sigma = Float64Array.of(1000, 1000);
    const omega = grid.centers.map((r) => Math.sqrt(GM_SUN_CGS / r ** 3));
    const physics = (activity: string): TransportPhysics => ({
      alphaActive: 0.01, alphaDead: 1e-4, opacity: constantOpacity(1), gi: null, baseTemperature4: Float64Array.of(100 ** 4, 100 ** 4),
      activeColumn: createIonizationActiveColumn({ ...ionOptions({ activity_temperature: activity, ion_refresh_tol: 0 }), nCells: 2 }),
    });
    const settle = (activity: string, tStart: number) => {
      const fields = { nu: new Float64Array(2), temperature: Float64Array.of(tStart, tStart), sigmaActive: new Float64Array(2) };
      const ph = physics(activity);
      for (let k = 0; k < 20; k++) computeTransportCoefficients(grid, sigma, omega, ph, fields);
      return { t: fields.temperature[0], active: fields.sigmaActive[0] / sigma[0] };
    };
    const midHot = settle('midplane', 1500);
    const midCold = settle('midplane', 300);
    expect(midHot.active).toBe(1);
    expect(midHot.t).toBeGreaterThan(1025);
    expect(midCold.active).toBeLessThan(0.5);
    expect(midCold.t).toBeLessThan(975);
    const qHot = settle('quiescent', 1500);
    const qCold = settle('quiescent', 300);
    // One state from either start (to the fixed-point iteration's convergence).
    expect(Math.abs(qHot.t - qCold.t) / qCold.t).toBeLessThan(1e-9);
    expect(Math.abs(qHot.active - qCold.active)).toBeLessThan(1e-9);
    expect(qHot.active).toBeLessThan(0.5);
  });
});

describe('Saha branch in the layered transport', () => {
  it('a column near the inner dead-zone edge settles to one state from a hot and a cold start', () => {
    // A column of the default infall model near 0.17 AU at ~0.09 Myr (Σ = 4790 g cm^-2, irradiation 918 K,
    // M_* = 0.148 M_sun): with the midplane temperature in the kernel's c_s, H and η it settled a quarter active
    // (2530 K) from 2400 K and fully active (3990 K) from 4000 K: its own MRI heating kept it active. That a
    // column heated by its own MRI can hold a hot and a cold state is the thermal S-curve bistability (Bell & Lin
    // 1994, from memory); that the quiescent temperature leaves one state is this model's design (the header of
    // ionization-active-layer.ts), no source: the check is of the code against that design.
    const rAu = 0.1747;
    const grid = makeLogGrid(0.999 * rAu * AU_CGS, 1.001 * rAu * AU_CGS, 2);
    const sigma = Float64Array.of(4790, 4790);
    const omega = grid.centers.map((r) => Math.sqrt((0.148 * GM_SUN_CGS) / r ** 3));
    const settle = (tStart: number) => {
      const physics: TransportPhysics = {
        alphaActive: 0.01, alphaDead: 1e-4, opacity: constantOpacity(1), gi: null, baseTemperature4: Float64Array.of(918 ** 4, 918 ** 4),
        activeColumn: createIonizationActiveColumn({ ...ionOptions({ thermal_ionization: 'saha', ion_refresh_tol: 0 }), nCells: 2 }),
      };
      const fields = { nu: new Float64Array(2), temperature: Float64Array.of(tStart, tStart), sigmaActive: new Float64Array(2) };
      for (let k = 0; k < 60; k++) computeTransportCoefficients(grid, sigma, omega, physics, fields);
      return { t: fields.temperature[0], active: fields.sigmaActive[0] / sigma[0] };
    };
    const hot = settle(4000);
    const cold = settle(2400);
    expect(Math.abs(hot.t - cold.t) / cold.t).toBeLessThan(1e-9);
    expect(Math.abs(hot.active - cold.active)).toBeLessThan(1e-9);
  });
});

describe('ionization parameters are validated like every other (invalid next to valid)', () => {
  it.each([
    [{ zeta_cr_s: -1e-17 }, 'zeta_cr_s'],
    [{ lx_erg_s: 1e40 }, 'lx_erg_s'],
    [{ n_z: 2 }, 'n_z'],
    [{ n_z: 10.5 }, 'n_z'],
    [{ ion_chemistry: 'grains' }, 'ion_chemistry'],
    [{ mri_criterion: 'ambipolar' }, 'mri_criterion'],
    [{ ion_refresh_tol: 2 }, 'ion_refresh_tol'],
    [{ active_layer: 'ionisation' }, 'active_layer'],
    [{ activity_temperature: 'actual' }, 'activity_temperature'],
    [{ xray_spectrum: '4kev' }, 'xray_spectrum'],
    [{ thermal_inertia: 'yes' }, 'thermal_inertia'],
  ])('%o is refused, naming %s', (bad, name) => {
    let details: readonly string[] = [];
    try {
      parseModelParams(bad);
    } catch (e) {
      details = e instanceof DisksweepError ? e.details : [];
    }
    expect(details.length).toBe(1);
    expect(details[0].startsWith(`${name}:`)).toBe(true);
  });

  it.each([{ zeta_cr_s: 0 }, { lx_erg_s: 0 }, { n_z: 4 }, { ion_chemistry: 'metals', x_metal: 1e-10 }, { ion_refresh_tol: 0 }, { activity_temperature: 'midplane' }, { xray_spectrum: '3kev' }, { thermal_inertia: 'on' }])('%o is accepted', (good) => {
    expect(() => parseModelParams({ active_layer: 'ionization', ...good })).not.toThrow();
  });
});
