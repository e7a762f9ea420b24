/**
 * The one schema of model parameters. `disksweep model --set`, `disksweep model --list`, sweep specs and the
 * store all read parameter names, units, defaults and ranges from the descriptor table below; the zod schema
 * is generated from it, so documentation and validation cannot drift apart.
 *
 * User-facing units are in every name. Conversion to cgs happens once, in `worker/model-setup.ts`, which also
 * checks the constraints that need a derived physical quantity (the final centrifugal radius of infall).
 */
import { z } from 'zod';
import { DisksweepError } from './errors.js';
import { AU_CGS, R_SUN_CGS } from './constants.js';

interface ParamBase {
  /** What the parameter means, in one or two sentences a researcher can act on. */
  readonly description: string;
  /** Where its default comes from (a paper, common practice, or "demo choice"). */
  readonly source?: string;
}

export interface NumberParam extends ParamBase {
  readonly kind: 'number';
  readonly unit: string;
  readonly default: number;
  readonly min: number;
  readonly max: number;
  readonly minExclusive?: boolean;
  readonly maxExclusive?: boolean;
  readonly integer?: boolean;
  /** True when sweeps should sample this parameter logarithmically by default. */
  readonly logScale?: boolean;
}

export interface ChoiceParam extends ParamBase {
  readonly kind: 'choice';
  readonly choices: readonly string[];
  readonly default: string;
}

export interface ListParam extends ParamBase {
  readonly kind: 'list';
  readonly unit: string;
  readonly default: readonly number[];
  readonly min: number;
  readonly max: number;
}

export type ParamDescriptor = NumberParam | ChoiceParam | ListParam;

const num = (p: Omit<NumberParam, 'kind'>): NumberParam => ({ kind: 'number', ...p });
const choice = (p: Omit<ChoiceParam, 'kind'>): ChoiceParam => ({ kind: 'choice', ...p });
const list = (p: Omit<ListParam, 'kind'>): ListParam => ({ kind: 'list', ...p });

