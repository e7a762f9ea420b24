/**
 * The ionization-based Σ_a provider for layered transport (Gammie 1996): each cell's active column from the
 * ionization kernel (active-column.ts), with the thermal threshold switch (thermal-activation.ts) on top.
 *
 * Cost control, keeping a run a pure function of its parameters:
 * - Cells below a surface-density floor skip the kernel and count as active (a column that thin is ionized
 *   through by X-rays and FUV photons at any radius of interest).
 * - Above T_MRI + ΔT (threshold switch) the whole column is active and the kernel is skipped.
 * - Otherwise a cell's ionization Σ_a is re-evaluated only when its Σ or T changed by more than a relative
 *   tolerance since its last evaluation, and every cell is when M_* (read from Ω²R³/G, so the provider needs no
 *   extra input) or the radionuclide rate changed by more than it since the last such global refresh. L_X is a
 *   constant of the run. Between refreshes a cell keeps its Σ_a,ion in g cm^-2 (a layer's depth is set by
 *   the penetration of the rays, not by the total column), or "all of it" if it was fully active.
 * Which temperature: with `activityTemperature = 'quiescent'` (the default) the thermal sources of activity — the
 * threshold switch, or the alkali ions of the Saha branch — see
 * the temperature the column would have with dead-zone transport only (α_dead plus gravitational instability;
 * transport-coefficients.ts), not the midplane temperature the column's own MRI heating raises. Why: with the
 * midplane temperature, a column between the two ends of the thermal S-curve is bistable — dead and cool, or
 * active and kept hot by its own dissipation — and a one-zone cell there cycles (thermal–viscous instability).
 * Near the inner dead-zone edge of the default infall model (0.2–0.35 AU, Σ ~ 10³–10⁴ g cm⁻²) a cell fills
 * from its neighbours in 2–30 yr, so cells wider than the front width H cycle every few decades; following
 * that needs ~10⁵ steps per 10⁴ yr. The quiescent temperature depends on Σ (and R, t) alone, so Σ_a and
 * α_eff rise monotonically with Σ: νΣ is monotonic and the edge is a steady, regulated front. What is lost:
 * thermal–viscous cycles and MRI outbursts sustained by their own heating (GI heating still counts, so a pile-up
 * that heats by GI is activated, but steadily). 'midplane' keeps the self-heated switch, with its cycles and
 * its cost. With the Saha branch the whole kernel (recombination, η, the scale height and density of the
 * column) sees the quiescent temperature too: there the alkali ions make x_e nearly uniform with height
 * (x_e ∝ ρ^{-1/2}), so Re = c_s H/η ≈ Re_mid (ρ₀/ρ)^{1/2} is nearly flat through the column and the
 * boundary moves across all of it for a small change of Re_mid ∝ T^{3/4}. With the midplane temperature there, a
 * column at Σ ~ 5000 g cm⁻² near 0.17 AU of the default infall model gave Σ_a = 480, 1150 or all 4890 for Σ
 * 2 % lower, equal or higher, and ended fully active or partly so depending on the temperature it started from:
 * the bistability the quiescent temperature exists to remove. To keep that temperature continuous, the Saha
 * branch asks for it at every midplane temperature (`quiescentFrom` 0).
 * Grain-free, vertically isothermal: see README validity limits.
 * The cache lives in the provider, `reset` empties it, and the integrator calls `reset` at the start of a run;
 * the calls come in the same order in every run, so the same parameters give the same numbers, bit for bit.
 */
import { G_CGS } from '../../../shared/constants.js';
import type { ActiveColumn, ActiveLayerInput, ActiveLayerProvider } from '../disk/active-layer.js';
import { emptyPoint, prepareColumn, solveActiveColumn, type IonizationPhysics, type IonizationSources } from './active-column.js';
import { radionuclideRate } from './radionuclide-rate.js';
import { blendThermal, thermalWeight } from './thermal-activation.js';

