/**
 * One vertical column through the ionization kernel, for `disksweep probe`: the sampled profile from a face
 * to the midplane (height, column, density, ζ by source, x_e, η, activity number, active or dead), the
 * ionization active column, and the Σ_a the model's transport would use for the same column (the same
 * provider, with the thermal switch and the surface-density floor). Pure: validated user-facing inputs in,
 * user-facing units out.
 */
import { G_CGS } from '../shared/constants.js';
import type { ModelParams } from '../shared/model-params.js';
import type { ProbeInputs } from '../shared/probe-params.js';
import { MODEL_VERSION } from '../shared/model-version.js';
import { auToCm, cmToAu, msunToG, myrToS } from '../shared/units.js';
import { columnProfile, prepareColumn, solveActiveColumn } from './kernels/ionization/active-column.js';
import { createIonizationActiveColumn } from './kernels/ionization/ionization-active-layer.js';
import { radionuclideRate } from './kernels/ionization/radionuclide-rate.js';
import { thermalWeight } from './kernels/ionization/thermal-activation.js';
import { ionizationOptionsFromParams } from './model-setup.js';

export interface ProbeRow {
  z_au: number;
  z_over_h: number;
  column_g_cm2: number;
  rho_g_cm3: number;
  n_h2_cm3: number;
  zeta_x_s: number;
  zeta_cr_s: number;
  zeta_r_s: number;
  zeta_s: number;
  x_e: number;
  eta_cm2_s: number;
  /** Re or Λ, whichever `criterion` names. */
  activity: number;
  active: boolean;
}

export interface ProbeResult {
  model_version: string;
  inputs: ProbeInputs;
  criterion: { name: 'reynolds' | 'elsasser'; threshold: number; beta_midplane: number | null };
  chemistry: string;
  thermal_ionization: string;
  scale_height_au: number;
  rho_midplane_g_cm3: number;
  zeta_radio_s: number;
  /** From the face (smallest column) to the midplane. */
  profile: ProbeRow[];
  /** What ionization alone makes active, per face and both faces. */
  sigma_active_ion_face_g_cm2: number;
  sigma_active_ion_g_cm2: number;
  ionization_midplane_dead: boolean;
  /** Weight of the thermal threshold blend (0 unless thermal_ionization = threshold near or above t_mri_k). */
  thermal_weight: number;
  /** True when Σ is at or below sigma_ion_floor_g_cm2: the model counts the column as active unevaluated. */
  below_floor: boolean;
  /** The Σ_a the model's transport uses for this column (both faces), and per face. */
  sigma_active_g_cm2: number;
  sigma_active_face_g_cm2: number;
  midplane_dead: boolean;
}

export function runProbe(p: ModelParams, q: ProbeInputs): ProbeResult {
  const options = ionizationOptionsFromParams(p, 1);
  const radius = auToCm(q.r_au);
  const omega = Math.sqrt((G_CGS * msunToG(q.m_star_msun)) / radius ** 3);
  const time = myrToS(q.t_myr);
  const rn = options.radionuclides;
  const zetaRadio = radionuclideRate(rn.zetaAl26, rn.zetaK40, rn.meanLife, time);
  const state = { sigma: q.sigma_g_cm2, temperature: q.t_k, radius, omega };
  const ctx = prepareColumn(state, { ...options.sources, zetaRadio }, options.physics);
  const ion = solveActiveColumn(ctx, options.nz);
  // The model's own rule, evaluated fresh (tolerance 0, one cell): what the transport would use.
  const provider = createIonizationActiveColumn({ ...options, refreshTolerance: 0 });
  const used = Math.min(provider({ ...state, time, index: 0 }), q.sigma_g_cm2);
  const rows = columnProfile(ctx, options.nz).map(
    (v): ProbeRow => ({
      z_au: cmToAu(v.z),
      z_over_h: v.z / ctx.scaleHeight,
      column_g_cm2: v.faceColumn,
      rho_g_cm3: v.rho,
      n_h2_cm3: v.nH2,
      zeta_x_s: v.zetaX,
      zeta_cr_s: v.zetaCr,
      zeta_r_s: v.zetaRadio,
      zeta_s: v.zeta,
      x_e: v.xe,
      eta_cm2_s: v.eta,
      activity: v.activity,
      active: v.active,
    }),
  );
  const criterion = options.physics.criterion;
  return {
    model_version: MODEL_VERSION,
    inputs: q,
    criterion: {
      name: criterion.kind,
      threshold: criterion.threshold,
      beta_midplane: criterion.kind === 'elsasser' ? criterion.betaMidplane : null,
    },
    chemistry: p.ion_chemistry,
    thermal_ionization: p.thermal_ionization,
    scale_height_au: cmToAu(ctx.scaleHeight),
    rho_midplane_g_cm3: ctx.rho0,
    zeta_radio_s: zetaRadio,
    profile: rows,
    sigma_active_ion_face_g_cm2: ion.sigmaActiveFace,
    sigma_active_ion_g_cm2: ion.sigmaActive,
    ionization_midplane_dead: ion.midplaneDead,
    thermal_weight: options.thermal.kind === 'threshold' ? thermalWeight(q.t_k, options.thermal.tMri, options.thermal.halfWidth) : 0,
    below_floor: q.sigma_g_cm2 <= options.sigmaFloor,
    sigma_active_g_cm2: used,
    sigma_active_face_g_cm2: 0.5 * used,
    midplane_dead: used < q.sigma_g_cm2,
  };
}
