/**
 * Steady accretion through a zero-torque inner edge:
 *   ν Σ = (Ṁ / 3π) [1 − (R_in / R)^{1/2}]
 * (Pringle 1981, on steady disks; equation number not recalled reliably. The same result is Frank, King &
 * Raine 2002, eq. 5.41, from memory). In the j-flux form the discrete state X_i = ν_i Σ_i R_i^{1/2} =
 * (Ṁ/3π)(R_i^{1/2} − R_in^{1/2}) is linear in R^{1/2}, and the edge flow 3π w_e (X_{i+1} − X_i) with
 * w_e = 1/(R_{i+1}^{1/2} − R_i^{1/2}) is exactly Ṁ at every edge, the zero-torque inner edge included. So the
 * steady state must be a fixed point of `viscousStep` to round-off, for any ν profile, θ and dt.
 */
import { describe, expect, it } from 'vitest';
import { AU_CGS, M_SUN_CGS, YEAR_CGS } from '../../shared/constants.js';
import { makeLogGrid } from '../../worker/kernels/disk/grid.js';
import { makeTransportWorkspace, viscousStep } from '../../worker/kernels/disk/viscous-transport.js';

const MDOT = (1e-7 * M_SUN_CGS) / YEAR_CGS;
const R_IN = 0.05 * AU_CGS;
const R_OUT = 100 * AU_CGS;
const N = 200;
/** ν at 1 AU, cm^2 s^-1 (α ≈ 0.01 there). */
const NU_1AU = 1e15;
/**
 * Round-off level: a few hundred ulps after 20 tridiagonal solves with diffusion numbers of 1e5–1e7
 * (measured worst: 1.9e-13 for Σ and for the inner flow).
 */
const TOL = 1e-12;

function steadyState(power: number) {
  const grid = makeLogGrid(R_IN, R_OUT, N);
  const nu = grid.centers.map((r) => NU_1AU * (r / AU_CGS) ** power);
  // Pringle 1981 (steady disks) / Frank, King & Raine eq. 5.41 (from memory), evaluated at cell centres.
  const sigma = grid.centers.map((r, i) => (MDOT / (3 * Math.PI * nu[i])) * (1 - Math.sqrt(R_IN / r)));
  return { grid, nu, sigma };
}

describe('steady accretion with a zero-torque inner edge (Pringle 1981, steady disks)', () => {
  for (const power of [1, 1.5, 0.5]) {
    for (const theta of [1, 0.5]) {
      it(`is a fixed point of the j-flux step for nu ~ R^${power}, theta = ${theta}`, () => {
        const { grid, nu, sigma } = steadyState(power);
        const ws = makeTransportWorkspace(N);
        // A step of 10 % of the viscous time at R_out: diffusion numbers ν dt / ΔR^2 reach 1e5–1e7 near R_in,
        // the regime where a wrong edge weight or a non-telescoping flux would show at once.
        const dt = (0.1 * R_OUT * R_OUT) / nu[N - 1];
        let state = Float64Array.from(sigma);
        let next = new Float64Array(N);
        let worstSigma = 0;
        let worstInner = 0;
        for (let k = 0; k < 20; k++) {
          const flows = viscousStep(
            { grid, sigma: state, nuExplicit: nu, nuImplicit: nu, massSource: null, dt, theta, inner: null, outer: MDOT },
            ws,
            next,
          );
          for (let i = 0; i < N; i++) worstSigma = Math.max(worstSigma, Math.abs(next[i] / sigma[i] - 1));
          worstInner = Math.max(worstInner, Math.abs(flows.mdotInner / MDOT - 1));
          // What comes in at R_out is what was prescribed, booked as a negative outward flow.
          expect(flows.mdotOuter).toBe(-MDOT);
          [state, next] = [next, state];
        }
        expect(worstSigma).toBeLessThan(TOL);
        expect(worstInner).toBeLessThan(TOL);
      });
    }
  }

  it('is not a fixed point when the zero-torque point is put at the first cell centre instead of R_in', () => {
    // Control: νΣ ∝ 1 − (R_0/R)^{1/2} with R_0 the first centre is a different profile; the step must move it.
    // Shows the 1e-12 tests above resolve where the zero-torque point sits.
    const grid = makeLogGrid(R_IN, R_OUT, N);
    const nu = grid.centers.map((r) => NU_1AU * (r / AU_CGS));
    const r0 = grid.centers[0];
    const sigma = grid.centers.map((r, i) => (MDOT / (3 * Math.PI * nu[i])) * (1 - Math.sqrt(r0 / r)));
    const next = new Float64Array(N);
    const dt = (0.1 * R_OUT * R_OUT) / nu[N - 1];
    viscousStep(
      { grid, sigma, nuExplicit: nu, nuImplicit: nu, massSource: null, dt, theta: 1, inner: null, outer: MDOT },
      makeTransportWorkspace(N),
      next,
    );
    let worst = 0;
    for (let i = 1; i < N; i++) worst = Math.max(worst, Math.abs(next[i] / sigma[i] - 1));
    expect(worst).toBeGreaterThan(1e-6);
  });
});
