/**
 * Writing outcomes: one immediate transaction per batch, statements prepared once. For each outcome:
 *
 * - no point with its id in the sweep yet: the point row is inserted under point_key = sweep_key * 2^32 +
 *   point_index, then its result;
 * - a result that is `ok`: nothing is written (an ok row is never overwritten, nor its checkpoints or series);
 * - any other result: it is replaced (`UPDATE ... WHERE status <> 'ok'`), and its checkpoints and series
 *   are replaced together with it (an infrastructure failure has none).
 *
 * The batch is trusted to be typed (StoredOutcome; outcomes from outside the process go through
 * `parseStoredOutcomes` once, where they arrive). What is checked here is what the schema cannot say and costs
 * little: the sweep exists, the index is inside it, every parameter is present, known and of its kind, the
 * series has the bytes it claims. Checkpoint rows are collected and written with multi-row INSERTs.
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import { PARAMS } from '../../shared/model-params.js';
import type { ModelResult } from '../../shared/model-result.js';
import { BulkInsert, type SqlValue } from './bulk-insert.js';
import { pointKeyOf, preparePointLookup, SweepKeys, type PointLookup, type SweepKeyInfo } from './point-keys.js';
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

const placeholders = (n: number): string => Array.from({ length: n }, () => '?').join(', ');

/** Columns of a table that neither the migration nor the registry knows (left by an older registry). */
function strayColumns(db: Database.Database, table: 'results', registry: readonly { name: string }[]): string[] {
  const known = new Set([...BASE_COLUMNS[table], ...registry.map((c) => c.name)]);
  return [...tableColumns(db, table).keys()].filter((c) => !known.has(c));
}

/** The result columns an outcome sets, in the order of resultValues. */
const RESULT_VALUE_COLUMNS = [
  'status', 'status_reason', 'model_version', 'steps', 'rejected_steps', 'wall_ms', 'worker_host', 'finished_at',
  ...SCALAR_COLUMNS.map((c) => c.name),
];

export class ResultWriter {
  private readonly keys: SweepKeys;
  private readonly findPoint: PointLookup;
  private readonly insertPoint: Database.Statement<SqlValue[]>;
  private readonly insertResult: Database.Statement<SqlValue[]>;
  private readonly replaceResult: Database.Statement<SqlValue[]>;
  private readonly deleteCheckpoints: Database.Statement<[number]>;
  private readonly deleteSeries: Database.Statement<[number]>;
  private readonly insertSeries: Database.Statement<SqlValue[]>;
  private readonly touchSweep: Database.Statement<[number, number]>;
  private readonly checkpointRows: BulkInsert;
  private readonly runBatch: Database.Transaction<(batch: readonly StoredOutcome[]) => WriteSummary>;

  constructor(
    db: Database.Database,
    private readonly now: () => number,
  ) {
    this.keys = new SweepKeys(db);
    this.findPoint = preparePointLookup(db);
    const paramCols = PARAM_COLUMNS.map((c) => ident(c.name));
    this.insertPoint = db.prepare<SqlValue[]>(
      `INSERT INTO points (point_key, sweep_key, point_id, point_index, sweep_id, ${paramCols.join(', ')})
       VALUES (${placeholders(5 + paramCols.length)})
       ON CONFLICT DO NOTHING`,
    );

    const valueCols = RESULT_VALUE_COLUMNS.map(ident);
    this.insertResult = db.prepare<SqlValue[]>(
      `INSERT INTO results (point_key, sweep_key, sweep_id, point_id, ${valueCols.join(', ')})
       VALUES (${placeholders(4 + valueCols.length)})`,
    );
    const stray = strayColumns(db, 'results', SCALAR_COLUMNS).map(ident);
    const assignments = [...valueCols.map((c) => `${c} = ?`), ...stray.map((c) => `${c} = NULL`)];
    this.replaceResult = db.prepare<SqlValue[]>(
      `UPDATE results SET ${assignments.join(', ')} WHERE point_key = ? AND status <> 'ok'`,
    );

    this.checkpointRows = new BulkInsert(db, 'checkpoint_rows', ['point_key', 't_myr', ...CHECKPOINT_COLUMNS.map((c) => c.name)]);
    this.deleteCheckpoints = db.prepare('DELETE FROM checkpoint_rows WHERE point_key = ?');
    this.deleteSeries = db.prepare('DELETE FROM series_rows WHERE point_key = ?');
    this.insertSeries = db.prepare<SqlValue[]>('INSERT INTO series_rows (point_key, columns, n_samples, data) VALUES (?, ?, ?, ?)');
    this.touchSweep = db.prepare('UPDATE sweeps SET updated_at = ? WHERE sweep_key = ?');
    this.runBatch = db.transaction((batch: readonly StoredOutcome[]) => this.writeInTransaction(batch));
  }

  /**
   * Write a batch in one transaction (all or nothing). The batch is trusted to be typed; outcomes that came
   * from outside the process go through `parseStoredOutcomes` first.
   */
  writeResults(batch: readonly StoredOutcome[]): WriteSummary {
    if (batch.length === 0) return { written: 0, skippedOk: 0 };
    try {
      return this.runBatch.immediate(batch);
    } finally {
      this.checkpointRows.clear();
    }
  }

