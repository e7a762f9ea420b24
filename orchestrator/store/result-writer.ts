/**
 * Writing outcomes: one transaction per batch, statements prepared once. For each outcome the point row is
 * inserted if new, then the result is upserted by (sweep_id, point_id) with `WHERE results.status <> 'ok'`:
 * an ok row is never overwritten, and its checkpoints and series are not touched. When a row is written, its
 * checkpoints and series are replaced together with it (an infrastructure failure has none).
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import { PARAMS } from '../../shared/model-params.js';
import type { ModelResult } from '../../shared/model-result.js';
import {
  BASE_COLUMNS,
  CHECKPOINT_COLUMNS,
  PARAM_COLUMNS,
  SCALAR_COLUMNS,
  ident,
  outputToSql,
  paramToSql,
  tableColumns,
} from './registry-columns.js';
import { INFRASTRUCTURE_ERROR, type StoredOutcome, type WriteSummary } from './store-types.js';

type SqlValue = number | string | Buffer | null;

const placeholders = (n: number): string => Array.from({ length: n }, () => '?').join(', ');

/** Columns of a table that neither the migration nor the registry knows (left by an older registry). */
function strayColumns(db: Database.Database, table: 'results', registry: readonly { name: string }[]): string[] {
  const known = new Set([...BASE_COLUMNS[table], ...registry.map((c) => c.name)]);
  return [...tableColumns(db, table).keys()].filter((c) => !known.has(c));
}

export class ResultWriter {
  private readonly upsertPoint: Database.Statement<SqlValue[]>;
  private readonly upsertResult: Database.Statement<SqlValue[]>;
  private readonly deleteCheckpoints: Database.Statement<[string, string]>;
  private readonly insertCheckpoint: Database.Statement<SqlValue[]>;
  private readonly deleteSeries: Database.Statement<[string, string]>;
  private readonly insertSeries: Database.Statement<SqlValue[]>;
  private readonly sweepSize: Database.Statement<[string]>;
  private readonly currentStatus: Database.Statement<[string, string]>;
  private readonly touchSweep: Database.Statement<[number, string]>;
  private readonly runBatch: (batch: readonly StoredOutcome[]) => WriteSummary;

  constructor(
    db: Database.Database,
    private readonly now: () => number,
  ) {
    const paramCols = PARAM_COLUMNS.map((c) => ident(c.name));
    this.upsertPoint = db.prepare<SqlValue[]>(
      `INSERT INTO points (sweep_id, point_id, point_index, ${paramCols.join(', ')})
       VALUES (${placeholders(3 + paramCols.length)})
       ON CONFLICT (sweep_id, point_id) DO NOTHING`,
    );

    const updatable = [
      'status', 'status_reason', 'model_version', 'steps', 'rejected_steps', 'wall_ms', 'worker_host', 'finished_at',
      ...SCALAR_COLUMNS.map((c) => c.name),
    ].map(ident);
    // point_index stays as first written: it equals points.point_index, which a later outcome never moves.
    const resultCols = [ident('point_index'), ...updatable];
    const stray = strayColumns(db, 'results', SCALAR_COLUMNS).map(ident);
    const assignments = [...updatable.map((c) => `${c} = excluded.${c}`), ...stray.map((c) => `${c} = NULL`)];
    this.upsertResult = db.prepare<SqlValue[]>(
      `INSERT INTO results (sweep_id, point_id, ${resultCols.join(', ')})
       VALUES (${placeholders(2 + resultCols.length)})
       ON CONFLICT (sweep_id, point_id) DO UPDATE SET ${assignments.join(', ')}
       WHERE results.status <> 'ok'`,
    );

    const cpCols = CHECKPOINT_COLUMNS.map((c) => ident(c.name));
    this.deleteCheckpoints = db.prepare('DELETE FROM checkpoints WHERE sweep_id = ? AND point_id = ?');
    this.insertCheckpoint = db.prepare<SqlValue[]>(
      `INSERT INTO checkpoints (sweep_id, point_id, t_myr, ${cpCols.join(', ')}) VALUES (${placeholders(3 + cpCols.length)})`,
    );
    this.deleteSeries = db.prepare('DELETE FROM series WHERE sweep_id = ? AND point_id = ?');
    this.insertSeries = db.prepare<SqlValue[]>(
      'INSERT INTO series (sweep_id, point_id, columns, n_samples, data) VALUES (?, ?, ?, ?, ?)',
    );
    this.sweepSize = db.prepare('SELECT n_points FROM sweeps WHERE sweep_id = ?').pluck();
    this.currentStatus = db.prepare('SELECT status FROM results WHERE sweep_id = ? AND point_id = ?').pluck();
    this.touchSweep = db.prepare('UPDATE sweeps SET updated_at = ? WHERE sweep_id = ?');
    this.runBatch = db.transaction((batch: readonly StoredOutcome[]) => this.writeInTransaction(batch));
  }