export interface RadionuclideSetup {
  /** ²⁶Al rate at t = 0, s^-1. */
  readonly zetaAl26: number;
  /** ⁴⁰K rate, s^-1. */
  readonly zetaK40: number;
  /** ²⁶Al mean life, s; the decay runs from the run's t = 0 (collapse onset, or the given disk). */
  readonly meanLife: number;
}

export type ThermalSwitch =
  | { readonly kind: 'threshold'; readonly tMri: number; readonly halfWidth: number }
  | { readonly kind: 'none' };

export interface IonizationLayerOptions {
  readonly nCells: number;
  readonly sources: Omit<IonizationSources, 'zetaRadio'>;
  readonly radionuclides: RadionuclideSetup;
  readonly physics: IonizationPhysics;
  readonly thermal: ThermalSwitch;
  /** Height samples that bracket the boundary. */
  readonly nz: number;
  /** Columns at or below this, g cm^-2, count as active without evaluation. */
  readonly sigmaFloor: number;
  /** Relative change of Σ, T, M_* or ζ_R that triggers a re-evaluation; 0 = whenever anything changed. */
  readonly refreshTolerance: number;
  /**
   * Which temperature the thermal switch and the Saha ions of the kernel see: 'quiescent' = the dead column's
   * (`ActiveLayerInput.quiescentTemperature`), 'midplane' = the midplane temperature itself. Under the threshold
   * switch, recombination, η and the column's scale height see the midplane temperature (with x_e falling by
   * orders of magnitude with depth, their √T-like dependence moves the boundary little); with the Saha branch
   * they see the quiescent one as well (see above).
   */
  readonly activityTemperature: 'quiescent' | 'midplane';
}

/** Work counters of one run, for the benchmark. */
export interface IonizationLayerStats {
  calls: number;
  refreshes: number;
  evaluations: number;
  globalRefreshes: number;
}

export type IonizationActiveColumn = ActiveColumn & { readonly stats: IonizationLayerStats };

/**
 * Temperature from which the alkali ions can matter: in Saha equilibrium they give x_e < 1e-14 at 800 K and
 * n ~ 1e14 cm⁻³ (saha.ts), three orders below the ~1e-11 an active midplane needs at 1 AU with Re_crit ~ 100.
 */
const SAHA_STEEP_FROM_K = 800;

const changed = (now: number, then: number, tol: number): boolean => !(Math.abs(now - then) <= tol * Math.abs(then));

