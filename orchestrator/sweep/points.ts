/**
 * From a validated spec to the points of its sweep: point i is the sampler's i-th value vector merged over
 * the spec's model settings and fixed parameters, with every default filled in. Its id hashes that fully
 * resolved input plus the model version, so the same model in another sweep (or an edited spec) has the same id.
 */
import { DisksweepError } from '../../shared/errors.js';
import { contentHash } from '../../shared/hashing.js';
import { parseModelParams, type ModelParams } from '../../shared/model-params.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { makeSamplingPlan } from '../../shared/sampling/index.js';
import type { Dimension, SweepSpec } from '../../shared/sweep-spec.js';
import { derivedConstraintProblems } from '../../worker/model-setup.js';

export interface PointTask {
  readonly pointIndex: number;
  readonly pointId: string;
  readonly params: ModelParams;
}

export interface PointSource {
  readonly size: number;
  taskAt(i: number): PointTask;
}

/** Hex characters of a point id (128 bits: collisions are not a concern at 10^6–10^9 points). */
const POINT_ID_LENGTH = 32;

export function pointIdOf(params: ModelParams, modelVersion = MODEL_VERSION): string {
  return contentHash({ model_version: modelVersion, params }).slice(0, POINT_ID_LENGTH);
}

function rawPoint(spec: SweepSpec, dims: readonly Dimension[], values: readonly (number | string)[]): Record<string, unknown> {
  const raw: Record<string, unknown> = { ...spec.model, ...spec.fixed };
  dims.forEach((d, k) => (raw[d.name] = values[k]));
  return raw;
}

export function makePointSource(spec: SweepSpec, dims: readonly Dimension[]): PointSource {
  const plan = makeSamplingPlan(dims, spec.sampling);
  return {
    size: plan.size,
    taskAt(i: number): PointTask {
      const params = parseModelParams(rawPoint(spec, dims, plan.pointAt(i)));
      return { pointIndex: i, pointId: pointIdOf(params), params };
    },
  };
}

/** At most this many corner combinations are checked; beyond it each dimension's extremes are checked alone. */
const MAX_CORNERS = 4096;

function extremes(d: Dimension): (number | string)[] {
  if (d.kind !== 'values') return [d.min, d.max];
  const numbers = d.values.filter((v): v is number => typeof v === 'number');
  const strings = d.values.filter((v): v is string => typeof v === 'string');
  return numbers.length > 0 ? [Math.min(...numbers), Math.max(...numbers), ...strings] : strings;
}

/**
 * Check the parameter rules (ranges, cross-parameter rules, the infall radius against the grid) on the corners
 * of the swept box. Every rule is monotone in each parameter, so a box whose corners pass has no failing
 * interior point; each problem is reported once with the corner that shows it.
 */
export function checkParameterBox(spec: SweepSpec, dims: readonly Dimension[]): string[] {
  const options = dims.map(extremes);
  const total = options.reduce((n, o) => n * o.length, 1);
  const corners: (number | string)[][] = [];
  if (total <= MAX_CORNERS) {
    const walk = (k: number, acc: (number | string)[]) => {
      if (k === dims.length) corners.push([...acc]);
      else for (const v of options[k]) walk(k + 1, [...acc, v]);
    };
    walk(0, []);
  } else {
    const base = options.map((o) => o[0]);
    options.forEach((o, k) => o.forEach((v) => corners.push(base.map((b, j) => (j === k ? v : b)))));
  }
  const problems = new Map<string, string>();
  for (const corner of corners) {
    let details: readonly string[];
    try {
      details = derivedConstraintProblems(parseModelParams(rawPoint(spec, dims, corner)));
    } catch (error) {
      if (!(error instanceof DisksweepError)) throw error;
      details = error.details;
    }
    const where = dims.map((d, k) => `${d.name}=${corner[k]}`).join(', ');
    for (const d of details) {
      const key = d.split(':')[0];
      if (!problems.has(key)) problems.set(key, `${d} [at the corner ${where}]`);
    }
  }
  return [...problems.values()];
}
