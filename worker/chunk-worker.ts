/**
 * Entry point of a pool thread. It runs chunks with the disk model, or with the module named by
 * DISKSWEEP_MODEL_MODULE (a file exporting `runModel`: the hook the benchmarks use for a no-op model and the
 * tests for models that fail on purpose). The outcome goes back as UTF-8 JSON in a transferred buffer.
 */
import { pathToFileURL } from 'node:url';
import { move } from 'piscina';
import { runChunk, type ModelFunction } from './chunk-runner.js';

async function loadModel(): Promise<ModelFunction> {
  const override = process.env.DISKSWEEP_MODEL_MODULE;
  const mod = (await import(override === undefined || override === '' ? './model.js' : pathToFileURL(override).href)) as {
    runModel?: ModelFunction;
  };
  if (typeof mod.runModel !== 'function') throw new Error(`model module ${override ?? './model.js'} exports no runModel`);
  return mod.runModel;
}

// Loaded by the first task, not by a top-level await: the pool first tries to require() this file, and on Node
// 20 a require() of a module with a top-level await can abort the whole process while a replacement thread
// starts (seen: "v8::Module::IsGraphAsync ... must be used on an instantiated module", exit 134, after a model
// killed its thread). A module without one loads either way.
let model: Promise<ModelFunction> | null = null;
const encoder = new TextEncoder();

/** Piscina calls the default export for each task; the returned buffer is transferred, not copied. */
export default async function runChunkTask(payload: unknown): Promise<unknown> {
  model ??= loadModel();
  return move(encoder.encode(JSON.stringify(runChunk(payload, await model))));
}
