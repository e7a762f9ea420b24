/**
 * The sweep spec: what a researcher writes (YAML or JSON) to ask for many models. Validated by zod; every
 * error names its path (`vary.alpha_active.log[1]: must be > 0`). Parameter names, units and ranges come from
 * the one parameter table (model-params.ts) that `disksweep model` uses.
 *
 * ```yaml
 * name: corvid-rift-cores
 * model: { n_cells: 120, t_end_myr: 3 }        # grid, end time, checkpoints (model settings)
 * fixed: { initial_state: infall, t_core_k: 12 } # everything else not varied
 * vary:
 *   m_core_msun: { log: [0.3, 3], count: 4 }
 *   alpha_active: { values: [0.001, 0.01] }
 * sampling: { plan: grid }                      # or latin_hypercube / sobol / random with points and seed
 * chunks: { target_seconds: 2 }                 # or { size: 16 }
 * ```
 */
import { z } from 'zod';
import { PARAMS, allowedText, suggestionFor, type ParamDescriptor, type ParamName } from './model-params.js';

/** Parameters that belong in `model:` (numerics and output settings) rather than `fixed:` (physics). */
export const MODEL_SETTING_NAMES = [
  'n_cells', 'r_in_au', 'r_out_au', 't_end_myr', 'checkpoints_myr', 'theta', 'newton_iterations',
  'step_change', 'max_steps', 'n_series',
] as const satisfies readonly ParamName[];

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
const count = z.number().int({ error: 'must be a whole number' }).min(1, { error: 'must be at least 1' });

/** One varied parameter: explicit values, or a linear or logarithmic range (with a count for grids). */
export const dimensionSpecSchema = z.union([
  z.object({ values: z.array(z.union([finite, z.string()])).min(1, { error: 'must list at least one value' }) }).strict(),
  z.object({ linear: z.tuple([finite, finite]), count: count.optional() }).strict(),
  z.object({ log: z.tuple([finite, finite]), count: count.optional() }).strict(),
], { error: 'expected one of { values: [...] }, { linear: [min, max], count: N } or { log: [min, max], count: N }' });
export type DimensionSpec = z.infer<typeof dimensionSpecSchema>;

export const samplingSpecSchema = z.discriminatedUnion('plan', [
  z.object({ plan: z.literal('grid') }).strict(),
  z.object({ plan: z.literal('latin_hypercube'), points: count, seed: z.number().int().nonnegative() }).strict(),
  z.object({ plan: z.literal('sobol'), points: count, skip: z.number().int().nonnegative().default(0) }).strict(),
  z.object({ plan: z.literal('random'), points: count, seed: z.number().int().nonnegative() }).strict(),
], { error: 'plan must be one of "grid", "latin_hypercube", "sobol", "random"' });
export type SamplingSpec = z.infer<typeof samplingSpecSchema>;

export const chunkSpecSchema = z.union([
  z.object({ size: count.max(10_000, { error: 'must be at most 10000' }) }).strict(),
  z.object({ target_seconds: z.number().min(0.1, { error: 'must be at least 0.1' }).max(600, { error: 'must be at most 600' }) }).strict(),
], { error: 'expected { size: N } or { target_seconds: S }' });
export type ChunkSpec = z.infer<typeof chunkSpecSchema>;

const paramRecord = z.record(z.string(), z.unknown());

export const sweepSpecSchema = z.object({
  name: z.string().min(1).max(200).regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, { error: 'use letters, digits, ".", "_" and "-"' }),
  description: z.string().max(10_000).optional(),
  model: paramRecord.default({}),
  fixed: paramRecord.default({}),
  vary: z.record(z.string(), dimensionSpecSchema).refine((v) => Object.keys(v).length > 0, { message: 'must vary at least one parameter' }),
  sampling: samplingSpecSchema.default({ plan: 'grid' }),
  chunks: chunkSpecSchema.default({ target_seconds: 2 }),
}).strict();
export type SweepSpec = z.infer<typeof sweepSpecSchema>;

/** A varied parameter after validation, in the order the spec lists it. */
export type Dimension =
  | { readonly name: ParamName; readonly kind: 'values'; readonly values: readonly (number | string)[] }
  | { readonly name: ParamName; readonly kind: 'linear' | 'log'; readonly min: number; readonly max: number; readonly count: number | null };

type Issue = { path: (string | number)[]; message: string };

