/**
 * The contract every sampler meets: a fixed number of points, and random access to point i in O(d) time and
 * O(1) memory in the number of points, so a sweep of 10⁶ points streams and chunk k is a fixed index range.
 */

/** One coordinate of a point: a number, or a string for a choice parameter's value. */
export type PointValue = number | string;

export interface SamplingPlan {
  /** Number of points. */
  readonly size: number;
  /**
   * Point i (0 <= i < size): one value per dimension, in dimension order (numbers, or strings for choice
   * values). A pure function of i; throws a RangeError for any other i.
   */
  pointAt(i: number): PointValue[];
}

/**
 * A design on the unit cube [0, 1)^d before it is mapped onto the parameter ranges: coordinate d of point i.
 * Latin hypercube, Sobol and random plans are unit samplers; the grid is not (it works on level indices).
 */
export interface UnitSampler {
  /** Number of points. */
  readonly size: number;
  /** Number of coordinates per point. */
  readonly dimensions: number;
  /** Coordinate d (0 <= d < dimensions) of point i (0 <= i < size), in [0, 1). No range checks: callers check. */
  unitAt(i: number, d: number): number;
}

/** Throws a RangeError unless i is a whole number in [0, size). */
export function checkPointIndex(i: number, size: number): void {
  if (!Number.isInteger(i) || i < 0 || i >= size) {
    throw new RangeError(`point index must be a whole number in [0, ${size}) (got ${i})`);
  }
}