/** Every model parameter, in the order `--list` prints them. */
export const PARAMS = {
  initial_state: choice({
    choices: ['infall', 'disk'],
    default: 'infall',
    description:
      'How a model starts: "infall" = a seed star inside a collapsing cloud core (t = 0 is collapse onset); ' +
      '"disk" = a star with a ready-made Lynden-Bell & Pringle disk.',
  }),
  m_seed_msun: num({
    unit: 'M_sun', default: 0.01, min: 1e-4, max: 1, logScale: true,
    description: 'initial_state=infall: mass of the seed protostar at collapse onset.',
    source: 'demo choice; a first hydrostatic core is of order 0.01 M_sun',
  }),
  m_core_msun: num({
    unit: 'M_sun', default: 1, min: 0.01, max: 100, logScale: true,
    description: 'initial_state=infall: mass of the collapsing cloud core; infall stops when it is used up.',
  }),
  t_core_k: num({
    unit: 'K', default: 10, min: 5, max: 100,
    description: 'initial_state=infall: isothermal core temperature; sets the Shu (1977) rate 0.975 c_s^3/G.',
    source: 'common practice: dense cores are at about 10 K',
  }),
  omega_core_s: num({
    unit: 's^-1', default: 1e-14, min: 0, max: 1e-12,
    description:
      'initial_state=infall: solid-body rotation rate of the core; sets the centrifugal radius ' +
      'r_c = m0^3 c_s t^3 Omega^2 / 16 (Terebey, Shu & Cassen 1984).',
    source: 'common practice: observed cores rotate at 1e-14 to 1e-13 s^-1',
  }),
  m_star_msun: num({
    unit: 'M_sun', default: 1, min: 0.01, max: 10, logScale: true,
    description: 'initial_state=disk: initial stellar mass.',
  }),
  m_disk_msun: num({
    unit: 'M_sun', default: 0.05, min: 1e-8, max: 10, logScale: true,
    description: 'initial_state=disk: initial disk mass.',
  }),
  r1_au: num({
    unit: 'AU', default: 30, min: 0.1, max: 1e4, logScale: true,
    description: 'initial_state=disk: characteristic radius R1 of the Lynden-Bell & Pringle (1974) profile.',
  }),
  gamma_lbp: num({
    unit: '1', default: 1, min: 0, max: 2, maxExclusive: true,
    description: 'initial_state=disk: viscosity power-law index gamma of the profile, Sigma ~ R^-gamma exp(-(R/R1)^(2-gamma)).',
  }),
  r_in_au: num({
    unit: 'AU', default: 0.05, min: 1e-3, max: 10, logScale: true,
    description: 'Inner edge of the grid (zero-torque boundary); gas crossing it is accreted by the star.',
  }),
  r_out_au: num({
    unit: 'AU', default: 1e4, min: 1, max: 1e6, logScale: true,
    description: 'Outer edge of the grid (zero torque); gas leaving it is booked as lost. Keep it far out.',
    source: 'the default infall model loses 4e-4 M_sun through 1e4 AU in 5 Myr (5e-2 through 1000 AU)',
  }),
  n_cells: num({
    unit: '1', default: 200, min: 16, max: 20000, integer: true,
    description: 'Number of logarithmically spaced cells between r_in_au and r_out_au.',
  }),
  alpha_active: num({
    unit: '1', default: 0.01, min: 0, max: 1, minExclusive: true, logScale: true,
    description: 'Shakura-Sunyaev alpha where the gas is MRI-active.',
  }),
  alpha_dead: num({
    unit: '1', default: 1e-4, min: 0, max: 1,
    description:
      'Residual alpha in the dead (MRI-inactive) part of the column; must not exceed alpha_active. With ' +
      'active_layer=ionization, values below ~1e-5 let the dead zone pile up until it is heated to activation and ' +
      'drains in outbursts, followed step by step (1e-6: the default infall model needs ~360 000 steps, raise ' +
      'max_steps); at 0 only GI heats it, a ~1e6 g cm^-2 column switches on at ~1e5 K, outside the thermal model, ' +
      'and the run ends with step_collapse (README, validity limits).',
  }),
  active_layer: choice({
    choices: ['uniform', 'fixed_column', 'ionization'],
    default: 'ionization',
    description:
      'Which MRI-active column Sigma_a the transport uses: "uniform" = the whole column is active; ' +
      '"fixed_column" = an active layer of sigma_active_face_g_cm2 on each face (Gammie 1996); ' +
      '"ionization" = where X-rays, cosmic rays, radionuclides and FUV photons ionize the gas enough for the MRI ' +
      '(grain-free chemistry: dust would shrink the active layers; see `disksweep probe --help`).',
  }),
  sigma_active_face_g_cm2: num({
    unit: 'g cm^-2', default: 100, min: 0, max: 1e5,
    description: 'active_layer=fixed_column: active column per face; Sigma_a = 2x this.',
    source: 'Gammie 1996 used about 100 g cm^-2 (cosmic-ray penetration depth)',
  }),
  lx_erg_s: num({
    unit: 'erg s^-1', default: 1e30, min: 0, max: 1e33,
    description:
      'Stellar X-ray luminosity (lx_scaling=fixed). It drives the X-ray photoevaporative wind (xray_wind_scale) and, ' +
      'with active_layer=ionization, the X-ray ionization (spectrum: xray_spectrum; Bai & Goodman 2009 fit to Igea & ' +
      'Glassgold 1999, proportional to L_X and to (r/AU)^-2.2, from both faces). 0 = no X-rays.',
    source: 'common practice: young solar-mass stars have L_X ~ 1e29-1e31 erg/s (Preibisch et al. 2005; from memory)',
  }),
  xray_spectrum: choice({
    choices: ['5kev', '3kev'],
    default: '5kev',
    description:
      'active_layer=ionization: temperature kT_X of the thermal X-ray spectrum, picking the coefficient row of the ' +
      'Bai & Goodman (2009, eq. 21) fit: "5kev" or "3kev" (the harder spectrum reaches deeper columns).',
  }),
  zeta_cr_s: num({
    unit: 's^-1', default: 1e-17, min: 0, max: 1e-13,
    description:
      'active_layer=ionization: interstellar cosmic-ray ionization rate per H2; each face gives all of it, ' +
      'attenuated as exp(-Sigma_face/96 g cm^-2) (Umebayashi & Nakano 1981), and the faces add. Lower it where ' +
      'stellar winds exclude cosmic rays.',
    source: 'Umebayashi & Nakano 1981',
  }),
  zeta_al26_s: num({
    unit: 's^-1', default: 7.6e-19, min: 0, max: 1e-15,
    description:
      'active_layer=ionization: ionization rate per H2 by 26Al at t = 0, decaying with the 1.03 Myr mean life ' +
      '(Umebayashi & Nakano 2009). 0 = no 26Al.',
    source: 'Umebayashi & Nakano 2009 (from memory)',
  }),
  zeta_k40_s: num({
    unit: 's^-1', default: 1.1e-22, min: 0, max: 1e-18,
    description: 'active_layer=ionization: ionization rate per H2 by long-lived 40K, constant (Umebayashi & Nakano 2009).',
    source: 'Umebayashi & Nakano 2009 (from memory)',
  }),
  sigma_fuv_face_g_cm2: num({
    unit: 'g cm^-2', default: 0.03, min: 0, max: 10,
    description:
      'active_layer=ionization: column of the FUV-ionized surface layer on each face, where far-ultraviolet photons ' +
      'from the star or nearby massive stars ionize carbon and sulphur (Perez-Becker & Chiang 2011). 0 = no layer.',
    source: 'Perez-Becker & Chiang 2011: 0.01-0.1 g cm^-2 (from memory)',
  }),
  x_e_fuv: num({
    unit: '1', default: 1e-5, min: 1e-12, max: 1e-2, logScale: true,
    description: 'active_layer=ionization: electron fraction n_e/n_H2 inside the FUV layer.',
    source: 'Perez-Becker & Chiang 2011: 1e-5 to 1e-4 (from memory); the lower end',
  }),
  ion_chemistry: choice({
    choices: ['molecular', 'metals'],
    default: 'molecular',
    description:
      'active_layer=ionization: recombination chemistry (grain-free). "molecular" = molecular ions with dissociative ' +
      'recombination 3e-6 T^-1/2 cm^3/s; "metals" = plus metal atoms of abundance x_metal with charge transfer and ' +
      'radiative recombination (Oppenheimer & Dalgarno 1974).',
  }),
  x_metal: num({
    unit: '1', default: 1e-8, min: 0, max: 1e-4,
    description: 'ion_chemistry=metals: gas-phase metal abundance per H2 (Mg-like atoms; most metals sit in grains).',
    source: 'demo choice: solar Mg (8e-5 per H2, Asplund et al. 2009) depleted about 1e4-fold',
  }),
  thermal_ionization: choice({
    choices: ['threshold', 'saha', 'none'],
    default: 'threshold',
    description:
      'active_layer=ionization: how hot gas becomes active. "threshold" = the whole column is active above t_mri_k ' +
      '(blended over +/- t_mri_halfwidth_k so alpha does not jump); "saha" = potassium and sodium ionized by the Saha ' +
      'equation join the chemistry by charge neutrality (slow: the whole hot column switches on at once, each step is ' +
      'iterated; the default infall model takes ~15 000 steps and minutes); "none" = no thermal ionization.',
  }),
  t_mri_k: num({
    unit: 'K', default: 1000, min: 300, max: 3000,
    description: 'thermal_ionization=threshold: temperature above which the whole column is MRI-active.',
    source: 'common practice: alkali metals ionize thermally near 1000 K (Umebayashi 1983; Gammie 1996)',
  }),
  activity_temperature: choice({
    choices: ['quiescent', 'midplane'],
    default: 'quiescent',
    description:
      'active_layer=ionization: the temperature the thermal switch (or the Saha alkali ions) sees. "quiescent" = ' +
      'the midplane temperature the column would have with alpha_dead (plus GI) transport: a column cannot keep ' +
      'itself active by its own MRI heating, so the inner dead-zone edge is a steady front (no thermal-viscous ' +
      'cycles, fast); "midplane" = the actual midplane temperature: self-sustained activity and its cycles, followed ' +
      'step by step (slow: the default infall model needs millions of steps).',
  }),
  t_mri_halfwidth_k: num({
    unit: 'K', default: 25, min: 0, max: 500,
    description: 'thermal_ionization=threshold: half-width of the smooth blend around t_mri_k (0 = a step).',
  }),
  mri_criterion: choice({
    choices: ['reynolds', 'elsasser'],
    default: 'reynolds',
    description:
      'active_layer=ionization: where gas counts as active. "reynolds" = magnetic Reynolds number c_s H/eta above ' +
      'reynolds_crit; "elsasser" = Ohmic Elsasser number v_A^2/(eta Omega) above elsasser_crit, with the field ' +
      'uniform in height at midplane plasma beta_midplane. eta = 234 T^1/2/x_e cm^2/s.',
  }),
  reynolds_crit: num({
    unit: '1', default: 100, min: 1e-6, max: 1e12, logScale: true,
    description: 'mri_criterion=reynolds: critical magnetic Reynolds number (Gammie 1996 used about 1).',
    source: 'Fleming, Stone & Hawley 2000: with a net vertical field MRI turbulence survives down to Re ~ 100 (from memory)',
  }),
  elsasser_crit: num({
    unit: '1', default: 1, min: 1e-6, max: 1e6, logScale: true,
    description: 'mri_criterion=elsasser: critical Ohmic Elsasser number.',
    source: 'common practice: Lambda ~ 1 (Turner, Sano & Dziourkevitch 2007)',
  }),
  beta_midplane: num({
    unit: '1', default: 1e4, min: 1, max: 1e12, logScale: true,
    description: 'mri_criterion=elsasser: plasma beta 8 pi P/B^2 at the midplane (field uniform in height).',
    source: 'demo choice',
  }),
  n_z: num({
    unit: '1', default: 32, min: 4, max: 4096, integer: true,
    description:
      'active_layer=ionization: heights sampled per face, logarithmic in column from 1e-4 g cm^-2 to the midplane; ' +
      'the active-layer boundary between them is found by root-finding.',
  }),
  sigma_ion_floor_g_cm2: num({
    unit: 'g cm^-2', default: 0.05, min: 0, max: 100,
    description: 'active_layer=ionization: columns at or below this skip the ionization kernel and count as active.',
    source: 'demo choice: thinner than the FUV layers of both faces together at the default (2 x 0.03)',
  }),
  ion_refresh_tol: num({
    unit: '1', default: 0.01, min: 0, max: 1,
    description:
      'active_layer=ionization: a cell re-runs the ionization kernel when its Sigma or T changed by more than this ' +
      '(relative) since its last evaluation, all cells when M_* or the radionuclide rate did; 0 = every time.',
    source:
      '`npm run bench` (section ionization; model 0.7.0), default infall model, 0.01 against 0: dead-zone edges ' +
      'within one cell (the inner one a cell apart at 0.5 Myr, and with it Mdot_* 1.1 % and L_acc 1.0 % apart); the ' +
      'other outputs within 0.9 %, except those read in the cell at 1 AU, at the foot of the thermal blend there ' +
      '(Sigma_a 17 %, active share 2.5 %; step_change 0.05 against 0.045 alone moves them 7.9 % and 1.4 %). ' +
      'Smaller tolerances do no better (0.002: Sigma_a at 1 AU 17 %, Mdot_* 0.99 %).',
  }),
  gi_transport: choice({
    choices: ['on', 'off'],
    default: 'on',
    description: 'Gravitational-instability transport where Toomre Q < q_crit.',
  }),
  q_crit: num({
    unit: '1', default: 2, min: 1, max: 10,
    description:
      'Toomre Q below which alpha_GI = 0.01 [(q_crit/Q)^2 - 1] is added (Lin & Pringle 1987 form with the ' +
      'normalisation of Armitage, Livio & Pringle 2001; from memory).',
  }),
  alpha_gi_max: num({
    unit: '1', default: 0.1, min: 0, max: 1,
    description: 'Cap on the gravitational-instability alpha.',
    source: 'common practice: local GI saturates near alpha ~ 0.1 (Gammie 2001 fragmentation boundary)',
  }),
  kappa_cm2_g: num({
    unit: 'cm^2 g^-1', default: 1, min: 0, max: 1e4,
    description: 'Constant Rosseland-mean opacity for viscous heating; 0 switches viscous heating off.',
    source: 'common practice: dusty gas below ~150 K has kappa of order 1 cm^2/g',
  }),
  thermal_inertia: choice({
    choices: ['off', 'on'],
    default: 'off',
    description:
      'Midplane temperature: "off" = thermal equilibrium at every step; "on" = the one-zone energy equation, ' +
      'T relaxing toward equilibrium on the cooling time 3 kappa Sigma^2 c_v/(16 sigma_SB T^3) (~1/(alpha Omega)), ' +
      'so a column that crosses the MRI threshold heats or cools over that time (matters with ' +
      'activity_temperature=midplane).',
  }),
  t_floor_k: num({
    unit: 'K', default: 10, min: 0, max: 1000,
    description: 'Temperature floor (ambient cloud radiation) added in T^4.',
  }),
  l_phot_lsun: num({
    unit: 'L_sun', default: 1, min: 0, max: 1e4,
    description:
      'Photospheric luminosity of the star. Irradiation uses L_* = L_phot + L_acc (accretion_luminosity), ' +
      'T_irr = 280 K (R/AU)^-1/2 (L_*/L_sun)^1/4 (Hayashi 1981).',
    source: 'common practice: a 1 Myr old solar-mass star has L of about 1-2 L_sun',
  }),
  accretion_luminosity: choice({
    choices: ['on', 'off'],
    default: 'on',
    description:
      'Add the accretion luminosity L_acc = G M_* Mdot_*/R_* (1 - R_*/R_in) to the irradiating luminosity ' +
      '(Gullbring et al. 1998), with R_* = r_star_rsun, R_in = r_in_au and Mdot_* of the previous step.',
  }),
  l_acc_memory_yr: num({
    unit: 'yr', default: 1000, min: 0, max: 1e6,
    description:
      'accretion_luminosity=on: L_acc in the irradiation relaxes toward its instantaneous value on this time ' +
      '(0 = at once). It keeps a dead-zone edge set by the irradiation from flickering with its own accretion.',
    source: 'numerical choice; shorter than any viscous time on the grid (the disk thermal time is ~ years to 1e3 yr)',
  }),
  lx_scaling: choice({
    choices: ['fixed', 'l_phot'],
    default: 'fixed',
    description: 'X-ray luminosity: "fixed" = lx_erg_s; "l_phot" = lx_over_lphot x l_phot_lsun (used by winds and ionization alike).',
  }),
  lx_over_lphot: num({
    unit: '1', default: 3e-4, min: 0, max: 1e-2,
    description: 'lx_scaling=l_phot: L_X / L_phot.',
    source: 'common practice: young solar-mass stars have log(L_X/L_bol) of about -3.5 (Preibisch et al. 2005; from memory)',
  }),
  xray_wind_scale: num({
    unit: '1', default: 1, min: 0, max: 100,
    description:
      'Internal X-ray photoevaporation (Owen, Ercolano & Clarke 2011; Owen, Clarke & Ercolano 2012 fits, primordial ' +
      'and inner-hole profiles): factor on the published rate, ~6e-9 (L_X/1e30 erg/s)^1.14 M_sun/yr. 0 = off.',
    source: 'on by default: the fits come from models irradiated by X-rays and EUV together',
  }),
  euv_wind_scale: num({
    unit: '1', default: 0, min: 0, max: 100,
    description:
      'Internal EUV photoevaporation: factor on the diffuse-field rate 4.4e-10 (phi_euv_s/1e41)^1/2 (M_*/M_sun)^1/2 ' +
      'M_sun/yr outside R_g = G M_*/(10 km/s)^2 (Hollenbach et al. 1994; Clarke, Gendrin & Sotomayor 2001) and on the ' +
      'direct-field rate from the rim of an inner cavity (Alexander, Clarke & Pringle 2006). 0 = off (the X-ray fits ' +
      'already include EUV heating).',
  }),
  phi_euv_s: num({
    unit: 's^-1', default: 1e41, min: 0, max: 1e46, logScale: true,
    description: 'euv_wind_scale > 0: ionizing (EUV) photons emitted by the star per second.',
    source: 'common practice: 1e41-1e42 s^-1 for T Tauri stars (Alexander, Clarke & Pringle 2005; from memory)',
  }),
  fuv_wind_mdot_msun_yr: num({
    unit: 'M_sun/yr', default: 0, min: 0, max: 1e-4,
    description:
      'External FUV photoevaporation by a nearby cluster (Adams et al. 2004): total rate, taken from the disk outside ' +
      '0.2 G M_*/a_s^2 (a_s of gas at t_fuv_k) in proportion to its mass. 0 = off.',
    source: 'off by default: it depends on the cluster environment (1e-9 to 1e-6 M_sun/yr near OB stars)',
  }),
  t_fuv_k: num({
    unit: 'K', default: 1000, min: 10, max: 1e4,
    description: 'fuv_wind_mdot_msun_yr > 0: temperature of the FUV-heated surface gas, which sets where the flow starts.',
    source: 'Adams et al. 2004: 100-3000 K depending on the field (from memory)',
  }),
  n_h_cavity_cm2: num({
    unit: 'cm^-2', default: 1e22, min: 1e15, max: 1e26, logScale: true,
    description:
      'Midplane hydrogen column from r_in_au outward below which the star sees the outer disk directly: an inner ' +
      'cavity is open and the winds switch to their inner-hole forms.',
    source: 'Owen, Clarke & Ercolano 2012: X-rays reach the rim once the inner column is below ~1e22 cm^-2 (from memory)',
  }),
  star_mass: choice({
    choices: ['growing', 'fixed'],
    default: 'growing',
    description: 'Whether accretion adds to the stellar mass (and so to Omega and j everywhere) or M_* is held fixed.',
  }),
  k2_star: num({
    unit: '1', default: 0.205, min: 0.01, max: 0.4,
    description: 'Stellar gyration constant k^2 in J_spin = k^2 M R^2 Omega; 0.205 is an n = 1.5 polytrope.',
    source: 'n = 1.5 polytrope (Motz 1952; from memory)',
  }),
  r_star_rsun: num({
    unit: 'R_sun', default: 2, min: 0.1, max: 20,
    description: 'Stellar radius for the spin angular momentum.',
    source: 'common practice: T Tauri stars have R of about 2 R_sun',
  }),
  p_star_days: num({
    unit: 'd', default: 8, min: 0.1, max: 1000,
    description: 'Disk-locked rotation period of the star (capped at breakup).',
    source: 'common practice: young accreting stars rotate in about a week (disk locking)',
  }),
  t_end_myr: num({
    unit: 'Myr', default: 5, min: 0, max: 100, minExclusive: true,
    description: 'End of the run, counted from collapse onset (or from the given disk).',
  }),
  checkpoints_myr: list({
    unit: 'Myr', default: [0.1, 0.3, 0.5, 1, 2, 3, 5], min: 0, max: 100,
    description: 'Times at which the full set of outputs is recorded; those after t_end_myr are dropped.',
  }),
  f_mass_star: num({
    unit: '1', default: 0.99, min: 0, max: 1, minExclusive: true,
    description: 'Solar-like split: the star must hold at least this share of the mass.',
    source: 'the Sun holds about 99.86 % of the solar system mass (from memory)',
  }),
  f_j_disk_max: num({
    unit: '1', default: 0.02, min: 0, max: 1, minExclusive: true,
    description: 'Solar-like split: the star spin may hold at most this share of the angular momentum.',
    source: 'the Sun spin holds about 0.6 % of the solar system angular momentum (from memory)',
  }),
  disk_end_mass_msun: num({
    unit: 'M_sun', default: 1e-5, min: 0, max: 1,
    description: 'Disk lifetime: the disk has ended (after infall) once M_disk falls below this ...',
    source: 'common practice: below ~1e-5 M_sun of gas a disk is not detected',
  }),
  disk_end_mdot_msun_yr: num({
    unit: 'M_sun/yr', default: 1e-11, min: 0, max: 1e-6,
    description: '... or once the accretion rate onto the star falls below this.',
    source: 'common practice: accretion below ~1e-11 M_sun/yr is not detected',
  }),
  theta: num({
    unit: '1', default: 1, min: 0.5, max: 1,
    description:
      'Implicitness of the time step: 1 = backward Euler (robust, the default), 0.5 = Crank-Nicolson (2nd order ' +
      'in time, but it does not damp the stiff inner cells: runs with infall need many more steps; use it for ' +
      'convergence studies, or a value slightly above 0.5).',
  }),
  newton_iterations: num({
    unit: '1', default: 0, min: 0, max: 20, integer: true,
    description:
      'Extra Newton iterations per step: nu and its flux linearisation recomputed about the latest Sigma (0 = one ' +
      'linearised solve per step). Any value above 0 replaces the secant iterations of the Saha branch ' +
      '(thermal_ionization=saha), which then runs unchecked Newton iterations instead.',
  }),
  step_change: num({
    unit: '1', default: 0.05, min: 1e-4, max: 1,
    description: 'Target for max |dSigma| / (Sigma + 1e-6 Sigma_max) per step; smaller is more accurate.',
  }),
  max_steps: num({
    unit: '1', default: 200000, min: 10, max: 1e8, integer: true,
    description: 'Step cap; a run that needs more ends with status step_limit.',
  }),
  n_series: num({
    unit: '1', default: 50, min: 2, max: 2000, integer: true,
    description: 'Samples of the compact time series (evenly spaced in time up to t_end_myr).',
  }),
} as const satisfies Record<string, ParamDescriptor>;