function valueProblem(p: ParamDescriptor, v: unknown): string | null {
  if (p.kind === 'choice') return typeof v === 'string' && p.choices.includes(v) ? null : `must be ${allowedText(p)} (got ${JSON.stringify(v)})`;
  if (p.kind === 'list') return null; // lists are checked by the parameter schema on the resolved point
  if (typeof v !== 'number') return `must be a number, ${allowedText(p)} (got ${JSON.stringify(v)})`;
  const lo = p.minExclusive === true ? v > p.min : v >= p.min;
  const hi = p.maxExclusive === true ? v < p.max : v <= p.max;
  if (!lo || !hi || (p.integer === true && !Number.isInteger(v))) return `must be ${allowedText(p)} (got ${v})`;
  return null;
}

/** Rules the zod shape cannot say: known names, each name in one section, values inside the parameter ranges. */
export function checkSpecSemantics(spec: SweepSpec): Issue[] {
  const issues: Issue[] = [];
  const seen = new Map<string, string>();
  const known = (section: string, name: string): name is ParamName => {
    if (Object.hasOwn(PARAMS, name)) return true;
    issues.push({ path: [section, name], message: `unknown parameter${suggestionFor(name)}` });
    return false;
  };
  const claim = (section: string, name: string) => {
    const before = seen.get(name);
    if (before !== undefined) issues.push({ path: [section, name], message: `is already given under ${before}:` });
    seen.set(name, `${section}`);
  };
  for (const [section, record] of [['model', spec.model], ['fixed', spec.fixed]] as const) {
    for (const [name, value] of Object.entries(record)) {
      if (!known(section, name)) continue;
      claim(section, name);
      const isSetting = (MODEL_SETTING_NAMES as readonly string[]).includes(name);
      if (section === 'model' && !isSetting) issues.push({ path: [section, name], message: 'is a physical parameter: put it under fixed:' });
      if (section === 'fixed' && isSetting) issues.push({ path: [section, name], message: 'is a model setting: put it under model:' });
      const problem = valueProblem(PARAMS[name], value);
      if (problem !== null) issues.push({ path: [section, name], message: problem });
    }
  }
  for (const [name, dim] of Object.entries(spec.vary)) {
    if (!known('vary', name)) continue;
    claim('vary', name);
    const p: ParamDescriptor = PARAMS[name];
    if (p.kind === 'list') {
      issues.push({ path: ['vary', name], message: 'list parameters cannot be varied' });
      continue;
    }
    if ('values' in dim) {
      dim.values.forEach((v, i) => {
        const problem = valueProblem(p, v);
        if (problem !== null) issues.push({ path: ['vary', name, 'values', i], message: problem });
      });
      if (new Set(dim.values).size !== dim.values.length) issues.push({ path: ['vary', name, 'values'], message: 'has repeated values' });
      continue;
    }
    const kind = 'log' in dim ? 'log' : 'linear';
    const [lo, hi] = 'log' in dim ? dim.log : dim.linear;
    if (p.kind === 'choice') {
      issues.push({ path: ['vary', name], message: `is a choice: use { values: [...] } with ${allowedText(p)}` });
      continue;
    }
    [lo, hi].forEach((v, i) => {
      if (kind === 'log' && !(v > 0)) issues.push({ path: ['vary', name, kind, i], message: `must be > 0 (got ${v})` });
      else {
        const problem = valueProblem({ ...p, integer: false }, v);
        if (problem !== null) issues.push({ path: ['vary', name, kind, i], message: problem });
      }
    });
    if (!(hi > lo)) issues.push({ path: ['vary', name, kind], message: `must be an increasing range [min, max] (got [${lo}, ${hi}])` });
    if (p.integer === true) issues.push({ path: ['vary', name], message: 'integer parameters take { values: [...] }' });
    const grid = spec.sampling.plan === 'grid';
    if (grid && dim.count === undefined) issues.push({ path: ['vary', name, 'count'], message: 'a grid needs a count for each range' });
    if (!grid && dim.count !== undefined) issues.push({ path: ['vary', name, 'count'], message: `is only for grids; ${spec.sampling.plan} takes sampling.points` });
  }
  return issues;
}

/** The varied parameters in spec order, as the samplers take them. */
export function dimensionsOf(spec: SweepSpec): Dimension[] {
  return Object.entries(spec.vary).map(([name, dim]): Dimension => {
    const n = name as ParamName;
    if ('values' in dim) return { name: n, kind: 'values', values: dim.values };
    if ('log' in dim) return { name: n, kind: 'log', min: dim.log[0], max: dim.log[1], count: dim.count ?? null };
    return { name: n, kind: 'linear', min: dim.linear[0], max: dim.linear[1], count: dim.count ?? null };
  });
}
