/**
 * The human-readable output of `disksweep probe`: what was probed, the profile table from the face to the
 * midplane, the active column, and two small plots against log10 of the face column (ionization rate by source;
 * activity number against its threshold). Text only; no physics.
 */
import type { ProbeResult } from '../../worker/probe.js';
import { renderPlot } from './terminal-plot.js';
import { num, table } from './text-table.js';

export function formatProbeReport(r: ProbeResult): string {
  const q = r.inputs;
  const c = r.criterion;
  const activityName = c.name === 'reynolds' ? 'Re' : 'Lambda';
  const out: string[] = [];
  out.push(
    `disksweep probe ${r.model_version}: R = ${num(q.r_au)} AU, Sigma = ${num(q.sigma_g_cm2)} g cm^-2, T = ${num(q.t_k)} K, ` +
      `M_* = ${num(q.m_star_msun)} M_sun, t = ${num(q.t_myr)} Myr`,
  );
  out.push(
    `H = ${num(r.scale_height_au)} AU, rho_0 = ${num(r.rho_midplane_g_cm3)} g cm^-3; chemistry ${r.chemistry} (grain-free), ` +
      `thermal ionization ${r.thermal_ionization}; active where ${activityName} >= ${num(c.threshold)}` +
      (c.beta_midplane === null ? '' : ` (field uniform in height, midplane beta ${num(c.beta_midplane)})`),
  );
  out.push('');
  out.push(
    table(
      ['z [AU]', 'z/H', 'column [g cm^-2]', 'rho [g cm^-3]', 'zeta_X [s^-1]', 'zeta_CR [s^-1]', 'zeta_R [s^-1]', 'x_e', 'eta [cm^2 s^-1]', activityName, 'state'],
      r.profile.map((p) => [
        num(p.z_au), num(p.z_over_h), num(p.column_g_cm2), num(p.rho_g_cm3), num(p.zeta_x_s), num(p.zeta_cr_s), num(p.zeta_r_s),
        num(p.x_e), num(p.eta_cm2_s), num(p.activity), p.active ? 'active' : 'dead',
      ]),
    ),
  );
  out.push('');
  out.push(
    `ionization active column: ${num(r.sigma_active_ion_face_g_cm2)} g cm^-2 per face, ${num(r.sigma_active_ion_g_cm2)} g cm^-2 ` +
      `in total of ${num(q.sigma_g_cm2)}; midplane ${r.ionization_midplane_dead ? 'dead' : 'active'} (boundary by root-finding between samples)`,
  );
  const why = r.below_floor
    ? ' (column at or below sigma_ion_floor_g_cm2: counted active)'
    : r.thermal_weight > 0
      ? ` (thermal threshold weight ${num(r.thermal_weight)})`
      : '';
  out.push(
    `Sigma_a the model's transport uses: ${num(r.sigma_active_g_cm2)} g cm^-2 (${num(r.sigma_active_face_g_cm2)} per face)${why}; ` +
      `midplane ${r.midplane_dead ? 'dead' : 'active'}`,
  );
  const x = r.profile.map((p) => Math.log10(p.column_g_cm2));
  // Rates below 1e-24 s^-1 ionize nothing that matters here and would squash the plot's scale.
  const shown = (v: number): number => (v >= 1e-24 ? v : NaN);
  out.push('');
  out.push(
    renderPlot(x, [
      { label: 'zeta_X', symbol: 'x', y: r.profile.map((p) => shown(p.zeta_x_s)) },
      { label: 'zeta_CR', symbol: 'c', y: r.profile.map((p) => shown(p.zeta_cr_s)) },
      { label: 'zeta_R', symbol: 'r', y: r.profile.map((p) => shown(p.zeta_r_s)) },
    ], { logY: true, height: 10, xLabel: 'x: log10 column from the face [g cm^-2]', yLabel: 'ionization rate per H2 [s^-1], above 1e-24' }),
  );
  out.push('');
  out.push(
    renderPlot(x, [
      { label: `threshold ${num(c.threshold)}`, symbol: '-', y: r.profile.map(() => c.threshold) },
      { label: activityName, symbol: 'o', y: r.profile.map((p) => p.activity) },
    ], { logY: true, height: 10, xLabel: 'x: log10 column from the face [g cm^-2]', yLabel: `${activityName} (active above the threshold)` }),
  );
  out.push('');
  out.push('Grain-free chemistry: dust grains would lower x_e and shrink the active layers a lot (see --help).');
  return out.join('\n');
}
