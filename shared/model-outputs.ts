/**
 * The output registry: every quantity a model run records, with its unit and meaning. The store, exports and
 * the query tool discover outputs from here, never by hard-coding names. Names carry their unit as a suffix;
 * `1` means dimensionless.
 */

export type OutputKind = 'scalar' | 'checkpoint';

export interface OutputDescriptor {
  readonly name: string;
  readonly unit: string;
  readonly kind: OutputKind;
  /** 'flag' outputs are booleans; everything else is a number. */
  readonly type: 'number' | 'flag';
  /** True when the value may be null (never reached, undefined for an empty disk, or infinite). */
  readonly nullable: boolean;
  readonly description: string;
}

const out = <N extends string>(
  kind: OutputKind,
  name: N,
  unit: string,
  description: string,
  opts: { nullable?: boolean; type?: 'number' | 'flag' } = {},
): OutputDescriptor & { readonly name: N } => ({ name, unit, kind, type: opts.type ?? 'number', nullable: opts.nullable ?? false, description });

const cp = <N extends string>(name: N, unit: string, description: string, opts?: { nullable?: boolean }) =>
  out('checkpoint', name, unit, description, opts);
const sc = <N extends string>(name: N, unit: string, description: string, opts?: { nullable?: boolean; type?: 'number' | 'flag' }) =>
  out('scalar', name, unit, description, opts);

export const CHECKPOINT_OUTPUTS = [
  cp('m_star_msun', 'M_sun', 'stellar mass'),
  cp('m_disk_msun', 'M_sun', 'disk mass on the grid'),
  cp('mdot_star_msun_yr', 'M_sun/yr', 'accretion rate onto the star over the last step (disk through R_in plus infall inside R_in)'),
  cp('mdot_star_avg_msun_yr', 'M_sun/yr', 'accretion rate onto the star averaged over the preceding 1e4 yr'),
  cp('j_disk_g_cm2_s', 'g cm^2 s^-1', 'angular momentum of the disk'),
  cp('j_spin_g_cm2_s', 'g cm^2 s^-1', 'spin angular momentum the star keeps'),
  cp('j_removed_g_cm2_s', 'g cm^2 s^-1', 'angular momentum accreted by the star and removed by star-disk torques and winds, so far'),
  cp('j_lost_g_cm2_s', 'g cm^2 s^-1', 'angular momentum carried out through R_out, so far'),
  cp('star_mass_share', '1', 'M_* / (M_* + M_disk)'),
  cp('spin_j_share', '1', 'J_spin / (J_spin + J_disk)'),
  cp('r50_au', 'AU', 'radius enclosing 50 % of the disk mass', { nullable: true }),
  cp('r68_au', 'AU', 'radius enclosing 68 % of the disk mass', { nullable: true }),
  cp('r90_au', 'AU', 'radius enclosing 90 % of the disk mass', { nullable: true }),
  cp('q_min', '1', 'smallest Toomre Q over the disk', { nullable: true }),
  cp('n_dead_bands', '1', 'number of radial bands whose midplane is MRI-dead (Sigma_a < Sigma); 0 = no dead zone'),
  cp('r_dead_in_au', 'AU', 'inner edge of the outermost dead band, to one cell (null without a dead zone)', { nullable: true }),
  cp('r_dead_out_au', 'AU', 'outer edge of the outermost dead band, to one cell (null without a dead zone)', { nullable: true }),
  cp('m_dead_msun', 'M_sun', 'mass in the dead parts of the columns, sum of (Sigma - Sigma_a) over the disk'),
  cp('sigma_active_1au_g_cm2', 'g cm^-2', 'MRI-active column Sigma_a (both faces) in the cell holding 1 AU (null off the grid)', { nullable: true }),
  cp('l_star_lsun', 'L_sun', 'luminosity irradiating the disk, L_phot + L_acc (L_acc from the accretion rate of the step before)'),
  cp('l_acc_lsun', 'L_sun', 'accretion luminosity G M_* Mdot_* / R_* (1 - R_*/R_in) (0 with accretion_luminosity=off)'),
  cp('m_wind_msun', 'M_sun', 'mass removed by the photoevaporative winds, so far'),
  cp('mdot_wind_msun_yr', 'M_sun/yr', 'mass-loss rate of all photoevaporative winds over the last step'),
  cp('r_cavity_au', 'AU', 'radius of the inner cavity (where the midplane column from R_in reaches n_h_cavity_cm2); null while there is none', { nullable: true }),
  cp('active_share_1au', '1', 'share of the accretion flow at 1 AU carried by the active layers: alpha_active Sigma_a / (alpha_eff Sigma), alpha_eff with the dead-zone and GI parts (null for an empty cell)', { nullable: true }),
] as const;

