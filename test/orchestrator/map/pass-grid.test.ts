/**
 * Binning for maps: one bin per grid value (edges halfway, in log10 for log parameters), equal bins over the
 * range for non-grid sweeps, values outside clamped into the outer bins, cells counting points and passes.
 */
import { describe, expect, it } from 'vitest';
import { mapAxis, passGrid } from '../../../orchestrator/map/pass-grid.js';
import type { Evaluation, VariedParameter } from '../../../orchestrator/query/index.js';

const param = (over: Partial<VariedParameter>): VariedParameter => ({
  name: 'alpha_active', unit: '1', description: '', scale: 'log', kind: 'number', min: 1e-3, max: 1e-1, values: null, count: null, logSpace: true, ...over,
});

function evaluation(parameters: VariedParameter[], values: number[][], pass: number[]): Evaluation {
  return {
    parameters,
    values: values.map((v) => Float64Array.from(v)),
    pass: Uint8Array.from(pass),
    pointIndex: Uint32Array.from(pass.map((_, i) => i)),
    counts: { points: pass.length, ok: pass.length, selected: pass.length, passed: pass.reduce((a, b) => a + b, 0) },
    sweep: { name: 'synthetic' },
  } as unknown as Evaluation;
}

describe('map axes', () => {
  it('grid ranges get one bin per level, edges halfway in log10 for log parameters', () => {
    const a = mapAxis(param({ count: 3 }), 12, true); // levels 1e-3, 1e-2, 1e-1
    expect(a.axis).toBe('log');
    const logs = a.edges.map(Math.log10);
    for (const [k, want] of [-3.5, -2.5, -1.5, -0.5].entries()) expect(logs[k]).toBeCloseTo(want, 12);
  });

  it('non-grid ranges get equal bins over the range; linear parameters linear bins', () => {
    const a = mapAxis(param({ count: 3 }), 4, false);
    expect(a.edges.map(Math.log10).map((v) => Number(v.toFixed(12)))).toEqual([-3, -2.5, -2, -1.5, -1]);
    const b = mapAxis(param({ name: 'm_core_msun', unit: 'M_sun', scale: 'linear', logSpace: false, min: 0.5, max: 2.5 }), 4, false);
    expect(b.axis).toBe('linear');
    expect(b.edges).toEqual([0.5, 1, 1.5, 2, 2.5]);
    expect(b.label).toBe('m_core_msun [M_sun]');
  });

  it('listed values and choices get one bin per value', () => {
    const l = mapAxis(param({ scale: 'values', values: [1e-3, 1e-1, 1e-2], logSpace: true, count: null }), 12, false);
    expect(l.edges).toHaveLength(4);
    const c = mapAxis(param({ name: 'active_layer', unit: '', kind: 'choice', scale: 'values', values: ['uniform', 'ionization'], logSpace: false }), 12, false);
    expect(c.edges).toEqual([-0.5, 0.5, 1.5]);
    expect(c.categories).toEqual(['uniform', 'ionization']);
    expect(c.label).toBe('active_layer');
  });
});

describe('pass grid', () => {
  const px = param({ name: 'alpha_active' });
  const py = param({ name: 'm_core_msun', unit: 'M_sun', scale: 'linear', logSpace: false, min: 0, max: 2 });

  it('counts points and passes per cell, clamping values at the range ends', () => {
    // 2 x 2 bins: alpha 1e-3..1e-2..1e-1, m 0..1..2.
    const ev = evaluation([px, py], [[2e-3, 3e-3, 5e-2, 5e-2, 1e-1, 9e-4], [0.5, 0.5, 0.5, 1.5, 2, 0]], [1, 0, 1, 1, 0, 1]);
    const g = passGrid(ev, 'alpha_active', 'm_core_msun', { bins: 2, gridPlan: false });
    // cell (0,0): alpha<1e-2, m<1: points 0, 1, 5 (5 clamped from below), 2 pass.
    expect(Array.from(g.counts)).toEqual([3, 1, 0, 2]);
    expect(Array.from(g.passes)).toEqual([2, 1, 0, 1]);
    expect(g.fractions[0]).toBeCloseTo(2 / 3, 15);
    expect(Number.isNaN(g.fractions[2])).toBe(true);
  });

  it('refuses a parameter the sweep does not vary, and the same one twice', () => {
    const ev = evaluation([px, py], [[1e-2], [1]], [1]);
    expect(() => passGrid(ev, 'r1_au', 'm_core_msun', { bins: 4, gridPlan: false })).toThrow(/--x r1_au: not a parameter .* varies/);
    expect(() => passGrid(ev, 'alpha_active', 'alpha_active', { bins: 4, gridPlan: false })).toThrow(/two different parameters/);
  });
});