export type ParamName = keyof typeof PARAMS;
export const PARAM_NAMES = Object.keys(PARAMS) as ParamName[];

function rangeText(p: NumberParam | ListParam): string {
  const lo = 'minExclusive' in p && p.minExclusive ? '(' : '[';
  const hi = 'maxExclusive' in p && p.maxExclusive ? ')' : ']';
  return `${lo}${p.min}, ${p.max}${hi}`;
}

/** Human-readable allowed values, used by `--list` and by every range error. */
export function allowedText(p: ParamDescriptor): string {
  if (p.kind === 'choice') return `one of ${p.choices.map((c) => `"${c}"`).join(', ')}`;
  const unit = p.unit === '1' ? '' : ` ${p.unit}`;
  const integer = p.kind === 'number' && p.integer ? 'an integer in ' : '';
  const list = p.kind === 'list' ? 'a list of values in ' : '';
  return `${list}${integer}${rangeText(p)}${unit}`;
}

function inRange(p: NumberParam | ListParam, v: number): boolean {
  const minOk = 'minExclusive' in p && p.minExclusive ? v > p.min : v >= p.min;
  const maxOk = 'maxExclusive' in p && p.maxExclusive ? v < p.max : v <= p.max;
  return Number.isFinite(v) && minOk && maxOk;
}

