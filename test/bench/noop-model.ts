/**
 * A model that does no physics, for measuring the sweep machinery alone (spec -> points -> pool -> store).
 * Pool threads load it through DISKSWEEP_MODEL_MODULE. Each call returns the smallest result the schema
 * accepts: status ok, every scalar output present (null where the registry allows it, else 0 or false), no
 * checkpoints, an empty series. The template is checked against modelResultSchema once, when the module loads,
 * so a change of the registry or the schema fails here loudly instead of in the store. Compiled into dist/.
 */
import { SCALAR_OUTPUTS } from '../../shared/model-outputs.js';
import { modelResultSchema, type ModelResult } from '../../shared/model-result.js';
import { MODEL_VERSION } from '../../shared/model-version.js';

const TEMPLATE: ModelResult = modelResultSchema.parse({
  model_version: MODEL_VERSION,
  status: 'ok',
  status_reason: null,
  scalars: Object.fromEntries(SCALAR_OUTPUTS.map((d) => [d.name, d.nullable ? null : d.type === 'flag' ? false : 0])),
  checkpoints: [],
  series: { columns: [], n_samples: 0, f32le_base64: '' },
  timing: { wall_ms: 0, steps: 0, rejected_steps: 0 },
});

/** Ignores its parameters (the sweep resolved and validated them already) and returns at once. */
export function runModel(_params: unknown): ModelResult {
  const t0 = performance.now();
  return { ...TEMPLATE, timing: { wall_ms: performance.now() - t0, steps: 0, rejected_steps: 0 } };
}
