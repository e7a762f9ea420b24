/** Sampling plans: turn a sweep's varied dimensions into points, any point reachable by index in O(d). */
export { makeSamplingPlan } from './make-sampling-plan.js';
export type { PointValue, SamplingPlan, UnitSampler } from './sampling-plan.js';
export { SOBOL_MAX_DIMENSIONS, SOBOL_MAX_POINTS } from './sobol.js';
