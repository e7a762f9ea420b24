/** Dimensions for the sampler tests, built as dimensionsOf() would build them from a spec. */
import type { Dimension } from '../../../shared/sweep-spec.js';

export const linear = (name: Dimension['name'], min: number, max: number, count: number | null = null): Dimension =>
  ({ name, kind: 'linear', min, max, count });

export const log = (name: Dimension['name'], min: number, max: number, count: number | null = null): Dimension =>
  ({ name, kind: 'log', min, max, count });

export const values = (name: Dimension['name'], ...list: (number | string)[]): Dimension =>
  ({ name, kind: 'values', values: list });

/** n unit dimensions [0, 1]: a linear range of width 1 from 0 maps u to exactly u (0 + u · 1). */
export const unitDims = (n: number): Dimension[] =>
  Array.from({ length: n }, (_, d) => linear(d % 2 === 0 ? 'alpha_active' : 'alpha_dead', 0, 1));