/** A received value as the user would recognise it (JSON would print Infinity and NaN as null). */
const shown = (v: unknown): string => (typeof v === 'number' ? String(v) : JSON.stringify(v) ?? String(v));

/** The zod schema of one number descriptor (range, integer, default), also used for inputs outside the table. */
export function numberParamSchema(p: NumberParam) {
  return z
    .number({ error: (iss) => `expected a number, ${allowedText(p)} (got ${shown(iss.input)})` })
    .superRefine((v, ctx) => {
      if (!inRange(p, v) || (p.integer === true && !Number.isInteger(v))) {
        ctx.addIssue({ code: 'custom', message: `must be ${allowedText(p)} (got ${v})` });
      }
    })
    .default(p.default);
}

function listSchema(p: ListParam) {
  return z
    .array(z.number(), { error: (iss) => `expected a list of numbers (got ${shown(iss.input)})` })
    .min(1, { error: 'must hold at least one value' })
    .superRefine((values, ctx) => {
      values.forEach((v, i) => {
        if (!inRange(p, v)) ctx.addIssue({ code: 'custom', path: [i], message: `must be ${allowedText(p)} (got ${v})` });
        if (i > 0 && v <= values[i - 1]) {
          ctx.addIssue({ code: 'custom', path: [i], message: `must increase strictly (got ${values[i - 1]} then ${v})` });
        }
      });
    })
    .default([...p.default]);
}

