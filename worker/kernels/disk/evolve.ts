/**
 * The time integrator of one disk model: adaptive implicit steps of viscous transport with infall as a
 * source, a growing (or fixed) star, and exact mass and angular-momentum bookkeeping. It lands exactly on
 * every requested event time and hands the state to an observer there; it owns no outputs itself.
 *
 * Step control: without sources the change measure is max_i |ΔΣ_i| / (Σ_i + 10^-6 Σ_max). With infall adding
 * a_i = dt S_i/A_i to a cell, the measure is min(|ΔΣ_i|, |ΔΣ_i − a_i|) / (Σ_i + a_i + 10^-6 Σ_max): the net change
 * (small where transport carries the new gas on in a quasi-steady state) or the part transport made (small where
 * a cell is simply filling up), whichever is smaller, relative to the gas that was there or arrived. The
 * deposit itself is exact, so it needs no step control; the plain measure would call every cell that infall
 * reaches for the first time an infinite change. Steps grow by at most 2x, shrink toward the target, and are
 * redone when they overshoot it 4x (with secant iterations, see `secantIterations`, steps also grow no further than
 * the first iterate's residual allows). No division by Σ anywhere.
 *
 * Winds (winds/wind-sink.ts) are a linear sink inside the implicit solve, and the mass each cell lost is known
 * exactly from the solution, so the measure treats a removal r_i like a deposit: the transport's part is
 * ΔΣ_i − a_i + r_i, and the wind's capacity w_i = R_i dt/A_i joins the denominator as the deposit does
 * (relative to the gas that was there, arrived, or could have left). A cell the wind empties is then no change
 * to control. Cells where the wind could take all the step would leave in them (R dt ≥ M*), or that it eats
 * below the floor, are skipped: they hold what the step's inflow left behind, an amount that scales with dt
 * itself, and following it would chase the step size (a gap would take steps of hours). Inside an open inner
 * cavity (winds/inner-cavity.ts) Σ is not step-controlled: the gas there, by definition too thin to shade the
 * rim, is what leaks from the rim to the star, and following its relative changes (tiny Σ fed by a steep rim)
 * would take steps of hours; the implicit step keeps it stable and positive and the budgets stay exact. The star's luminosity
 * for irradiation (stellar-luminosity.ts) follows the accretion rate of the last accepted step (lagged one step).
 */
import { AU_CGS, G_CGS, MYR_CGS } from '../../../shared/constants.js';
import type { ModelStatus } from '../../../shared/model-result.js';
import { diskAngularMomentum, diskMass } from './disk-diagnostics.js';
import type { Budget, DiskState, EvolveObserver, EvolveOutcome } from './disk-state.js';
import type { DiskGrid } from './grid.js';
import { centrifugalRadius, depositInfall } from './infall.js';
import { spinAngularMomentum } from './stellar-spin.js';
import {
  accretionLuminosity,
  fillBaseTemperature4,
  irradiationPerLsun,
  relaxedAccretionLuminosity,
  type LuminositySetup,
} from './stellar-luminosity.js';
import type { TransportPhysics } from './transport-coefficients.js';
import { computeTransportCoefficients } from './transport-coefficients.js';
import type { EdgeCondition } from './viscous-transport.js';
import { linearizationResidual, linearizeAbout, probeViscosity, secantUpdate, type ProbeDisk } from './flux-linearization.js';
import { makeTransportWorkspace, viscousStep } from './viscous-transport.js';
import { advanceCavity, findInnerCavity, type InnerCavity } from './winds/inner-cavity.js';
import { cavityCheckRadius, computeWindRates, fillSinkDt, makeWindWorkspace, windRemoval, type WindSetup } from './winds/wind-sink.js';

export interface InfallSetup {
  /** Shu rate, g s^-1. */
  readonly mdot: number;
  /** Isothermal sound speed of the core, cm s^-1. */
  readonly soundSpeed: number;
  /** Core rotation rate, s^-1. */
  readonly omegaCore: number;
  /** Time the core is used up, s. */
  readonly tEnd: number;
}

export interface SpinSetup {
  readonly k2: number;
  /** Stellar radius, cm. */
  readonly rStar: number;
  /** Rotation period, s. */
  readonly period: number;
}

/** Prescribed inward mass flows through the grid edges (g s^-1) as functions of time: validation runs only. */
export interface ValidationEdges {
  readonly inner: (t: number) => number;
  readonly outer: (t: number) => number;
}