export function createIonizationActiveColumn(o: IonizationLayerOptions): IonizationActiveColumn {
  const n = o.nCells;
  const lastSigma = new Float64Array(n);
  const lastTemperature = new Float64Array(n);
  const lastGeneration = new Int32Array(n);
  const ionActive = new Float64Array(n);
  const wasFull = new Uint8Array(n);
  const scratch = emptyPoint();
  const tol = o.refreshTolerance;
  const rn = o.radionuclides;
  const stats: IonizationLayerStats = { calls: 0, refreshes: 0, evaluations: 0, globalRefreshes: 0 };
  let generation = 0;
  let refGm = NaN;
  let refZetaRadio = NaN;
  // The sources at the last global refresh (ζ_R as of then), built once per refresh rather than once per kernel run.
  let sources: IonizationSources = { ...o.sources, zetaRadio: NaN };
  // ζ_R at the time of the last call: a coefficient pass asks for every cell at one time.
  let rateTime = NaN;
  let rateNow = NaN;
  const quiescent = o.activityTemperature === 'quiescent';
  const sahaQuiescent = quiescent && o.physics.alkalis !== null;

  const reset = (): void => {
    lastGeneration.fill(0);
    generation = 0;
    refGm = NaN;
    refZetaRadio = NaN;
    rateTime = NaN;
    stats.calls = stats.refreshes = stats.evaluations = stats.globalRefreshes = 0;
  };

  const column = (cell: ActiveLayerInput): number => {
    const { sigma, radius, omega, time, index } = cell;
    const switchTemperature = quiescent ? (cell.quiescentTemperature ?? cell.temperature) : cell.temperature;
    // The one temperature the kernel reads, and so the one its cached answer depends on: the quiescent one in the
    // Saha branch (see the header), else the midplane one. The threshold switch's weight is taken at every call,
    // outside the cache, so a change of the switch temperature alone re-runs nothing there.
    const kernelTemperature = sahaQuiescent ? switchTemperature : cell.temperature;
    stats.calls++;
    const gm = omega * omega * radius * radius * radius;
    if (time !== rateTime) {
      rateTime = time;
      rateNow = radionuclideRate(rn.zetaAl26, rn.zetaK40, rn.meanLife, time);
    }
    const zetaRadio = rateNow;
    // GM is read from each cell's Ω²R³, which differ in the last bits from cell to cell: a floor of 1e-12 keeps
    // tolerance 0 from treating that round-off as a change of M_* (and re-running every cell at every call).
    if (changed(gm, refGm, Math.max(tol, 1e-12)) || changed(zetaRadio, refZetaRadio, tol)) {
      refGm = gm;
      refZetaRadio = zetaRadio;
      sources = { ...o.sources, zetaRadio };
      generation++;
      stats.globalRefreshes++;
    }
    if (sigma <= o.sigmaFloor) return sigma;
    const w = o.thermal.kind === 'threshold' ? thermalWeight(switchTemperature, o.thermal.tMri, o.thermal.halfWidth) : 0;
    if (w >= 1) return sigma;
    let ion: number;
    // Where alkali ions can matter, Σ_a follows T steeply (x_e ∝ exp(−χ/2kT): ~25 % per 1 % of T at 1000 K), so
    // no cached value stands in, not even in the derivative probe: the flux linearisation must see dΣ_a/dΣ.
    const steep = o.physics.alkalis !== null && switchTemperature >= SAHA_STEEP_FROM_K;
    if (
      !steep &&
      lastGeneration[index] === generation &&
      (cell.derivativeProbe === true || (!changed(sigma, lastSigma[index], tol) && !changed(kernelTemperature, lastTemperature[index], tol)))
    ) {
      ion = wasFull[index] === 1 ? sigma : Math.min(ionActive[index], sigma);
    } else {
      const state = { sigma, temperature: kernelTemperature, thermalIonizationTemperature: switchTemperature, radius, omega };
      const ctx = prepareColumn(state, sources, o.physics);
      // The cell's last boundary, if it had one, brackets the new one in two evaluations most of the time.
      const hint = lastGeneration[index] > 0 && wasFull[index] === 0 && ionActive[index] > 0 ? 0.5 * ionActive[index] : NaN;
      const r = solveActiveColumn(ctx, o.nz, scratch, hint);
      stats.refreshes++;
      stats.evaluations += r.evaluations;
      lastGeneration[index] = generation;
      lastSigma[index] = sigma;
      lastTemperature[index] = kernelTemperature;
      ionActive[index] = r.sigmaActive;
      wasFull[index] = r.midplaneDead ? 0 : 1;
      ion = r.sigmaActive;
    }
    return blendThermal(sigma, ion, w);
  };
  // Below T_MRI − ΔT the quiescent temperature would change nothing under the thermal switch, so the midplane
  // temperature stands in for it there (and saves a second temperature solve per cell). The Saha branch needs it
  // at every temperature: its whole kernel sees it, and a switch from one temperature to the other at some
  // midplane temperature would make Σ_a jump there.
  const quiescentFrom = !quiescent
    ? undefined
    : o.thermal.kind === 'threshold'
      ? o.thermal.tMri - o.thermal.halfWidth
      : sahaQuiescent
        ? 0
        : undefined;
  return Object.assign(column, { reset, stats, quiescentFrom });
}

/** Σ_a from the ionization kernel: X-rays, cosmic rays, radionuclides, FUV; grain-free chemistry. */
export const ionizationActiveLayer: ActiveLayerProvider<IonizationLayerOptions> = {
  name: 'ionization',
  description: 'active column from the ionization and MRI-activity kernel (grain-free chemistry)',
  create: createIonizationActiveColumn,
};