function choiceSchema(p: ChoiceParam) {
  const [first, ...rest] = p.choices;
  return z
    .enum([first, ...rest] as [string, ...string[]], {
      error: (iss) => `must be ${allowedText(p)} (got ${shown(iss.input)})`,
    })
    .default(p.default);
}

type SchemaFor<P> = P extends NumberParam
  ? ReturnType<typeof numberParamSchema>
  : P extends ListParam
    ? ReturnType<typeof listSchema>
    : ReturnType<typeof choiceSchema>;

function schemaFor<P extends ParamDescriptor>(p: P): SchemaFor<P> {
  switch (p.kind) {
    case 'number':
      return numberParamSchema(p) as SchemaFor<P>;
    case 'list':
      return listSchema(p) as SchemaFor<P>;
    case 'choice':
      return choiceSchema(p) as SchemaFor<P>;
  }
}

const shape = Object.fromEntries(PARAM_NAMES.map((name) => [name, schemaFor(PARAMS[name])])) as {
  [K in ParamName]: SchemaFor<(typeof PARAMS)[K]>;
};

/** Parameters after defaults are filled in; user-facing units. */
export type ModelParams = {
  [K in ParamName]: (typeof PARAMS)[K] extends ChoiceParam
    ? (typeof PARAMS)[K]['choices'][number]
    : (typeof PARAMS)[K] extends ListParam
      ? number[]
      : number;
};

