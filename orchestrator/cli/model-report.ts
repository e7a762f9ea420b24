/**
 * The human-readable summary `disksweep model` prints: what was run, the checkpoint table, the solar-like
 * split, budgets and flags, and a small plot of M_* and M_disk against time. Text only; no physics.
 */
import { PARAMS, PARAM_NAMES, DEFAULT_PARAMS, allowedText, type ModelParams } from '../../shared/model-params.js';
import { decodeSeries, type ModelResult } from '../../shared/model-result.js';
import { renderPlot } from './terminal-plot.js';
import { num, table } from './text-table.js';

/** Parameters that differ from their defaults, as `name=value` (what makes this run this run). */
export function changedParams(p: ModelParams): string[] {
  // Checkpoints after t_end are dropped by the schema; that alone is not a change the user made.
  const defaults = { ...DEFAULT_PARAMS, checkpoints_myr: DEFAULT_PARAMS.checkpoints_myr.filter((t) => t <= p.t_end_myr) };
  return PARAM_NAMES.filter((n) => JSON.stringify(p[n]) !== JSON.stringify(defaults[n])).map(
    (n) => `${n}=${Array.isArray(p[n]) ? (p[n] as number[]).join(',') : String(p[n])}`,
  );
}

export function formatModelReport(p: ModelParams, r: ModelResult): string {
  const out: string[] = [];
  const changed = changedParams(p);
  out.push(`disksweep model ${r.model_version}: ${p.initial_state === 'infall' ? 'cloud-core collapse' : 'given disk'}, ` +
    `${p.n_cells} cells ${p.r_in_au}-${p.r_out_au} AU, t_end ${p.t_end_myr} Myr`);
  out.push(`parameters changed from defaults: ${changed.length > 0 ? changed.join(' ') : '(none)'}`);
  out.push(`status: ${r.status}${r.status_reason === null ? '' : ` (${r.status_reason})`}`);
  out.push('');
  out.push(
    table(
      ['t [Myr]', 'M_* [Msun]', 'M_disk [Msun]', 'Mdot_* [Msun/yr]', '<Mdot_*>1e4yr', 'J_spin share', 'r50 [AU]', 'r90 [AU]', 'Q_min', 'L_* [Lsun]', 'Mdot_wind'],
      r.checkpoints.map((c) => [
        num(c.t_myr), num(c.m_star_msun, 4), num(c.m_disk_msun), num(c.mdot_star_msun_yr), num(c.mdot_star_avg_msun_yr),
        num(c.spin_j_share), num(c.r50_au), num(c.r90_au), num(c.q_min), num(c.l_star_lsun), num(c.mdot_wind_msun_yr),
      ]),
    ),
  );
  const s = r.scalars;
  out.push('');
  out.push(
    `solar-like split (M_* share >= ${p.f_mass_star}, J_spin share <= ${p.f_j_disk_max}): ` +
      (s.t_solar_split_myr === null
        ? `not reached by ${p.t_end_myr} Myr (at the end: M_* share ${num(s.star_mass_share_end, 4)}, J_spin share ${num(s.spin_j_share_end)})`
        : `first at ${num(s.t_solar_split_myr)} Myr (${num(s.t_solar_split_after_infall_myr)} Myr after infall ended)`),
  );
  if (s.t_infall_end_myr !== null) out.push(`infall ended at ${num(s.t_infall_end_myr)} Myr`);
  out.push(
    `disk lifetime (M_disk < ${p.disk_end_mass_msun} Msun or Mdot_* < ${p.disk_end_mdot_msun_yr} Msun/yr): ` +
      (s.disk_lifetime_myr === null
        ? `not ended by ${p.t_end_myr} Myr`
        : `ended at ${num(s.disk_lifetime_myr)} Myr (${num(s.disk_lifetime_after_infall_myr)} Myr after infall ended)`) +
      `; inner cavity: ${s.t_cavity_open_myr === null ? 'never opened' : `opened at ${num(s.t_cavity_open_myr)} Myr, rim at ${num(s.r_cavity_open_au)} AU`}`,
  );
  out.push(
    `mass budget [Msun]: infall ${num(s.m_infall_msun)}, accreted through R_in ${num(s.m_accreted_msun)}, ` +
      `lost through R_out ${num(s.m_lost_msun)}, to winds ${num(s.m_wind_msun)} (X-ray ${num(s.m_wind_xray_msun)}, ` +
      `EUV ${num(s.m_wind_euv_msun)}, external FUV ${num(s.m_wind_fuv_msun)}); closure error ${num(s.mass_budget_rel_err)}`,
  );
  out.push(
    `angular momentum [g cm^2/s]: infall ${num(s.j_infall_g_cm2_s)}, through R_in ${num(s.j_accreted_g_cm2_s)} ` +
      `(removed from the star ${num(s.j_removed_g_cm2_s)}), through R_out ${num(s.j_lost_g_cm2_s)}, ` +
      `to winds ${num(s.j_wind_g_cm2_s)}, star growth ${num(s.j_rescale_g_cm2_s)}; closure error ${num(s.j_budget_rel_err)}`,
  );
  const last = r.checkpoints.at(-1);
  if (last !== undefined) {
    out.push(
      `dead zone at ${num(last.t_myr)} Myr: ` +
        (last.n_dead_bands === 0
          ? 'none'
          : `${num(last.r_dead_in_au)}-${num(last.r_dead_out_au)} AU (outermost of ${last.n_dead_bands} band${last.n_dead_bands === 1 ? '' : 's'}), ` +
            `dead mass ${num(last.m_dead_msun)} Msun`) +
        `; Sigma_a at 1 AU ${num(last.sigma_active_1au_g_cm2)} g cm^-2, active layers carry ${num(last.active_share_1au)} of the flow there`,
    );
  }
  out.push(
    `accretion outbursts (Mdot_* > 10x its 1e4-yr mean): ${num(s.n_outbursts)}` +
      (s.t_first_outburst_myr === null ? '' : `, first at ${num(s.t_first_outburst_myr)} Myr, ${num(s.m_outbursts_msun)} Msun accreted in them`),
  );
  const flags: string[] = [];
  if (s.flag_massive_disk === true) flags.push(`M_disk/M_* reached ${num(s.max_disk_star_ratio)} (> 0.3: self-gravity matters, the Keplerian 1-D picture is approximate)`);
  if (s.flag_fragmentation === true) flags.push('Q < 1 with fast cooling somewhere: the disk may fragment, which this model does not follow');
  out.push(`flags: ${flags.length > 0 ? flags.join('; ') : 'none'}`);
  out.push(`steps: ${r.timing.steps} (${r.timing.rejected_steps} redone), ${r.timing.wall_ms.toFixed(0)} ms`);

  const series = decodeSeries(r.series);
  if (r.series.n_samples > 1) {
    out.push('');
    out.push(
      renderPlot(series.t_myr, [
        { label: 'M_* [Msun]', symbol: '*', y: series.m_star_msun },
        { label: 'M_disk [Msun]', symbol: 'o', y: series.m_disk_msun },
      ], { logY: true, xLabel: 'x: t [Myr]', yLabel: 'mass [Msun]' }),
    );
  }
  return out.join('\n');
}

/** `disksweep model --list`: every parameter with unit, default, allowed range and meaning. */
export function formatParamList(): string {
  const lines: string[] = [];
  for (const name of PARAM_NAMES) {
    const p = PARAMS[name];
    const unit = p.kind === 'choice' ? '' : ` [${p.unit}]`;
    const def = Array.isArray(p.default) ? p.default.join(',') : String(p.default);
    lines.push(`${name}${unit}  default ${def}; ${allowedText(p)}`);
    lines.push(`    ${p.description}`);
    if (p.source !== undefined) lines.push(`    default from: ${p.source}`);
  }
  return lines.join('\n');
}
