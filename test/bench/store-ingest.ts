/**
 * SQLite ingest: synthetic outcomes written through the store's own `writeResults`, in batches, into a fresh
 * temporary database per round. The outcomes are one real model result repeated under distinct point ids (so
 * the key and id indexes see what a sweep gives them: random 32-hex ids, increasing indexes).
 *
 * Rows are every row the batch creates: one in points, one in results, one per checkpoint, one in series;
 * they are counted in the database afterwards. The clock covers the writeResults calls, with the store's own
 * periodic WAL checkpoints (a running sweep's steady state), not the final checkpoint of close. Rates are by
 * wall time (what a sweep waits for) and by the process CPU time (less sensitive to other load on a shared
 * machine; it leaves out the fsyncs of WAL checkpoints, which wall time includes). Bytes per point: the
 * database file after close (WAL checkpointed).
 */
import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { join } from 'node:path';
import { parseModelParams } from '../../shared/model-params.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { openStore, type StoredOutcome } from '../../orchestrator/store/index.js';
import { runValidatedModel } from '../../worker/model.js';
import { median, progress, sig } from './stats.js';
import { withTempDir } from './temp-files.js';

export interface IngestCase {
  /** Model parameters of the one real result that every synthetic outcome carries. */
  readonly params: Record<string, unknown>;
  readonly points: number;
  readonly batch: number;
  readonly rounds: number;
}

export interface IngestReport {
  params: Record<string, unknown>;
  points: number;
  batch_points: number;
  rounds: number;
  rows_per_point: number;
  checkpoints_per_point: number;
  /** Values bound per point (parameter, result, checkpoint and series columns). */
  values_per_point: number;
  /** Median over rounds, by wall time. */
  rows_per_s: number;
  rows_per_s_best: number;
  points_per_s: number;
  /** Median over rounds, by process CPU time. */
  rows_per_cpu_s: number;
  bytes_per_point: number;
}

const sha = (text: string): string => createHash('sha256').update(text).digest('hex');

interface Round {
  wallS: number;
  cpuS: number;
  rows: number;
  bytes: number;
}

function oneRound(dir: string, c: IngestCase, round: number, template: Omit<StoredOutcome, 'pointId' | 'pointIndex' | 'sweepId'>): Round {
  const file = join(dir, `ingest-${round}.sqlite`);
  const sweepId = sha(`bench-ingest:${round}`);
  const store = openStore(file, { mode: 'write' });
  store.registerSweep({
    sweepId, name: 'bench-ingest', specJson: '{}', specHash: sha('{}'), modelVersion: MODEL_VERSION, nPoints: c.points, chunkSize: c.batch,
  });
  // Batches are built before the clock starts: the store is timed, not the making of test data.
  const batches: StoredOutcome[][] = [];
  for (let first = 0; first < c.points; first += c.batch) {
    const batch: StoredOutcome[] = [];
    for (let i = first; i < Math.min(c.points, first + c.batch); i++) {
      batch.push({ ...template, sweepId, pointId: sha(`point:${round}:${i}`).slice(0, 32), pointIndex: i, finishedAt: 1_700_000_000_000 + i });
    }
    batches.push(batch);
  }
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  for (const b of batches) store.writeResults(b);
  const wallS = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  store.close(); // not timed: the final full checkpoint happens once per sweep, not per batch
  const raw = new Database(file, { readonly: true });
  const count = (table: string): number => raw.prepare(`SELECT count(*) FROM ${table}`).pluck().get() as number;
  const rows = count('points') + count('results') + count('checkpoints') + count('series');
  raw.close();
  return { wallS, cpuS: (cpu.user + cpu.system) / 1e6, rows, bytes: statSync(file).size };
}

export function benchIngest(label: string, c: IngestCase): IngestReport {
  const params = parseModelParams(c.params);
  const result = runValidatedModel(params);
  const template = { params, outcome: { kind: 'model' as const, result }, workerHost: 'bench-host' };
  const rounds = withTempDir('disksweep-bench-ingest-', (dir) =>
    Array.from({ length: c.rounds }, (_, k) => {
      const r = oneRound(dir, c, k, template);
      progress(`${label}: round ${k + 1}/${c.rounds}: ${Math.round(r.rows / r.wallS)} rows/s (${Math.round(r.rows / r.cpuS)} per CPU s)`);
      return r;
    }),
  );
  const rowsPerPoint = rounds[0].rows / c.points;
  const cps = result.checkpoints.length;
  const valuesPerPoint =
    5 + Object.keys(params).length + (12 + Object.keys(result.scalars).length) + cps * (1 + Object.keys(result.checkpoints[0] ?? {}).length) + 4;
  return {
    params: c.params,
    points: c.points,
    batch_points: c.batch,
    rounds: c.rounds,
    rows_per_point: rowsPerPoint,
    checkpoints_per_point: cps,
    values_per_point: valuesPerPoint,
    rows_per_s: sig(median(rounds.map((r) => r.rows / r.wallS))),
    rows_per_s_best: sig(Math.max(...rounds.map((r) => r.rows / r.wallS))),
    points_per_s: sig(median(rounds.map((r) => c.points / r.wallS))),
    rows_per_cpu_s: sig(median(rounds.map((r) => r.rows / r.cpuS))),
    bytes_per_point: Math.round(median(rounds.map((r) => r.bytes / c.points))),
  };
}