/** Cross-parameter rules; each message names the parameters involved and their values. */
function checkConsistency(p: z.infer<z.ZodObject<typeof shape>>, ctx: z.RefinementCtx): void {
  if (p.alpha_dead > p.alpha_active) {
    ctx.addIssue({
      code: 'custom', path: ['alpha_dead'],
      message: `must not exceed alpha_active = ${p.alpha_active} (got ${p.alpha_dead})`,
    });
  }
  if (p.r_out_au < 10 * p.r_in_au) {
    ctx.addIssue({
      code: 'custom', path: ['r_out_au'],
      message: `must be at least 10 x r_in_au = ${10 * p.r_in_au} AU (got ${p.r_out_au})`,
    });
  }
  // The star must fit inside the inner edge, or the accreted specific angular momentum (G M R_in)^1/2 is
  // smaller than the star's own surface value and the spin bookkeeping stops making sense.
  const rStarAu = (p.r_star_rsun * R_SUN_CGS) / AU_CGS;
  if (rStarAu >= p.r_in_au) {
    ctx.addIssue({
      code: 'custom', path: ['r_star_rsun'],
      message: `star (${rStarAu.toPrecision(3)} AU) must lie inside r_in_au = ${p.r_in_au} AU (got ${p.r_star_rsun} R_sun)`,
    });
  }
  if (p.initial_state === 'disk' && (p.r1_au <= p.r_in_au || p.r1_au >= p.r_out_au / 10)) {
    ctx.addIssue({
      code: 'custom', path: ['r1_au'],
      message: `must lie between r_in_au = ${p.r_in_au} and r_out_au/10 = ${p.r_out_au / 10} AU (got ${p.r1_au})`,
    });
  }
}

