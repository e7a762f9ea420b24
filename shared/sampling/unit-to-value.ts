/**
 * Maps a unit coordinate u in [0, 1) onto a dimension: linear ranges min + u (max − min), logarithmic ranges
 * exp(ln min + u ln(max/min)), explicit lists values[floor(u · length)]. Range values are clamped into
 * [min, max] so rounding never leaves the range.
 */
import type { Dimension } from '../sweep-spec.js';
import type { PointValue } from './sampling-plan.js';

export function valueAtUnit(dim: Dimension, u: number): PointValue {
  if (dim.kind === 'values') return dim.values[Math.min(dim.values.length - 1, Math.floor(u * dim.values.length))];
  const v = dim.kind === 'linear'
    ? dim.min + u * (dim.max - dim.min)
    : Math.exp(Math.log(dim.min) + u * Math.log(dim.max / dim.min));
  return Math.min(dim.max, Math.max(dim.min, v));
}
