/**
 * Identity and shape of a sweep: its id (hash of the canonical spec without name, description or chunk
 * settings, so renaming or re-chunking a spec keeps its results), its points, and its chunk size (from the spec,
 * or calibrated once on a few of its own points and then stored, so a resume never moves chunk boundaries).
 */
import { contentHash } from '../../shared/hashing.js';
import type { ChunkOutcomePayload } from '../../shared/job-payload.js';
import type { SweepSpec } from '../../shared/sweep-spec.js';
import type { LoadedSpec } from '../spec/load-spec.js';
import type { Transport } from '../transport/transport.js';
import { makePointSource, type PointSource } from './points.js';

/**
 * Calibrated chunks hold at most this many points: a chunk's outcome is parsed and committed on the
 * orchestrator's one thread, and one result job carries it through Redis, so both stay small even for models
 * that take microseconds.
 */
export const MAX_CHUNK_SIZE = 1000;

export function sweepIdOf(spec: SweepSpec): string {
  const { name: _name, description: _description, chunks: _chunks, ...content } = spec;
  // The order of `vary` decides the order of the points (grid: first dimension slowest; designs: coordinate
  // d), and point indexes and chunk boundaries rest on that order. canonicalJson sorts object keys, so the
  // varied parameters are hashed as [name, range] pairs in spec order: a reordered spec is another sweep
  // (whose unchanged points are reused by id), never the same sweep with its points silently renumbered.
  return contentHash({ ...content, vary: Object.entries(content.vary) });
}

/**
 * The spec as stored with its sweep and read back by `resume`: JSON that keeps the spec's key order (the
 * order of `vary` is part of the sweep; canonical JSON would sort it away).
 */
export function storedSpecJson(spec: SweepSpec): string {
  return JSON.stringify(spec);
}

export interface SweepPlan {
  readonly sweepId: string;
  readonly spec: SweepSpec;
  readonly source: PointSource;
}

export function planSweep(loaded: LoadedSpec): SweepPlan {
  return { sweepId: sweepIdOf(loaded.spec), spec: loaded.spec, source: makePointSource(loaded.spec, loaded.dimensions) };
}

/** Indexes used for calibration: spread over the sweep so one corner of parameter space does not decide. */
export function calibrationIndexes(size: number, count = 3): number[] {
  if (size <= count) return Array.from({ length: size }, (_, i) => i);
  return [...new Set(Array.from({ length: count }, (_, k) => Math.round((k * (size - 1)) / (count - 1))))];
}

export interface Calibration {
  /** Median model time, seconds (first runs in fresh threads include JIT warm-up, so this errs high). */
  readonly secondsPerPoint: number;
  readonly chunkSize: number;
  /** The calibration models' outcomes: real points of the sweep, to be stored like any other. */
  readonly outcomes: ChunkOutcomePayload[];
}

/** Run a few of the sweep's own points through `transport` (then closed) and derive the chunk size. */
export async function calibrate(plan: SweepPlan, transport: Transport, targetSeconds: number): Promise<Calibration> {
  const outcomes: ChunkOutcomePayload[] = [];
  transport.onOutcome(async (o) => {
    outcomes.push(o);
  });
  for (const i of calibrationIndexes(plan.source.size)) {
    const t = plan.source.taskAt(i);
    await transport.submit({ sweep_id: plan.sweepId, chunk_index: 0, points: [{ point_index: i, point_id: t.pointId, params: t.params }] });
  }
  await transport.close('graceful');
  const times = outcomes
    .flatMap((o) => o.points)
    .map((p) => (p.outcome.kind === 'model' ? p.outcome.result.timing.wall_ms / 1000 : NaN))
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
  const secondsPerPoint = times.length > 0 ? times[Math.floor(times.length / 2)] : NaN;
  const chunkSize = Number.isFinite(secondsPerPoint) && secondsPerPoint > 0
    ? Math.max(1, Math.min(MAX_CHUNK_SIZE, Math.round(targetSeconds / secondsPerPoint)))
    : 1;
  return { secondsPerPoint, chunkSize, outcomes };
}
