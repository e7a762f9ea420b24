/**
 * Run every point of a chunk with a model function. A model's numerical failure is part of its result; an
 * exception is caught here and reported as an infrastructure outcome, so one bad point never loses the chunk.
 */
import { hostname } from 'node:os';
import { chunkTaskSchema, type ChunkOutcomePayload, type PointOutcome } from '../shared/job-payload.js';
import type { ModelResult } from '../shared/model-result.js';

export type ModelFunction = (params: unknown) => ModelResult;

export function runChunk(payload: unknown, model: ModelFunction): ChunkOutcomePayload {
  const task = chunkTaskSchema.parse(payload);
  const points: PointOutcome[] = task.points.map((p) => {
    try {
      return { point_index: p.point_index, point_id: p.point_id, outcome: { kind: 'model', result: model(p.params) } };
    } catch (error) {
      const reason = error instanceof Error ? `${error.name}: ${error.message}` : `thrown: ${String(error)}`;
      return { point_index: p.point_index, point_id: p.point_id, outcome: { kind: 'infrastructure', reason: reason.slice(0, 2000) } };
    }
  });
  return { sweep_id: task.sweep_id, chunk_index: task.chunk_index, worker_host: hostname(), points };
}
