/**
 * Points of a sweep: how many each plan gives, that each is the fully resolved model input, and that a point id
 * depends on that input and the model version only, never on which spec (or which plan) produced the point.
 */
import { describe, expect, it } from 'vitest';
import { PARAM_NAMES } from '../../../shared/model-params.js';
import { MODEL_VERSION } from '../../../shared/model-version.js';
import { parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import { pointIdOf, type PointSource } from '../../../orchestrator/sweep/points.js';
import { planSweep } from '../../../orchestrator/sweep/sweep-plan.js';
import { TINY_FIXED, TINY_MODEL } from '../../support/sweep-specs.js';

/** The point source of a spec given as an object (JSON text goes through the same reader as a file). */
function sourceOf(spec: Record<string, unknown>): PointSource {
  return planSweep(parseSpecText(JSON.stringify({ model: TINY_MODEL, fixed: TINY_FIXED, ...spec }), 'test.json', 'json')).source;
}

const ids = (source: PointSource): string[] => Array.from({ length: source.size }, (_, i) => source.taskAt(i).pointId);

describe('point counts', () => {
  it('a grid is the product of its levels: values count their entries, ranges their count', () => {
    const source = sourceOf({
      name: 'grid-count',
      vary: {
        alpha_active: { log: [1e-3, 1e-1], count: 4 },
        m_disk_msun: { values: [0.01, 0.02, 0.05] },
        r1_au: { linear: [10, 40], count: 2 },
      },
    });
    expect(source.size).toBe(4 * 3 * 2);
    expect(new Set(ids(source)).size).toBe(24);
  });

  it.each([
    ['sobol', { plan: 'sobol', points: 13 }],
    ['latin_hypercube', { plan: 'latin_hypercube', points: 9, seed: 7 }],
    ['random', { plan: 'random', points: 5, seed: 11 }],
  ])('%s gives sampling.points points, each distinct', (_plan, sampling) => {
    const source = sourceOf({
      name: 'design-count',
      vary: { alpha_active: { log: [1e-3, 1e-1] }, m_disk_msun: { linear: [0.01, 0.1] } },
      sampling,
    });
    expect(source.size).toBe(sampling.points);
    expect(new Set(ids(source)).size).toBe(sampling.points);
  });

  it('a design keeps every point inside the ranges, with values lists taken as given', () => {
    const source = sourceOf({
      name: 'design-range',
      vary: { alpha_active: { log: [1e-3, 1e-1] }, active_layer: { values: ['uniform', 'fixed_column'] } },
      sampling: { plan: 'latin_hypercube', points: 16, seed: 3 },
    });
    for (let i = 0; i < source.size; i++) {
      const p = source.taskAt(i).params;
      expect(p.alpha_active).toBeGreaterThanOrEqual(1e-3);
      expect(p.alpha_active).toBeLessThanOrEqual(1e-1);
      expect(['uniform', 'fixed_column']).toContain(p.active_layer);
    }
  });
});

describe('a point is the fully resolved model input', () => {
  it('holds every parameter, defaults filled in, spec values and varied values in place', () => {
    const source = sourceOf({ name: 'resolved', vary: { alpha_active: { values: [0.003, 0.03] } } });
    const { params, pointIndex } = source.taskAt(1);
    expect(pointIndex).toBe(1);
    expect(Object.keys(params).sort()).toEqual([...PARAM_NAMES].sort());
    expect(params).toMatchObject({ alpha_active: 0.03, initial_state: 'disk', n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] });
    expect(params.alpha_dead).toBe(1e-4); // the table's default
  });

  it('taskAt is a pure function of the index', () => {
    const source = sourceOf({ name: 'pure', vary: { alpha_active: { log: [1e-3, 1e-1] } }, sampling: { plan: 'sobol', points: 8 } });
    const first = Array.from({ length: 8 }, (_, i) => source.taskAt(i));
    const again = [5, 0, 7, 3].map((i) => source.taskAt(i));
    expect(again).toEqual([first[5], first[0], first[7], first[3]]);
  });
});