export interface EvolveSetup {
  readonly grid: DiskGrid;
  /** Initial surface density, g cm^-2 (copied, not modified). */
  readonly sigma0: Float64Array;
  /** Initial stellar mass, g. */
  readonly mStar0: number;
  readonly starGrows: boolean;
  readonly transport: TransportPhysics;
  readonly theta: number;
  /** Extra solves per step about the latest iterate: Newton with the linearised flux, else Picard (ν(Σ_new) lagged). */
  readonly newtonIterations: number;
  readonly stepChange: number;
  /** Newton-linearised implicit flux (flux-linearization.ts) instead of lagged ν. */
  readonly linearizeFlux?: boolean;
  /**
   * With the linearised flux and no Newton iterations: after the step, ν at the new Σ gives the step's nonlinear
   * residual (`linearizationResidual`); where it exceeds what the change control would redo (REDO_FACTOR ×
   * stepChange, relative to the same Σ scale), the linearisation is replaced by chords (`secantUpdate`) and the
   * step solved again, up to this many times, and then redone at half the step if still short. Costs one more
   * coefficient pass per step. 0 or absent: one Newton iterate, unchecked.
   */
  readonly secantIterations?: number;
  readonly maxSteps: number;
  /** End time, s. */
  readonly tEnd: number;
  /** Times (s) to stop exactly on and report; tEnd and the end of infall are added. */
  readonly eventTimes: readonly number[];
  readonly infall: InfallSetup | null;
  readonly spin: SpinSetup;
  /** First step, s. */
  readonly initialDt: number;
  readonly validationEdges?: ValidationEdges;
  /** Photoevaporative winds; absent or null for none. */
  readonly winds?: WindSetup | null;
  /** Irradiation that follows L_phot + L_acc; absent: `transport.baseTemperature4` stays as given. */
  readonly luminosity?: LuminositySetup;
}

// Step control (numerical choices, common practice, no source): the next step is dt × stepChange / change,
// kept within [SHRINK_MIN, GROWTH_MAX] × dt; a try whose change exceeds REDO_FACTOR × stepChange is redone
// shorter; after MAX_RETRIES redone tries of one step the run stops as step_collapse.
const GROWTH_MAX = 2;
const SHRINK_MIN = 0.25;
const REDO_FACTOR = 4;
const MAX_RETRIES = 40;

function sortedEvents(setup: EvolveSetup): number[] {
  const times = [...setup.eventTimes, setup.tEnd];
  if (setup.infall !== null && setup.infall.tEnd < setup.tEnd) times.push(setup.infall.tEnd);
  return [...new Set(times.filter((t) => t > 0 && t <= setup.tEnd))].sort((a, b) => a - b);
}

/** Number of cells whose centre lies inside radius r (cm). */
function cellsInside(grid: DiskGrid, r: number): number {
  let k = 0;
  while (k < grid.n && grid.centers[k] < r) k++;
  return k;
}

function fillOmega(grid: DiskGrid, mStar: number, omega: Float64Array): void {
  const gm = Math.sqrt(G_CGS * mStar);
  for (let i = 0; i < grid.n; i++) omega[i] = gm / (grid.centers[i] * grid.sqrtCenters[i]);
}