  /**
   * Write a batch in one transaction (all or nothing). The batch is trusted to be typed; outcomes that came
   * from outside the process go through `parseStoredOutcomes` first.
   */
  writeResults(batch: readonly StoredOutcome[]): WriteSummary {
    if (batch.length === 0) return { written: 0, skippedOk: 0 };
    return this.runBatch(batch);
  }

  private writeInTransaction(batch: readonly StoredOutcome[]): WriteSummary {
    const t = this.now();
    const sizes = new Map<string, number>();
    for (const sweepId of new Set(batch.map((o) => o.sweepId))) {
      const size: unknown = this.sweepSize.get(sweepId);
      if (typeof size !== 'number') {
        throw new DisksweepError('store/unknown-sweep', `results for sweep ${sweepId}, which this database does not hold (register it first)`);
      }
      sizes.set(sweepId, size);
      this.touchSweep.run(t, sweepId);
    }
    let written = 0;
    for (const item of batch) {
      const size = sizes.get(item.sweepId) ?? 0;
      if (!Number.isInteger(item.pointIndex) || item.pointIndex < 0 || item.pointIndex >= size) {
        throw new DisksweepError(
          'store/invalid-outcome',
          `point ${item.pointId}: point index ${item.pointIndex} is outside sweep ${item.sweepId} (0 ... ${size - 1})`,
        );
      }
      const params = pointValues(item);
      // A look first (a read, no write) spares new points the deletes below. Whether a row is written is
      // decided by the upsert's own WHERE clause alone: an ok row is never overwritten.
      const before: unknown = this.currentStatus.get(item.sweepId, item.pointId);
      if (before === undefined) this.upsertPoint.run(item.sweepId, item.pointId, item.pointIndex, ...params);
      const changes = this.upsertResult.run(item.sweepId, item.pointId, ...resultValues(item, t)).changes;
      if (changes === 0) continue;
      written++;
      if (before !== undefined) {
        this.deleteCheckpoints.run(item.sweepId, item.pointId);
        this.deleteSeries.run(item.sweepId, item.pointId);
      }
      if (item.outcome.kind === 'model') this.writeDetail(item.sweepId, item.pointId, item.outcome.result);
    }
    return { written, skippedOk: batch.length - written };
  }

  private writeDetail(sweepId: string, pointId: string, r: ModelResult): void {
    for (const cp of r.checkpoints) {
      const values = CHECKPOINT_COLUMNS.map((c) => outputToSql(cp[c.name as keyof typeof cp]));
      this.insertCheckpoint.run(sweepId, pointId, cp.t_myr, ...values);
    }
    const bytes = Buffer.from(r.series.f32le_base64, 'base64');
    const expected = r.series.n_samples * r.series.columns.length * 4;
    if (bytes.length !== expected) {
      throw new DisksweepError(
        'store/invalid-outcome',
        `point ${pointId}: series holds ${bytes.length} bytes, expected ${r.series.n_samples} x ${r.series.columns.length} float32 = ${expected}`,
      );
    }
    this.insertSeries.run(sweepId, pointId, JSON.stringify(r.series.columns), r.series.n_samples, bytes);
  }
}

/** The parameter columns of a point, in PARAM_COLUMNS order; every parameter must be present and known. */
function pointValues(item: StoredOutcome): (number | string)[] {
  for (const name of Object.keys(item.params)) {
    if (!Object.hasOwn(PARAMS, name)) {
      throw new DisksweepError('store/invalid-outcome', `point ${item.pointId}: unknown parameter ${name}`);
    }
  }
  return PARAM_COLUMNS.map((col) => {
    const value = item.params[col.name];
    if (value === undefined) {
      throw new DisksweepError(
        'store/invalid-outcome',
        `point ${item.pointId}: parameter ${col.name} is missing (the store needs the fully resolved model input)`,
      );
    }
    return paramToSql(col, value);
  });
}

/** point_index ... finished_at, then the scalar outputs, in the order of the upsert statement. */
function resultValues(item: StoredOutcome, writtenAt: number): SqlValue[] {
  const finishedAt = item.finishedAt ?? writtenAt;
  if (item.outcome.kind === 'infrastructure') {
    return [
      item.pointIndex, INFRASTRUCTURE_ERROR, item.outcome.reason, null, null, null, null, item.workerHost, finishedAt,
      ...SCALAR_COLUMNS.map(() => null),
    ];
  }
  const r = item.outcome.result;
  return [
    item.pointIndex, r.status, r.status_reason, r.model_version, r.timing.steps, r.timing.rejected_steps, r.timing.wall_ms,
    item.workerHost, finishedAt,
    ...SCALAR_COLUMNS.map((c) => outputToSql(r.scalars[c.name as keyof typeof r.scalars])),
  ];
}
