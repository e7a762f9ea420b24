/**
 * The one entry point: dimensions (in spec order) and a sampling spec in, a SamplingPlan out. Checks what the
 * samplers need and reports it as an input error naming the field: ranges that are finite and increasing
 * (and positive for log), a count for every grid range, and each plan's limits (Sobol: the dimensions the
 * hand-copied direction table covers). A range's `count` belongs to grids; the other plans ignore it.
 */
import { DisksweepError } from '../errors.js';
import type { Dimension, SamplingSpec } from '../sweep-spec.js';
import { MAX_PERMUTATION_SIZE } from './feistel-permutation.js';
import { gridPlan } from './grid.js';
import { latinHypercubeSampler } from './latin-hypercube.js';
import { randomSampler } from './random.js';
import type { SamplingPlan } from './sampling-plan.js';
import { SOBOL_MAX_DIMENSIONS, SOBOL_MAX_POINTS, sobolSampler } from './sobol.js';
import { unitDesignPlan } from './unit-design-plan.js';

const invalid = (message: string) => new DisksweepError('input/invalid-parameter', message);

function checkDimension(dim: Dimension): void {
  if (dim.kind === 'values') {
    if (dim.values.length === 0) throw invalid(`vary.${dim.name}.values: must list at least one value (got none)`);
    return;
  }
  const field = `vary.${dim.name}.${dim.kind}`;
  if (!Number.isFinite(dim.min) || !Number.isFinite(dim.max) || !(dim.max > dim.min)) {
    throw invalid(`${field}: must be an increasing range [min, max] of finite numbers (got [${dim.min}, ${dim.max}])`);
  }
  if (dim.kind === 'log' && !(dim.min > 0)) throw invalid(`${field}[0]: must be > 0 for a log range (got ${dim.min})`);
  if (dim.count !== null && !(Number.isInteger(dim.count) && dim.count >= 1)) {
    throw invalid(`vary.${dim.name}.count: must be a whole number >= 1 (got ${dim.count})`);
  }
}

function checkPoints(plan: string, points: number, max: number): void {
  if (!Number.isInteger(points) || points < 1 || points > max) {
    throw invalid(`sampling.points: ${plan} takes a whole number of points in [1, ${max}] (got ${points})`);
  }
}

function checkSeed(seed: number): void {
  if (!Number.isSafeInteger(seed) || seed < 0) throw invalid(`sampling.seed: must be a whole number >= 0 (got ${seed})`);
}

/**
 * The points of a sweep, by index.
 * - `grid`: full factorial, first dimension slowest; size = product of the level counts.
 * - `latin_hypercube`: `points` points (at most 2^32), one per stratum per dimension, seeded by `seed`.
 * - `sobol`: points skip … skip + points − 1 of the Joe & Kuo Sobol sequence (at most 40 dimensions and
 *   2^32 points in all); with skip 0 the first point is the origin of the unit cube, i.e. every range at its min.
 * - `random`: `points` seeded pseudo-random points.
 * @param dims the varied parameters in spec order (`dimensionsOf(spec)`)
 * @param sampling the spec's `sampling` section
 * @throws DisksweepError `input/invalid-parameter` naming the field when the dimensions or plan cannot be sampled
 */
export function makeSamplingPlan(dims: readonly Dimension[], sampling: SamplingSpec): SamplingPlan {
  if (dims.length === 0) throw invalid('vary: must vary at least one parameter (got none)');
  dims.forEach(checkDimension);
  switch (sampling.plan) {
    case 'grid':
      return gridPlan(dims);
    case 'latin_hypercube':
      checkPoints(sampling.plan, sampling.points, MAX_PERMUTATION_SIZE);
      checkSeed(sampling.seed);
      return unitDesignPlan(dims, latinHypercubeSampler(sampling.points, dims.length, sampling.seed));
    case 'sobol': {
      if (dims.length > SOBOL_MAX_DIMENSIONS) {
        throw invalid(
          `vary: sobol supports at most ${SOBOL_MAX_DIMENSIONS} varied parameters (the Joe & Kuo direction numbers ` +
          `carried here end at dimension ${SOBOL_MAX_DIMENSIONS}; got ${dims.length})`,
        );
      }
      if (!Number.isSafeInteger(sampling.skip) || sampling.skip < 0 || sampling.skip >= SOBOL_MAX_POINTS) {
        throw invalid(`sampling.skip: must be a whole number in [0, ${SOBOL_MAX_POINTS}) (got ${sampling.skip})`);
      }
      checkPoints(sampling.plan, sampling.points, SOBOL_MAX_POINTS - sampling.skip);
      return unitDesignPlan(dims, sobolSampler(sampling.points, dims.length, sampling.skip));
    }
    case 'random':
      checkPoints(sampling.plan, sampling.points, Number.MAX_SAFE_INTEGER);
      checkSeed(sampling.seed);
      return unitDesignPlan(dims, randomSampler(sampling.points, dims.length, sampling.seed));
  }
}
