/** A sampling plan from a unit-cube design: point i is coordinate-wise the design mapped onto each dimension. */
import type { Dimension } from '../sweep-spec.js';
import { checkPointIndex, type PointValue, type SamplingPlan, type UnitSampler } from './sampling-plan.js';
import { valueAtUnit } from './unit-to-value.js';

export function unitDesignPlan(dims: readonly Dimension[], sampler: UnitSampler): SamplingPlan {
  if (sampler.dimensions !== dims.length) {
    throw new RangeError(`design has ${sampler.dimensions} coordinates for ${dims.length} dimensions`);
  }
  const size = sampler.size;
  return {
    size,
    pointAt(i: number): PointValue[] {
      checkPointIndex(i, size);
      return dims.map((dim, d) => valueAtUnit(dim, sampler.unitAt(i, d)));
    },
  };
}