describe('point ids', () => {
  it('are 128-bit hex and differ between the points of a sweep', () => {
    const all = ids(sourceOf({ name: 'hex', vary: { alpha_active: { values: [0.001, 0.01, 0.1] } } }));
    for (const id of all) expect(id).toMatch(/^[0-9a-f]{32}$/);
    expect(new Set(all).size).toBe(3);
  });

  it('the same model reached by two different specs has the same id', () => {
    // Spec A varies alpha at a fixed disk mass; spec B varies the disk mass at a fixed alpha. They share one model.
    const a = sourceOf({ name: 'tern-alpha', fixed: { ...TINY_FIXED, m_disk_msun: 0.05 }, vary: { alpha_active: { values: [0.001, 0.01] } } });
    const b = sourceOf({ name: 'tern-mass', fixed: { ...TINY_FIXED, alpha_active: 0.01 }, vary: { m_disk_msun: { values: [0.05, 0.1] } } });
    expect(a.taskAt(1).params).toEqual(b.taskAt(0).params);
    expect(a.taskAt(1).pointId).toBe(b.taskAt(0).pointId);
    expect(a.taskAt(0).pointId).not.toBe(b.taskAt(0).pointId);
    expect(a.taskAt(1).pointId).not.toBe(b.taskAt(1).pointId);
  });

  it('a grid point and the same point of a Latin hypercube design have the same id', () => {
    const design = sourceOf({ name: 'lhs', vary: { alpha_active: { log: [1e-3, 1e-1] } }, sampling: { plan: 'latin_hypercube', points: 4, seed: 1 } });
    const alpha = design.taskAt(2).params.alpha_active;
    const grid = sourceOf({ name: 'one-value', vary: { alpha_active: { values: [alpha] } } });
    expect(grid.taskAt(0).pointId).toBe(design.taskAt(2).pointId);
  });

  it('writing a default out, or checkpoints past the end time, resolves to the same input and id', () => {
    const plain = sourceOf({ name: 'plain', vary: { alpha_active: { values: [0.01] } } });
    const explicit = sourceOf({
      name: 'explicit',
      model: { ...TINY_MODEL, checkpoints_myr: [0.1, 0.2, 0.5, 1], theta: 1 },
      fixed: { ...TINY_FIXED, alpha_dead: 1e-4, active_layer: 'ionization' },
      vary: { alpha_active: { values: [0.01] } },
    });
    expect(explicit.taskAt(0).params.active_layer).toBe('ionization');
    expect(explicit.taskAt(0).params.checkpoints_myr).toEqual([0.1, 0.2]);
    expect(explicit.taskAt(0).pointId).toBe(plain.taskAt(0).pointId);
  });

  it('any change of the resolved input changes the id: grid, end time, checkpoints, a fixed value', () => {
    const base = { name: 'base', vary: { alpha_active: { values: [0.01] } } };
    const reference = sourceOf(base).taskAt(0).pointId;
    const variants = [
      { model: { ...TINY_MODEL, n_cells: 48 } },
      { model: { ...TINY_MODEL, t_end_myr: 0.3 } },
      { model: { ...TINY_MODEL, checkpoints_myr: [0.15, 0.2] } },
      { fixed: { ...TINY_FIXED, m_disk_msun: 0.06 } },
    ].map((change) => sourceOf({ ...base, ...change }).taskAt(0).pointId);
    expect(new Set([reference, ...variants]).size).toBe(5);
  });

  it('depends on the model version', () => {
    const { params, pointId } = sourceOf({ name: 'version', vary: { alpha_active: { values: [0.01] } } }).taskAt(0);
    expect(pointIdOf(params)).toBe(pointId);
    expect(pointIdOf(params, MODEL_VERSION)).toBe(pointId);
    expect(pointIdOf(params, `${MODEL_VERSION}-next`)).not.toBe(pointId);
  });

  it('does not depend on the order in which parameters are written', () => {
    const { params, pointId } = sourceOf({ name: 'order', vary: { alpha_active: { values: [0.01] } } }).taskAt(0);
    const reversed = Object.fromEntries(Object.entries(params).reverse()) as typeof params;
    expect(pointIdOf(reversed)).toBe(pointId);
  });
});