export const modelParamsSchema = z
  .object(shape)
  .strict()
  .superRefine(checkConsistency)
  .transform((p) => ({ ...p, checkpoints_myr: p.checkpoints_myr.filter((t) => t <= p.t_end_myr) }));

/** Turn zod issues into one line per field: `alpha_active: must be ... (got 2)`. */
export function issuesToDetails(error: z.ZodError, prefix = ''): string[] {
  return error.issues.map((iss) => {
    if (iss.code === 'unrecognized_keys') {
      return iss.keys.map((k) => `${prefix}${k}: unknown parameter${suggestionFor(k)}`).join('\n');
    }
    const path = iss.path.map((seg) => (typeof seg === 'number' ? `[${seg}]` : String(seg))).join('.');
    return `${prefix}${path.replace(/\.\[/g, '[')}: ${iss.message}`;
  });
}

/**
 * Nearest name by edit distance, for "did you mean" hints: ` (did you mean x?)`, or '' when nothing is close.
 * Candidates default to the parameter names; the query grammar passes its own whitelist.
 */
export function suggestionFor(name: string, candidates: readonly string[] = PARAM_NAMES): string {
  let best = '';
  let bestD = Infinity;
  for (const candidate of candidates) {
    const d = editDistance(name, candidate);
    if (d < bestD) [best, bestD] = [candidate, d];
  }
  return bestD <= Math.max(2, Math.floor(name.length / 3)) ? ` (did you mean ${best}?)` : '';
}

function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0];
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = row[j];
      row[j] = Math.min(row[j] + 1, row[j - 1] + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1));
      prev = tmp;
    }
  }
  return row[b.length];
}

/** Validate raw parameters (unknown input from a file, a flag or a queue) and fill in defaults. */
export function parseModelParams(raw: unknown): ModelParams {
  const result = modelParamsSchema.safeParse(raw);
  if (!result.success) {
    const details = issuesToDetails(result.error).flatMap((d) => d.split('\n'));
    const unknown = details.some((d) => d.includes('unknown parameter'));
    throw new DisksweepError(
      unknown ? 'input/unknown-parameter' : 'input/invalid-parameter',
      `invalid model parameters (${details.length} problem${details.length === 1 ? '' : 's'}); ` +
        'run `disksweep model --list` for names, units and ranges',
      { details },
    );
  }
  return result.data as ModelParams;
}

/** Every parameter at its default. */
export const DEFAULT_PARAMS: ModelParams = parseModelParams({});
