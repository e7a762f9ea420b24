/**
 * A stand-in model for tests of the sweep machinery, loaded by pool threads through DISKSWEEP_MODEL_MODULE.
 * It runs the real disk model, except for points whose alpha_active carries one of the marker values below:
 * those throw, report a non-finite result, kill their thread, hang for good, or wait at a gate, so tests can check that each
 * is stored with the right status and that the sweep goes on. Compiled into dist/ by the build.
 *
 * The gate lets a fault test hold a sweep in a known state (rows before the gated point committed, the gated
 * chunk active in a worker) for as long as it needs, instead of racing a sweep of millisecond models: a gated
 * point waits until the file named by DISKSWEEP_TEST_GATE exists, then runs the real model (so its result is
 * the same as anywhere else).
 */
import { existsSync } from 'node:fs';
import { runModel as realModel } from '../../worker/model.js';
import type { ModelResult } from '../../shared/model-result.js';

/** alpha_active values that trigger a fault (ordinary values are 0.001–0.1 in the tests). */
export const FAULT_MARKERS = { throws: 0.0201, nonFinite: 0.0202, killsThread: 0.0203, gated: 0.0204, hangs: 0.0205 } as const;

const pause = new Int32Array(new SharedArrayBuffer(4));

function waitAtGate(): void {
  const gate = process.env.DISKSWEEP_TEST_GATE;
  if (gate === undefined || gate === '') return;
  while (!existsSync(gate)) Atomics.wait(pause, 0, 0, 20); // a pool thread: blocking it blocks only this model
}

export function runModel(params: unknown): ModelResult {
  const alpha = (params as { alpha_active?: unknown }).alpha_active;
  if (alpha === FAULT_MARKERS.throws) throw new Error('injected failure: this model throws');
  if (alpha === FAULT_MARKERS.killsThread) process.exit(7);
  if (alpha === FAULT_MARKERS.gated) waitAtGate();
  if (alpha === FAULT_MARKERS.hangs) for (;;) Atomics.wait(pause, 0, 0, 1000); // until the watchdog ends the thread
  const result = realModel(params);
  if (alpha === FAULT_MARKERS.nonFinite) return { ...result, status: 'non_finite', status_reason: 'injected: non-finite surface density' };
  return result;
}