  private writeInTransaction(batch: readonly StoredOutcome[]): WriteSummary {
    const t = this.now();
    const sweeps = new Map<string, SweepKeyInfo>();
    for (const item of batch) {
      if (sweeps.has(item.sweepId)) continue;
      const info = this.keys.require(item.sweepId, `results for sweep ${item.sweepId}, which this database does not hold (register it first)`);
      sweeps.set(item.sweepId, info);
      this.touchSweep.run(t, info.sweepKey);
    }
    let written = 0;
    for (const item of batch) {
      const sweep = sweeps.get(item.sweepId) as SweepKeyInfo;
      if (!Number.isInteger(item.pointIndex) || item.pointIndex < 0 || item.pointIndex >= sweep.nPoints) {
        throw new DisksweepError(
          'store/invalid-outcome',
          `point ${item.pointId}: point index ${item.pointIndex} is outside sweep ${item.sweepId} (0 ... ${sweep.nPoints - 1})`,
        );
      }
      const params = pointValues(item);
      const values = resultValues(item, t);
      // A new point (the common case) is inserted straight away: the insert probes the (sweep_key, point_id)
      // index itself, so a separate look-up is needed only when the point turns out to exist.
      let key = pointKeyOf(sweep.sweepKey, item.pointIndex);
      const found = this.newPoint(key, sweep.sweepKey, item, params) ? undefined : this.existingPoint(sweep.sweepKey, item);
      if (found === undefined || found[1] === null) {
        if (found !== undefined) key = found[0];
        this.insertResult.run(key, sweep.sweepKey, item.sweepId, item.pointId, ...values);
      } else {
        key = found[0];
        if (found[1] === 'ok') continue;
        if (this.replaceResult.run(...values, key).changes === 0) continue;
        // Rows collected for this point earlier in the batch are in the table before they are deleted.
        this.checkpointRows.flush();
        this.deleteCheckpoints.run(key);
        this.deleteSeries.run(key);
      }
      written++;
      if (item.outcome.kind === 'model') this.writeDetail(key, item.pointId, item.outcome.result);
    }
    this.checkpointRows.flush();
    return { written, skippedOk: batch.length - written };
  }

  /** Insert the point's row; false when the sweep already holds a point with this id (nothing is written). */
  private newPoint(key: number, sweepKey: number, item: StoredOutcome, params: readonly SqlValue[]): boolean {
    return this.insertPoint.run(key, sweepKey, item.pointId, item.pointIndex, item.sweepId, ...params).changes === 1;
  }

  /** The key and result status (null: no result row) of a point the sweep holds. */
  private existingPoint(sweepKey: number, item: StoredOutcome): [number, string | null] {
    const found = this.findPoint(sweepKey, item.pointId);
    if (found === undefined) {
      // The insert was ignored, yet no point has this id: the key (the index) belongs to another point.
      throw new DisksweepError(
        'store/invalid-outcome',
        `point ${item.pointId}: index ${item.pointIndex} of sweep ${item.sweepId} already holds another point`,
      );
    }
    return found;
  }

  private writeDetail(key: number, pointId: string, r: ModelResult): void {
    const width = this.checkpointRows.width;
    const row: SqlValue[] = new Array<SqlValue>(width);
    row[0] = key;
    for (const cp of r.checkpoints) {
      row[1] = cp.t_myr;
      for (let c = 0; c < CHECKPOINT_COLUMNS.length; c++) row[2 + c] = outputToSql(cp[CHECKPOINT_COLUMNS[c].name as keyof typeof cp]);
      this.checkpointRows.add(row);
    }
    const bytes = Buffer.from(r.series.f32le_base64, 'base64');
    const expected = r.series.n_samples * r.series.columns.length * 4;
    if (bytes.length !== expected) {
      throw new DisksweepError(
        'store/invalid-outcome',
        `point ${pointId}: series holds ${bytes.length} bytes, expected ${r.series.n_samples} x ${r.series.columns.length} float32 = ${expected}`,
      );
    }
    this.insertSeries.run(key, JSON.stringify(r.series.columns), r.series.n_samples, bytes);
  }
}

/** The parameter columns of a point, in PARAM_COLUMNS order; every parameter must be present and known. */
function pointValues(item: StoredOutcome): (number | string)[] {
  for (const name in item.params) {
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

/** status ... finished_at, then the scalar outputs: the values of RESULT_VALUE_COLUMNS. */
function resultValues(item: StoredOutcome, writtenAt: number): SqlValue[] {
  const finishedAt = item.finishedAt ?? writtenAt;
  if (item.outcome.kind === 'infrastructure') {
    return [
      INFRASTRUCTURE_ERROR, item.outcome.reason, null, null, null, null, item.workerHost, finishedAt,
      ...SCALAR_COLUMNS.map(() => null),
    ];
  }
  const r = item.outcome.result;
  return [
    r.status, r.status_reason, r.model_version, r.timing.steps, r.timing.rejected_steps, r.timing.wall_ms, item.workerHost, finishedAt,
    ...SCALAR_COLUMNS.map((c) => outputToSql(r.scalars[c.name as keyof typeof r.scalars])),
  ];
}
