/**
 * A stand-in model for tests of the sweep machinery, loaded by pool threads through DISKSWEEP_MODEL_MODULE.
 * It runs the real disk model, except for points whose alpha_active carries one of the marker values below:
 * those throw, report a non-finite result, or kill their thread, so tests can check that each is stored with
 * the right status and that the sweep goes on. Compiled into dist/ by the build.
 */
import { runModel as realModel } from '../../worker/model.js';
import type { ModelResult } from '../../shared/model-result.js';

/** alpha_active values that trigger a fault (ordinary values are 0.001–0.1 in the tests). */
export const FAULT_MARKERS = { throws: 0.0201, nonFinite: 0.0202, killsThread: 0.0203 } as const;

export function runModel(params: unknown): ModelResult {
  const alpha = (params as { alpha_active?: unknown }).alpha_active;
  if (alpha === FAULT_MARKERS.throws) throw new Error('injected failure: this model throws');
  if (alpha === FAULT_MARKERS.killsThread) process.exit(7);
  const result = realModel(params);
  if (alpha === FAULT_MARKERS.nonFinite) return { ...result, status: 'non_finite', status_reason: 'injected: non-finite surface density' };
  return result;
}