export function evolveDisk(setup: EvolveSetup, observer: EvolveObserver = {}): EvolveOutcome {
  const { grid, transport, theta, infall, spin, validationEdges } = setup;
  const n = grid.n;
  const sigma = Float64Array.from(setup.sigma0);
  const sigmaNew = new Float64Array(n);
  const fields = { nu: new Float64Array(n), temperature: new Float64Array(n), sigmaActive: new Float64Array(n) };
  // A provider with a per-cell cache starts every run from nothing: a run is a function of its setup alone.
  transport.activeColumn.reset?.();
  const nuNew = new Float64Array(n);
  const tempScratch = new Float64Array(n);
  const omega = new Float64Array(n);
  const source = new Float64Array(n);
  const ws = makeTransportWorkspace(n);
  const lin = setup.linearizeFlux === true
    ? {
      sigma: new Float64Array(n), nu: new Float64Array(n), temperature: new Float64Array(n), nuImplicit: new Float64Array(n), offset: new Float64Array(n),
      // The linearisation about a later iterate (newtonIterations) lives apart: a redone try restarts from the first.
      iterateNuImplicit: new Float64Array(n), iterateOffset: new Float64Array(n),
    }
    : null;
  const secantIterations = lin !== null && setup.newtonIterations === 0 ? (setup.secantIterations ?? 0) : 0;
  const secant = secantIterations > 0
    ? { nuNew: new Float64Array(n), temperature: new Float64Array(n), residual: new Float64Array(n), nuImplicit: new Float64Array(n), offset: new Float64Array(n) }
    : null;
  const events = sortedEvents(setup);
  const winds = setup.winds ?? null;
  const windWs = winds === null ? null : makeWindWorkspace(grid);
  const windLoss = windWs === null ? new Float64Array(n) : windWs.removed;
  // Irradiation that follows the star: the run owns its copy of T_irr^4 + T_floor^4 (the setup stays untouched).
  const lum = setup.luminosity;
  const irrPerLsun = lum === undefined ? null : irradiationPerLsun(grid);
  const physics: TransportPhysics =
    lum === undefined ? transport : { ...transport, baseTemperature4: new Float64Array(n) };
  if (lum !== undefined && irrPerLsun !== null) fillBaseTemperature4(irrPerLsun, lum.lPhot, lum.floor4, physics.baseTemperature4);

  const mDisk0 = diskMass(grid, sigma);
  const jDisk0 = diskAngularMomentum(grid, sigma, setup.mStar0);
  const jSpin0 = spinAngularMomentum(spin.k2, setup.mStar0, spin.rStar, spin.period);
  fillOmega(grid, setup.mStar0, omega);
  const state: DiskState = {
    t: 0, steps: 0, rejectedSteps: 0, sigma, temperature: fields.temperature, nu: fields.nu, sigmaActive: fields.sigmaActive,
    mStar: setup.mStar0, mDisk: mDisk0, jDisk: jDisk0, jSpin: jSpin0, mdotStar: 0,
    transport: computeTransportCoefficients(grid, sigma, omega, physics, fields, 0),
    lStar: lum === undefined ? 0 : lum.lPhot, lAcc: 0, mdotWind: 0, windLoss,
    cavity: { open: false, radius: grid.edges[0] },
    mDisk0, jDisk0, jSpin0,
    budget: {
      massAccreted: 0, massLost: 0, massInfallDisk: 0, massInfallStar: 0,
      jAccreted: 0, jLost: 0, jInfallDisk: 0, jInfallStar: 0, jRescale: 0,
      massWind: 0, massWindXray: 0, massWindEuv: 0, massWindFuv: 0, jWind: 0,
    },
  };
  const cavityNow = (): InnerCavity => {
    const check = winds === null ? null : cavityCheckRadius(winds, state.mStar);
    if (winds === null || check === null) return state.cavity;
    return advanceCavity(state.cavity, findInnerCavity(grid, sigma, fields.temperature, omega, winds.cavityColumn, check));
  };
  state.cavity = cavityNow();
  const fail = (status: ModelStatus, reason: string): EvolveOutcome => ({ status, reason, state });
  // Which cell bound the step control (largest change or residual), per try and counted over accepted steps, so
  // that a run that stalls says where and in what state.
  let boundCell = -1;
  const boundCount = new Int32Array(n);
  const cellState = (i: number): string =>
    `R = ${(grid.centers[i] / AU_CGS).toPrecision(3)} AU (Σ = ${sigma[i].toPrecision(3)} g cm^-2, Σ_a/Σ = ` +
    `${sigma[i] > 0 ? (fields.sigmaActive[i] / sigma[i]).toPrecision(2) : '-'}, T = ${fields.temperature[i].toPrecision(3)} K)`;
  const boundAt = (): string => (boundCell < 0 ? '' : `; the step size was held back by the cell at ${cellState(boundCell)}`);

  const probeDisk: ProbeDisk = { grid, omega, physics };
  let dt = setup.initialDt;
  let dtTaken = 0;
  let next = 0;
  while (next < events.length) {
    if (state.steps >= setup.maxSteps) {
      let most = 0;
      for (let i = 1; i < n; i++) if (boundCount[i] > boundCount[most]) most = i;
      return fail(
        'step_limit',
        `reached max_steps = ${setup.maxSteps} at t = ${(state.t / MYR_CGS).toPrecision(4)} Myr; ${boundCount[most]} of the steps ` +
          `were held back by the cell at ${cellState(most)}`,
      );
    }
    const t = state.t;
    const tEvent = events[next];
    const infallOn = infall !== null && t < infall.tEnd;
    // The floor of the change measure comes from the state the step starts from; an empty disk has no
    // relative change to control (its first gas is exact deposit), so its first step is measured as 0.
    let sigmaMaxOld = 0;
    for (let i = 0; i < n; i++) if (sigma[i] > sigmaMaxOld) sigmaMaxOld = sigma[i];
    if (winds !== null && windWs !== null) computeWindRates(winds, grid, sigma, state.mStar, state.cavity, windWs);
    const firstControlled = state.cavity.open ? cellsInside(grid, state.cavity.radius) : 0;
    let accepted = false;
    for (let retry = 0; retry <= MAX_RETRIES && !accepted; retry++) {
      const landing = dt >= (tEvent - t) * (1 - 1e-12);
      const dtTry = landing ? tEvent - t : dt;
      if (!(dtTry > 1e-12 * setup.tEnd) && !landing) {
        return fail('step_collapse', `time step fell to ${dtTry.toExponential(3)} s at t = ${t.toExponential(4)} s${boundAt()}`);
      }
      boundCell = -1;
      let toStar = 0;
      let jToStar = 0;
      if (infallOn) {
        const rc = centrifugalRadius(infall.soundSpeed, infall.omegaCore, t + 0.5 * dtTry);
        const deposit = depositInfall(grid, infall.mdot, rc, state.mStar, source);
        toStar = deposit.toStar;
        jToStar = deposit.angularMomentumToStar;
      }
      const edges = validationEdges;
      const edgeAt = (f: ((s: number) => number) | undefined): EdgeCondition =>
        f === undefined ? null : theta * f(t + dtTry) + (1 - theta) * f(t);
      if (lin !== null && retry === 0) {
        linearizeAbout(probeDisk, t, sigma, fields.nu, fields.temperature, lin, lin.nuImplicit, lin.offset);
      }
      // One record per try, its wind sink filled in after the predictor: a spread copy per try cost ~1.5 % of a model
      // in a profile, and viscousStep read two record shapes (it takes ~25 % less time with one).
      const input = {
        grid, sigma, nuExplicit: fields.nu, nuImplicit: lin === null ? fields.nu : lin.nuImplicit, massSource: infallOn ? source : null,
        implicitOffset: lin === null ? null : lin.offset, dt: dtTry, theta, inner: edgeAt(edges?.inner), outer: edgeAt(edges?.outer),
        sinkDt: null as Float64Array | null,
      };
      if (winds !== null && windWs !== null) {
        // Predictor: the same step without winds gives each cell's mass M*_i for the sink rate R_i / M*_i.
        viscousStep(input, ws, sigmaNew);
        input.sinkDt = fillSinkDt(winds, grid, sigmaNew, dtTry, windWs);
      }
      let flows = viscousStep(input, ws, sigmaNew);
      // What is wrong with the try's Σ' and edge flows, if anything; such a try is redone (below) and never handed
      // to a coefficient pass, whose kernels need a finite Σ ≥ 0 (the Saha kernel's root bracket fails on NaN).
      const invalidity = (): 'non_finite' | 'negative' | null => {
        if (!Number.isFinite(flows.mdotInner) || !Number.isFinite(flows.mdotOuter)) return 'non_finite';
        let negative = false;
        for (let i = 0; i < n; i++) {
          const s = sigmaNew[i];
          if (!Number.isFinite(s)) return 'non_finite';
          if (s < 0) negative = true;
        }
        return negative ? 'negative' : null;
      };
      const floor = 1e-6 * sigmaMaxOld;
      // Σ scale of cell i for the change measure, or 0 where the step control skips the cell (see the header).
      const controlScale = (i: number): number => {
        if (i < firstControlled || sigmaMaxOld <= 0) return 0;
        // Wind-dominated cells, and those the wind eats below the floor, hold what this step's inflow left behind.
        if (windWs !== null && (windWs.windDominated[i] === 1 || (windWs.capacity[i] > 0 && sigma[i] < floor && sigmaNew[i] < floor))) return 0;
        const added = infallOn ? (dtTry * source[i]) / grid.area[i] : 0;
        const capacity = windWs !== null ? windWs.capacity[i] : 0;
        return sigma[i] + added + capacity + floor;
      };
      let converged = true;
      // Worst residual of the try's first (Newton) iterate, relative as in the check: it sizes the next step.
      let firstResidual = 0;
      if (secant !== null && lin !== null) {
        secant.nuImplicit.set(lin.nuImplicit);
        secant.offset.set(lin.offset);
        const edgeZeroTorque = { inner: edges?.inner === undefined, outer: edges?.outer === undefined };
        const step = { sigmaNew, nuNew: secant.nuNew, nuImplicit: secant.nuImplicit, offset: secant.offset };
        for (let k = 0; ; k++) {
          if (invalidity() !== null) break;
          // ν(Σ') of the same function the linearisation differentiated (start-of-step physics, T held).
          probeViscosity(grid, sigmaNew, omega, physics, fields.temperature, t, secant.nuNew, secant.temperature);
          linearizationResidual(grid, step, theta * dtTry, edgeZeroTorque, secant.residual);
          let worst = 0;
          for (let i = 0; i < n; i++) {
            const scale = controlScale(i);
            const r = scale > 0 ? Math.abs(secant.residual[i]) / scale : 0;
            // A residual that could not be evaluated (NaN) ranks above every number: never converged.
            const rank = Number.isNaN(r) ? Infinity : r;
            if (rank > worst) {
              worst = rank;
              boundCell = i;
            }
          }
          converged = worst <= REDO_FACTOR * setup.stepChange;
          if (k === 0) firstResidual = worst;
          if (converged || k === secantIterations) break;
          secantUpdate(sigma, grid.sqrtCenters, fields.nu, step, secant.nuImplicit, secant.offset);
          flows = viscousStep({ ...input, nuImplicit: secant.nuImplicit, implicitOffset: secant.offset }, ws, sigmaNew);
        }
      }
      for (let k = 0; k < setup.newtonIterations; k++) {
        tempScratch.set(fields.temperature);
        computeTransportCoefficients(grid, sigmaNew, omega, physics, { nu: nuNew, temperature: tempScratch }, t + dtTry, dtTry);
        if (lin === null) {
          flows = viscousStep({ ...input, nuImplicit: nuNew, implicitOffset: null }, ws, sigmaNew);
          continue;
        }
        // A Newton iteration: the flux re-linearised about the latest iterate (a plain re-solve with ν(Σ_new)
        // would drop the linearisation and, across a steep switch, oscillate between iterates).
        // (The linearisation reads Σ_new before the solve below overwrites it.)
        linearizeAbout(probeDisk, t + dtTry, sigmaNew, nuNew, tempScratch, lin, lin.iterateNuImplicit, lin.iterateOffset);
        flows = viscousStep({ ...input, nuImplicit: lin.iterateNuImplicit, implicitOffset: lin.iterateOffset }, ws, sigmaNew);
      }
      const removal = winds !== null && windWs !== null ? windRemoval(winds, grid, sigmaNew, windWs) : null;

      // Validity of the new state, then its change measure.
      const invalid = invalidity();
      if (invalid === 'non_finite') {
        if (retry === MAX_RETRIES) return fail('non_finite', `non-finite surface density at t = ${t.toExponential(4)} s`);
        dt = dtTry * SHRINK_MIN;
        state.rejectedSteps++;
        continue;
      }
      if (invalid === 'negative') {
        // (A θ < 1 step can overshoot below zero; the wind sink, being implicit, cannot.)
        dt = dtTry * 0.5;
        state.rejectedSteps++;
        continue;
      }
      if (!converged) {
        // The secant iterations did not settle the step: a shorter one moves less far along G(Σ).
        dt = dtTry * 0.5;
        state.rejectedSteps++;
        continue;
      }
      let change = 0;
      for (let i = firstControlled; i < n; i++) {
        const denom = controlScale(i);
        if (denom > 0) {
          const added = infallOn ? (dtTry * source[i]) / grid.area[i] : 0;
          const taken = removal !== null ? windLoss[i] / grid.area[i] : 0;
          const c = Math.min(Math.abs(sigmaNew[i] - sigma[i]), Math.abs(sigmaNew[i] - sigma[i] - added + taken)) / denom;
          if (c > change) {
            change = c;
            boundCell = i;
          }
        }
      }
      if (change > REDO_FACTOR * setup.stepChange && retry < MAX_RETRIES) {
        dt = dtTry * Math.max(0.1, (0.8 * setup.stepChange) / change);
        state.rejectedSteps++;
        continue;
      }

      // Accept: bookkeeping with the j_i the step used (M_* at its start).
      accepted = true;
      dtTaken = dtTry;
      if (boundCell >= 0) boundCount[boundCell]++;
      const b = state.budget;
      const gm = Math.sqrt(G_CGS * state.mStar);
      b.massAccreted += flows.mdotInner * dtTry;
      b.massLost += flows.mdotOuter * dtTry;
      b.jAccreted += flows.mdotInner * dtTry * gm * grid.sqrtEdges[0];
      b.jLost += flows.mdotOuter * dtTry * gm * grid.sqrtEdges[n];
      if (infallOn) {
        let m = 0;
        let j = 0;
        for (let i = 0; i < n; i++) {
          m += source[i];
          j += source[i] * grid.sqrtCenters[i];
        }
        b.massInfallDisk += m * dtTry;
        b.jInfallDisk += j * gm * dtTry;
        b.massInfallStar += toStar * dtTry;
        b.jInfallStar += jToStar * dtTry;
      }
      if (removal !== null) {
        b.massWind += removal.total;
        b.massWindXray += removal.xray;
        b.massWindEuv += removal.euv;
        b.massWindFuv += removal.fuv;
        b.jWind += removal.massSqrtR * gm;
      }
      state.mdotWind = removal === null ? 0 : removal.total / dtTry;
      sigma.set(sigmaNew);
      state.mdotStar = flows.mdotInner + toStar;
      const jDiskOld = diskAngularMomentum(grid, sigma, state.mStar);
      if (setup.starGrows) {
        const mNew = state.mStar + state.mdotStar * dtTry;
        b.jRescale += jDiskOld * (Math.sqrt(mNew / state.mStar) - 1);
        state.mStar = mNew;
        fillOmega(grid, mNew, omega);
      }
      state.jDisk = setup.starGrows ? diskAngularMomentum(grid, sigma, state.mStar) : jDiskOld;
      state.mDisk = diskMass(grid, sigma);
      state.jSpin = spinAngularMomentum(spin.k2, state.mStar, spin.rStar, spin.period);
      state.t = landing ? tEvent : t + dtTry;
      state.steps++;
      // The change measure does not see the residual, and sized by it alone a step that just failed the residual
      // check doubles straight back into the failure. With secant iterations the growth is also capped where the
      // first iterate's residual would reach the redo threshold: one Newton iterate leaves an error second order in
      // the change it linearised over (∝ dt), so ∝ dt², and the cap is √(threshold / residual), never below 1 (the
      // secant iterations settle what the first iterate leaves). Common practice, no source; measured on the Saha
      // branch (default infall model): 28 312 steps, 625 redone, 68 024 residual passes, 64 s of CPU; sized by the
      // change alone 14 473, 9 571, 107 132 and 69 s.
      const residualGrowth = secant === null
        ? GROWTH_MAX
        : Math.max(1, Math.sqrt((REDO_FACTOR * setup.stepChange) / Math.max(firstResidual, 1e-300)));
      const growth = Math.min(GROWTH_MAX, residualGrowth, Math.max(SHRINK_MIN, setup.stepChange / Math.max(change, 1e-300)));
      const suggested = dtTry * growth;
      dt = landing ? Math.max(dt, suggested) : suggested;
    }
    if (!accepted) return fail('step_collapse', `no acceptable step after ${MAX_RETRIES} retries at t = ${t.toExponential(4)} s${boundAt()}`);

    if (lum !== undefined && irrPerLsun !== null) {
      const target = lum.accretion ? accretionLuminosity(state.mStar, state.mdotStar, lum.rStar, grid.edges[0]) : 0;
      state.lAcc = relaxedAccretionLuminosity(state.lAcc, target, dtTaken, lum.accretionMemory);
      state.lStar = lum.lPhot + state.lAcc;
      fillBaseTemperature4(irrPerLsun, state.lStar, lum.floor4, physics.baseTemperature4);
    }
    state.transport = computeTransportCoefficients(grid, sigma, omega, physics, fields, state.t, dtTaken);
    state.cavity = cavityNow();
    observer.onStep?.(state);
    while (next < events.length && events[next] <= state.t) {
      observer.onEvent?.(state);
      next++;
    }
  }
  return { status: 'ok', reason: null, state };
}
