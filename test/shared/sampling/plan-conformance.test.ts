/**
 * One suite run against every plan (grid, Latin hypercube, Sobol, random), as the house style asks for every
 * implementation of an interface: random access equals in-order iteration, values stay in their dimensions,
 * out-of-range indices throw a RangeError, and plans are pure (no hidden state between calls).
 */
import { describe, expect, it } from 'vitest';
import type { SamplingSpec } from '../../../shared/sweep-spec.js';
import { makeSamplingPlan, type SamplingPlan } from '../../../shared/sampling/index.js';
import { linear, log, values } from './fixtures.js';

const DIMS = [
  linear('alpha_active', 1e-3, 0.1, 5),
  log('m_core_msun', 0.3, 3, 4),
  values('initial_state', 'infall', 'disk'),
  values('t_core_k', 8, 10, 12, 15),
  log('kappa_cm2_g', 0.01, 10, 3),
];

const SPECS: [string, SamplingSpec][] = [
  ['grid', { plan: 'grid' }],
  ['latin_hypercube', { plan: 'latin_hypercube', points: 777, seed: 31 }],
  ['sobol', { plan: 'sobol', points: 1000, skip: 0 }],
  ['sobol with skip', { plan: 'sobol', points: 300, skip: 1024 }],
  ['random', { plan: 'random', points: 640, seed: 8 }],
];

/** A deterministic sample of indices in scrambled order (multiplicative stride modulo size). */
function sampleIndices(size: number): number[] {
  const out = [size - 1, 0, Math.floor(size / 2)];
  for (let k = 0; k < 97; k++) out.push((k * 7919 + 13) % size);
  return out;
}

describe.each(SPECS)('plan conformance: %s', (_, spec) => {
  const plan: SamplingPlan = makeSamplingPlan(DIMS, spec);
  const streamed = Array.from({ length: plan.size }, (__, i) => plan.pointAt(i));

  it('has the expected size', () => {
    expect(plan.size).toBe(spec.plan === 'grid' ? 5 * 4 * 2 * 4 * 3 : spec.points);
  });

  it('pointAt(i) for a scrambled sample of i equals the i-th point of iterating 0 … size − 1', () => {
    for (const i of sampleIndices(plan.size)) expect(plan.pointAt(i)).toEqual(streamed[i]);
  });

  it('every value lies in its dimension: ranges within [min, max], lists from the list', () => {
    for (const p of streamed) {
      expect(p.length).toBe(DIMS.length);
      DIMS.forEach((dim, d) => {
        if (dim.kind === 'values') expect(dim.values).toContain(p[d]);
        else {
          expect(typeof p[d]).toBe('number');
          expect(p[d]).toBeGreaterThanOrEqual(dim.min);
          expect(p[d]).toBeLessThanOrEqual(dim.max);
        }
      });
    }
  });

  it('throws a RangeError for indices outside [0, size) or not whole', () => {
    for (const i of [-1, plan.size, plan.size + 10, 0.5, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => plan.pointAt(i)).toThrow(RangeError);
    }
  });

  it('returns a fresh array each call (mutating a result does not change the plan)', () => {
    const p = plan.pointAt(3);
    p[0] = -1;
    expect(plan.pointAt(3)).toEqual(streamed[3]);
  });
});

describe('makeSamplingPlan input errors name the field', () => {
  it.each([
    [[linear('alpha_active', 0.1, 0.1, 3)], { plan: 'grid' }, /vary\.alpha_active\.linear: must be an increasing range/],
    [[log('m_core_msun', 0, 3, 3)], { plan: 'grid' }, /vary\.m_core_msun\.log\[0\]: must be > 0/],
    [[values('initial_state')], { plan: 'grid' }, /vary\.initial_state\.values: must list at least one value/],
    [[], { plan: 'grid' }, /vary: must vary at least one parameter/],
    [[linear('alpha_active', 0, 1)], { plan: 'latin_hypercube', points: 2 ** 32 + 1, seed: 1 }, /sampling\.points: latin_hypercube takes/],
    [[linear('alpha_active', 0, 1)], { plan: 'random', points: 0, seed: 1 }, /sampling\.points: random takes/],
  ] as const)('%#', (dims, spec, message) => {
    expect(() => makeSamplingPlan(dims, spec as SamplingSpec)).toThrow(message);
  });
});
