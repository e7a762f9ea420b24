/**
 * The parameter space of a stored sweep, read from its stored spec: which parameters were varied, over what
 * range, sampled how (linear, log, or an explicit list), and the checkpoint times its models record. Boxes
 * (PRIM) and bins (marginals) of a log-sampled parameter are made in log10 of its value.
 */
import { PARAMS } from '../../shared/model-params.js';
import { dimensionsOf, type Dimension } from '../../shared/sweep-spec.js';
import { parseSpecText } from '../spec/load-spec.js';
import type { SweepRecord } from '../store/store-types.js';

/** How the spec sampled a parameter: a linear or log range, or an explicit list of values. */
export type ParameterScale = 'linear' | 'log' | 'values';

/** One varied parameter of a sweep. */
export interface VariedParameter {
  readonly name: string;
  /** Unit of its values ('' for a choice). */
  readonly unit: string;
  readonly description: string;
  readonly scale: ParameterScale;
  /** `choice`: values are strings; evaluations carry the index into `values` instead. */
  readonly kind: 'number' | 'choice';
  /** Sampled range: the spec's [min, max], the extremes of a list, or [0, n-1] for a choice's indexes. */
  readonly min: number;
  readonly max: number;
  /** The explicit list of a `values` parameter, in spec order; null for ranges. */
  readonly values: readonly (number | string)[] | null;
  /** Grid points along a range (null for other plans and for lists). */
  readonly count: number | null;
  /**
   * True when boxes and bins work in log10 of the value: a log range, or a list of positive numbers of a
   * parameter the parameter table marks as log-scaled.
   */
  readonly logSpace: boolean;
}

/** A parameter's name with its unit, for axis labels and table headings: `m_disk_msun [M_sun]`, just the name when it has none (or is dimensionless). */
export function parameterLabel(p: Pick<VariedParameter, 'name' | 'unit'>): string {
  return p.unit === '' || p.unit === '1' ? p.name : `${p.name} [${p.unit}]`;
}

export interface SweepSpace {
  readonly parameters: readonly VariedParameter[];
  /** Checkpoint times (Myr, ascending) the sweep's models record (those up to the longest t_end_myr). */
  readonly checkpointTimes: readonly number[];
  /** Largest and smallest t_end_myr of the sweep's points. */
  readonly tEndMyr: { readonly min: number; readonly max: number };
  /** Value of a parameter the sweep does not vary (fixed, model setting or default). */
  fixedValue(name: string): unknown;
  /** The solar-like split thresholds all its points ran with (f_mass_star, f_j_disk_max); null if it varies them. */
  readonly splitThresholds: { readonly fMass: number; readonly fJ: number } | null;
}

function varied(d: Dimension): VariedParameter {
  const p = PARAMS[d.name];
  const unit = p.kind === 'choice' ? '' : p.unit;
  if (d.kind !== 'values') {
    return { name: d.name, unit, description: p.description, scale: d.kind, kind: 'number', min: d.min, max: d.max, values: null, count: d.count, logSpace: d.kind === 'log' };
  }
  if (p.kind === 'choice' || d.values.some((v) => typeof v === 'string')) {
    return { name: d.name, unit, description: p.description, scale: 'values', kind: 'choice', min: 0, max: d.values.length - 1, values: d.values, count: null, logSpace: false };
  }
  const nums = d.values as readonly number[];
  const logSpace = p.kind === 'number' && p.logScale === true && nums.every((v) => v > 0);
  return { name: d.name, unit, description: p.description, scale: 'values', kind: 'number', min: Math.min(...nums), max: Math.max(...nums), values: nums, count: null, logSpace };
}

/** The space of a stored sweep (its spec was validated when it was stored; it is validated again here). */
export function sweepSpace(sweep: SweepRecord): SweepSpace {
  const { spec } = parseSpecText(sweep.specJson, `sweep ${sweep.name}`, 'json');
  const dims = dimensionsOf(spec);
  const parameters = dims.map(varied);
  const fixed: Record<string, unknown> = { ...spec.model, ...spec.fixed };
  const fixedValue = (name: string): unknown => (Object.hasOwn(fixed, name) ? fixed[name] : (PARAMS as Record<string, { default: unknown }>)[name]?.default);
  const tEnd = parameters.find((p) => p.name === 't_end_myr');
  const tEndMyr = tEnd === undefined ? { min: Number(fixedValue('t_end_myr')), max: Number(fixedValue('t_end_myr')) } : { min: tEnd.min, max: tEnd.max };
  const listed = fixedValue('checkpoints_myr');
  const times = Array.isArray(listed) ? listed.filter((t): t is number => typeof t === 'number' && t <= tEndMyr.max) : [];
  const varies = parameters.some((p) => p.name === 'f_mass_star' || p.name === 'f_j_disk_max');
  const splitThresholds = varies ? null : { fMass: Number(fixedValue('f_mass_star')), fJ: Number(fixedValue('f_j_disk_max')) };
  return { parameters, checkpointTimes: [...new Set(times)].sort((a, b) => a - b), tEndMyr, fixedValue, splitThresholds };
}