export const SCALAR_OUTPUTS = [
  sc('t_infall_end_myr', 'Myr', 'time the cloud core was used up (null for a model started as a disk)', { nullable: true }),
  sc('t_solar_split_myr', 'Myr', 'first time after infall that the solar-like split holds (null if never)', { nullable: true }),
  sc('t_solar_split_after_infall_myr', 'Myr', 'the same, counted from the end of infall', { nullable: true }),
  sc('m_star_end_msun', 'M_sun', 'stellar mass at the end of the run'),
  sc('m_disk_end_msun', 'M_sun', 'disk mass at the end of the run'),
  sc('star_mass_share_end', '1', 'M_* / (M_* + M_disk) at the end of the run'),
  sc('spin_j_share_end', '1', 'J_spin / (J_spin + J_disk) at the end of the run'),
  sc('q_min_run', '1', 'smallest Toomre Q seen during the run', { nullable: true }),
  sc('max_disk_star_ratio', '1', 'largest M_disk / M_* seen during the run'),
  sc('flag_massive_disk', '1', 'M_disk / M_* exceeded 0.3 at some time: the Keplerian 1-D picture is questionable', { type: 'flag' }),
  sc('flag_fragmentation', '1', 'somewhere Q < 1 with t_cool Omega < 3 (Gammie 2001): the disk may fragment', { type: 'flag' }),
  sc('m_infall_msun', 'M_sun', 'mass delivered by infall (onto the disk and straight onto the star)'),
  sc('m_accreted_msun', 'M_sun', 'mass accreted through R_in'),
  sc('m_lost_msun', 'M_sun', 'mass lost through R_out'),
  sc('j_infall_g_cm2_s', 'g cm^2 s^-1', 'angular momentum delivered by infall'),
  sc('j_accreted_g_cm2_s', 'g cm^2 s^-1', 'angular momentum carried through R_in'),
  sc('j_lost_g_cm2_s', 'g cm^2 s^-1', 'angular momentum carried through R_out'),
  sc('j_rescale_g_cm2_s', 'g cm^2 s^-1', 'change of J_disk because the star grew (every j is proportional to M_*^1/2)'),
  sc('j_removed_g_cm2_s', 'g cm^2 s^-1', 'angular momentum removed from the star by torques and winds'),
  sc('mass_budget_rel_err', '1', 'relative closure error of the disk mass budget'),
  sc('j_budget_rel_err', '1', 'relative closure error of the disk angular-momentum budget'),
  sc('n_outbursts', '1', 'accretion outbursts: runs of steps with Mdot_* above 10x its mean over the preceding 1e4 yr'),
  sc('m_outbursts_msun', 'M_sun', 'mass the star accreted during outbursts'),
  sc('t_first_outburst_myr', 'Myr', 'start of the first outburst (null if none)', { nullable: true }),
  sc('disk_lifetime_myr', 'Myr', 'disk lifetime: first time after infall that M_disk < disk_end_mass_msun or Mdot_* < disk_end_mdot_msun_yr (null if not by t_end)', { nullable: true }),
  sc('disk_lifetime_after_infall_myr', 'Myr', 'the same, counted from the end of infall', { nullable: true }),
  sc('t_cavity_open_myr', 'Myr', 'first time after infall that an inner cavity is open (null if never)', { nullable: true }),
  sc('r_cavity_open_au', 'AU', 'radius of the inner cavity when it first opened (null if never)', { nullable: true }),
  sc('m_wind_msun', 'M_sun', 'mass removed by all photoevaporative winds'),
  sc('m_wind_xray_msun', 'M_sun', 'mass removed by the internal X-ray wind'),
  sc('m_wind_euv_msun', 'M_sun', 'mass removed by the internal EUV wind (diffuse and direct field)'),
  sc('m_wind_fuv_msun', 'M_sun', 'mass removed by the external FUV wind'),
  sc('j_wind_g_cm2_s', 'g cm^2 s^-1', 'angular momentum carried off by the winds'),
] as const;

export const OUTPUTS: readonly OutputDescriptor[] = [...CHECKPOINT_OUTPUTS, ...SCALAR_OUTPUTS];

export type CheckpointOutputName = (typeof CHECKPOINT_OUTPUTS)[number]['name'];
export type ScalarOutputName = (typeof SCALAR_OUTPUTS)[number]['name'];

/** Columns of the compact time series, in storage order (float32 little-endian, row-major). */
export const SERIES_COLUMNS = [
  't_myr',
  'm_star_msun',
  'm_disk_msun',
  'mdot_star_msun_yr',
  'star_mass_share',
  'spin_j_share',
] as const;
export type SeriesColumn = (typeof SERIES_COLUMNS)[number];
