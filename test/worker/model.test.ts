/**
 * runModel as a whole: a pure, deterministic function whose result matches the output registry.
 */
import { describe, expect, it } from 'vitest';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS, SERIES_COLUMNS } from '../../shared/model-outputs.js';
import { decodeSeries, modelResultSchema, type ModelResult } from '../../shared/model-result.js';
import { runModel } from '../../worker/model.js';
import { runCli } from '../support/cli.js';

const withoutTiming = (r: ModelResult) => ({ ...r, timing: { ...r.timing, wall_ms: 0 } });
const SMALL = { n_cells: 80, t_end_myr: 1 } as const;

describe('runModel', () => {
  it('is bit-for-bit deterministic, in this process and in another one', () => {
    const params = { ...SMALL, alpha_active: 3e-3 };
    const a = runModel(params);
    const b = runModel(params);
    expect(withoutTiming(b)).toEqual(withoutTiming(a));
    const args = Object.entries(params).flatMap(([k, v]) => ['--set', `${k}=${v}`]);
    const other = modelResultSchema.parse(JSON.parse(runCli(['model', '--json', ...args]).stdout));
    expect(JSON.stringify(withoutTiming(other))).toBe(JSON.stringify(withoutTiming(a)));
  });

  it('returns every registered output, and only those', () => {
    const r = modelResultSchema.parse(runModel(SMALL));
    expect(Object.keys(r.scalars).sort()).toEqual(SCALAR_OUTPUTS.map((d) => d.name).sort());
    for (const c of r.checkpoints) {
      expect(Object.keys(c).sort()).toEqual(['t_myr', ...CHECKPOINT_OUTPUTS.map((d) => d.name)].sort());
    }
    expect(r.series.columns).toEqual([...SERIES_COLUMNS]);
  });

  it('lands exactly on the checkpoints and samples the series evenly up to t_end', () => {
    const r = runModel({ ...SMALL, checkpoints_myr: [0.01, 0.25, 0.7, 1, 3], n_series: 20 });
    expect(r.checkpoints.map((c) => c.t_myr)).toEqual([0.01, 0.25, 0.7, 1]);
    const s = decodeSeries(r.series);
    expect(r.series.n_samples).toBe(20);
    s.t_myr.forEach((t, k) => expect(t).toBeCloseTo((k + 1) / 20, 6));
  });

  it('keeps the stellar mass when asked to, and then books accretion only as a budget line', () => {
    const r = runModel({ ...SMALL, initial_state: 'disk', star_mass: 'fixed', m_star_msun: 0.7 });
    for (const c of r.checkpoints) expect(c.m_star_msun).toBeCloseTo(0.7, 14);
    expect(r.scalars.m_accreted_msun as number).toBeGreaterThan(0);
    expect(r.scalars.j_rescale_g_cm2_s).toBe(0);
  });

  it('a dead zone (fixed active column, alpha_dead = 0) holds back mass the active disk would accrete', () => {
    // A compact disk (Sigma >> 200 g/cm^2 inside a few AU) without viscous heating, so T is the irradiation
    // law in both runs and only the active column differs (Gammie 1996: accretion through the layer alone).
    const disk = { ...SMALL, initial_state: 'disk', r1_au: 3, kappa_cm2_g: 0, gi_transport: 'off' } as const;
    const active = runModel(disk);
    const layered = runModel({ ...disk, active_layer: 'fixed_column', alpha_dead: 0 });
    expect(layered.scalars.m_accreted_msun as number).toBeLessThan(0.25 * (active.scalars.m_accreted_msun as number));
    expect(layered.status).toBe('ok');
  });

  it('orders the mass radii and reports a sensible accretion history for the default infall model', () => {
    const r = runModel({ n_cells: 100, t_end_myr: 2 });
    expect(r.status).toBe('ok');
    for (const c of r.checkpoints) {
      expect(c.r50_au as number).toBeLessThan(c.r68_au as number);
      expect(c.r68_au as number).toBeLessThan(c.r90_au as number);
    }
    // During infall the star grows at a good part of the Shu rate (~1.5e-6 Msun/yr for a 10 K core).
    expect(r.checkpoints[0].mdot_star_msun_yr).toBeGreaterThan(5e-7);
    expect(r.checkpoints[0].mdot_star_msun_yr).toBeLessThan(2e-6);
  });

  it('a run that exhausts max_steps ends with status step_limit and a reason', () => {
    const r = runModel({ ...SMALL, max_steps: 10 });
    expect(r.status).toBe('step_limit');
    expect(r.status_reason).toContain('max_steps = 10');
  });
});
