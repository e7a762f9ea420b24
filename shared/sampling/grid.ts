/**
 * Full-factorial grid: every combination of every dimension's levels, the first listed dimension varying
 * slowest (as nested loops in spec order). A linear range of count n has levels min + k (max − min)/(n − 1),
 * a logarithmic one exp(ln min + k/(n − 1) ln(max/min)); both pin k = 0 to min and k = n − 1 to max exactly,
 * and count 1 gives min alone. An explicit list's levels are its values in order.
 */
import { DisksweepError } from '../errors.js';
import type { Dimension } from '../sweep-spec.js';
import { checkPointIndex, type PointValue, type SamplingPlan } from './sampling-plan.js';

/** The number of levels a dimension has on a grid; a range without a count is a spec error. */
export function gridLevelCount(dim: Dimension): number {
  if (dim.kind === 'values') return dim.values.length;
  if (dim.count === null) {
    throw new DisksweepError('input/invalid-parameter', `vary.${dim.name}.count: a grid needs a count for each range (got none)`);
  }
  return dim.count;
}

/** Level k (0 <= k < count) of a dimension on a grid. */
export function gridLevel(dim: Dimension, k: number, count: number): PointValue {
  if (dim.kind === 'values') return dim.values[k];
  if (k === 0 || count === 1) return dim.min;
  if (k === count - 1) return dim.max;
  const t = k / (count - 1);
  const v = dim.kind === 'linear'
    ? dim.min + (k * (dim.max - dim.min)) / (count - 1)
    : Math.exp(Math.log(dim.min) + t * Math.log(dim.max / dim.min));
  return Math.min(dim.max, Math.max(dim.min, v));
}

export function gridPlan(dims: readonly Dimension[]): SamplingPlan {
  const counts = dims.map(gridLevelCount);
  const size = counts.reduce((a, b) => a * b, 1);
  if (!Number.isSafeInteger(size)) {
    throw new DisksweepError('input/invalid-parameter', `vary: a grid of ${counts.join(' × ')} points is too large (at most ${Number.MAX_SAFE_INTEGER} points)`);
  }
  return {
    size,
    pointAt(i: number): PointValue[] {
      checkPointIndex(i, size);
      const point = new Array<PointValue>(dims.length);
      let rest = i;
      for (let d = dims.length - 1; d >= 0; d--) {
        const k = rest % counts[d];
        rest = (rest - k) / counts[d];
        point[d] = gridLevel(dims[d], k, counts[d]);
      }
      return point;
    },
  };
}
