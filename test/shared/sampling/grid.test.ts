/**
 * Grid plan: counts, order (first dimension slowest, as nested loops in spec order) and exact endpoints.
 * Expected values come from the definition of a full-factorial design, written out by hand below.
 */
import { describe, expect, it } from 'vitest';
import { makeSamplingPlan } from '../../../shared/sampling/index.js';
import { linear, log, values } from './fixtures.js';

const GRID = { plan: 'grid' } as const;

describe('grid plan', () => {
  it('3 × 2 × 4 gives 24 points with the first dimension slowest (nested loops in spec order)', () => {
    const plan = makeSamplingPlan(
      [linear('alpha_active', 0, 1, 3), values('initial_state', 'infall', 'disk'), log('m_core_msun', 1, 1000, 4)],
      GRID,
    );
    expect(plan.size).toBe(24);
    // Levels by definition: linear 0, 1/2, 1; the two listed values in order; log 1, 10, 100, 1000.
    const a = [0, 0.5, 1];
    const b = ['infall', 'disk'];
    const c = [1, 10, 100, 1000];
    let i = 0;
    for (const x of a) {
      for (const y of b) {
        for (const z of c) {
          const p = plan.pointAt(i++);
          expect(p[0]).toBe(x);
          expect(p[1]).toBe(y);
          expect(p[2] as number).toBeCloseTo(z, 10);
        }
      }
    }
    expect(i).toBe(24);
  });

  it('pins both endpoints exactly where plain arithmetic would round (linear [0.01, 0.2] × 4, log [1e-4, 0.3] × 7)', () => {
    // In doubles 0.01 + 3 · (0.2 − 0.01)/3 is 0.20000000000000004 and exp(ln 1e-4 + ln(0.3/1e-4)) is
    // 0.30000000000000004, so exact endpoints need the pinning the plan promises.
    expect(0.01 + (3 * (0.2 - 0.01)) / 3).not.toBe(0.2);
    expect(Math.exp(Math.log(1e-4) + Math.log(0.3 / 1e-4))).not.toBe(0.3);
    const plan = makeSamplingPlan([linear('alpha_active', 0.01, 0.2, 4), log('alpha_dead', 1e-4, 0.3, 7)], GRID);
    expect(plan.size).toBe(28);
    expect(plan.pointAt(0)).toEqual([0.01, 1e-4]);
    expect(plan.pointAt(6)).toEqual([0.01, 0.3]);
    expect(plan.pointAt(27)).toEqual([0.2, 0.3]);
    expect(plan.pointAt(7)[0]).toBeCloseTo(0.01 + 0.19 / 3, 15);
  });

  it('log levels are geometric: constant ratio (max/min)^(1/(n−1))', () => {
    const plan = makeSamplingPlan([log('m_core_msun', 0.3, 3, 5)], GRID);
    const ratio = 10 ** (1 / 4);
    for (let k = 1; k < 5; k++) {
      expect((plan.pointAt(k)[0] as number) / (plan.pointAt(k - 1)[0] as number)).toBeCloseTo(ratio, 12);
    }
  });

  it('count 1 gives min alone; a values dimension counts its values', () => {
    const plan = makeSamplingPlan([linear('alpha_active', 0.2, 0.9, 1), values('t_core_k', 10, 12, 15)], GRID);
    expect(plan.size).toBe(3);
    expect([0, 1, 2].map((i) => plan.pointAt(i))).toEqual([[0.2, 10], [0.2, 12], [0.2, 15]]);
  });

  it('a range without a count is an input error naming the field', () => {
    expect(() => makeSamplingPlan([linear('alpha_active', 0, 1, null)], GRID)).toThrow(/vary\.alpha_active\.count: a grid needs a count/);
  });
});
