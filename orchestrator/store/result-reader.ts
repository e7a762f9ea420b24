/**
 * Reading results back: one outcome rebuilt exactly as it was written (REAL columns are float64, the series
 * blob holds the model's own bytes), which points need no rerun, counts by status, the commonest failure
 * reasons and finish times for throughput. Works on a read-only connection while a sweep writes (WAL).
 * A point is found by (sweep_key, point_id); everything below it by its point_key.
 *
 * Statements are built from the columns the tables really have, so a database written before a registry
 * entry existed can still be read; a row that then lacks an output fails the zod check by name.
 */
import type Database from 'better-sqlite3';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { issuesToDetails } from '../../shared/model-params.js';
import {
  CHECKPOINT_COLUMNS,
  PARAM_COLUMNS,
  SCALAR_COLUMNS,
  ident,
  outputFromSql,
  paramFromSql,
  tableColumns,
  type OutputColumn,
} from './registry-columns.js';
import { SweepKeys, sweepKeyRange } from './point-keys.js';
import { INFRASTRUCTURE_ERROR, STORED_STATUSES, storedOutcomeSchema, type StoredRecord, type StoredStatus } from './store-types.js';

type Row = Record<string, unknown>;

const storedRecordSchema = storedOutcomeSchema.required({ finishedAt: true });

/** A failure reason with its numbers taken out, so "mass 1.2e-7" and "mass 3.4e-6" count as one reason. */
export function reasonShape(reason: string | null): string {
  if (reason === null) return '(no reason given)';
  return reason.replace(/[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g, '<n>');
}

export interface FailureReason {
  readonly status: StoredStatus | string;
  /** The reason with numbers replaced by `<n>`. */
  readonly reason: string;
  /** One full reason of this shape, for the reader to see real values. */
  readonly example: string | null;
  readonly count: number;
}

export interface StatusCounts {
  /** Points the sweep expands to. */
  readonly nPoints: number;
  /** Rows per status; every known status is present (0 when none). */
  readonly byStatus: Readonly<Record<string, number>>;
  /** Points with any result row. */
  readonly withResult: number;
}

const existing = (cols: readonly OutputColumn[] | typeof PARAM_COLUMNS, have: Map<string, string>) =>
  cols.filter((c) => have.has(c.name));

export class ResultReader {
  private readonly keys: SweepKeys;
  private readonly pointRow: Database.Statement<[number, string]>;
  private readonly resultRow: Database.Statement<[number]>;
  private readonly checkpointRows: Database.Statement<[number]>;
  private readonly seriesRow: Database.Statement<[number]>;
  private readonly keyStatus: Database.Statement<[number]>;
  private readonly counts: Database.Statement<[number]>;
  private readonly reasons: Database.Statement<[number, string, number]>;
  private readonly finished: Database.Statement<[number, number]>;

  constructor(db: Database.Database) {
    this.keys = new SweepKeys(db);
    const sel = (cols: readonly { name: string }[]) => cols.map((c) => ident(c.name)).join(', ');
    const params = existing(PARAM_COLUMNS, tableColumns(db, 'points'));
    const scalars = existing(SCALAR_COLUMNS, tableColumns(db, 'results'));
    const cps = existing(CHECKPOINT_COLUMNS, tableColumns(db, 'checkpoint_rows'));
    const withComma = (s: string) => (s === '' ? '' : `, ${s}`);
    this.pointRow = db.prepare(
      `SELECT point_key, point_index${withComma(sel(params))} FROM points WHERE sweep_key = ? AND point_id = ?`,
    );
    this.resultRow = db.prepare(
      `SELECT status, status_reason, model_version, steps, rejected_steps, wall_ms, worker_host, finished_at${withComma(sel(scalars))}
       FROM results WHERE point_key = ?`,
    );
    this.checkpointRows = db.prepare(`SELECT t_myr${withComma(sel(cps))} FROM checkpoint_rows WHERE point_key = ? ORDER BY t_myr`);
    this.seriesRow = db.prepare('SELECT columns, n_samples, data FROM series_rows WHERE point_key = ?');
    // The three below read the small index results_progress (sweep_key, status, finished_at, + the key), not
    // the wide result rows.
    this.keyStatus = db.prepare('SELECT point_key, status FROM results WHERE sweep_key = ?').raw(true);
    this.counts = db.prepare('SELECT status, count(*) AS n FROM results WHERE sweep_key = ? GROUP BY status');
    db.function('disksweep_reason_shape', { deterministic: true }, (r: unknown) => reasonShape(typeof r === 'string' ? r : null));
    this.reasons = db.prepare(
      `SELECT status, disksweep_reason_shape(status_reason) AS reason, min(status_reason) AS example, count(*) AS n
       FROM results WHERE sweep_key = ? AND status <> ?
       GROUP BY status, reason ORDER BY n DESC, status, reason LIMIT ?`,
    );
    // Sorted here rather than in SQL, so the query stays a scan of the covering index.
    this.finished = db.prepare('SELECT finished_at FROM results WHERE sweep_key = ? AND finished_at >= ?').pluck();
  }

  /** The stored outcome of one point, validated; undefined when the point has no result. */
  readResult(sweepId: string, pointId: string): StoredRecord | undefined {
    const sweep = this.keys.find(sweepId);
    if (sweep === undefined) return undefined;
    const p = this.pointRow.get(sweep.sweepKey, pointId) as Row | undefined;
    if (p === undefined) return undefined;
    const key = p.point_key;
    if (typeof key !== 'number') throw invalidRow(sweepId, pointId, [`point_key: ${String(key)}`]);
    const r = this.resultRow.get(key) as Row | undefined;
    if (r === undefined) return undefined;
    const params: Record<string, unknown> = {};
    for (const col of PARAM_COLUMNS) {
      const v = paramFromSql(col, p[col.name]);
      if (v !== undefined) params[col.name] = v;
    }
    const base = { sweepId, pointId, pointIndex: p.point_index, params, workerHost: r.worker_host, finishedAt: r.finished_at };
    const raw =
      r.status === INFRASTRUCTURE_ERROR
        ? { ...base, outcome: { kind: 'infrastructure', reason: r.status_reason } }
        : { ...base, outcome: { kind: 'model', result: this.modelResult(sweepId, pointId, key, r) } };
    const parsed = storedRecordSchema.safeParse(raw);
    if (!parsed.success) throw invalidRow(sweepId, pointId, issuesToDetails(parsed.error));
    return parsed.data;
  }

  private modelResult(sweepId: string, pointId: string, key: number, r: Row): unknown {
    const scalars = Object.fromEntries(SCALAR_COLUMNS.map((c) => [c.name, outputFromSql(c, r[c.name])]));
    const checkpoints = (this.checkpointRows.all(key) as Row[]).map((row) => ({
      t_myr: row.t_myr,
      ...Object.fromEntries(CHECKPOINT_COLUMNS.map((c) => [c.name, outputFromSql(c, row[c.name])])),
    }));
    const s = this.seriesRow.get(key) as Row | undefined;
    if (s === undefined) throw invalidRow(sweepId, pointId, ['series: the row is missing']);
    let columns: unknown;
    try {
      columns = JSON.parse(String(s.columns));
    } catch {
      columns = s.columns;
    }
    return {
      model_version: r.model_version,
      status: r.status,
      status_reason: r.status_reason,
      scalars,
      checkpoints,
      series: {
        columns,
        n_samples: s.n_samples,
        f32le_base64: Buffer.isBuffer(s.data) ? s.data.toString('base64') : s.data,
      },
      timing: { wall_ms: r.wall_ms, steps: r.steps, rejected_steps: r.rejected_steps },
    };
  }

  /**
   * Which points need no rerun, as one byte per point index (1 = has a result that counts, 0 = run it):
   * ok rows always; model failures (deterministic, a rerun gives the same) unless `retryFailed`;
   * infrastructure errors never. 10^6 points take 1 MB.
   */
  pointIndexesWithResult(sweepId: string, options: { retryFailed?: boolean } = {}): Uint8Array {
    const sweep = this.keys.require(sweepId);
    const done = new Uint8Array(sweep.nPoints);
    const { from } = sweepKeyRange(sweep.sweepKey);
    for (const [key, status] of this.keyStatus.iterate(sweep.sweepKey) as Iterable<[number, string]>) {
      const counts = status === 'ok' || (status !== INFRASTRUCTURE_ERROR && options.retryFailed !== true);
      const index = key - from;
      if (counts && index >= 0 && index < done.length) done[index] = 1;
    }
    return done;
  }

  statusCounts(sweepId: string): StatusCounts {
    const { sweepKey, nPoints } = this.keys.require(sweepId);
    const byStatus: Record<string, number> = Object.fromEntries(STORED_STATUSES.map((s) => [s, 0]));
    let withResult = 0;
    for (const row of this.counts.all(sweepKey) as { status: string; n: number }[]) {
      byStatus[row.status] = row.n;
      withResult += row.n;
    }
    return { nPoints, byStatus, withResult };
  }

  /** The `limit` commonest (status, reason shape) pairs among non-ok rows, commonest first. */
  topFailureReasons(sweepId: string, limit: number): FailureReason[] {
    const { sweepKey } = this.keys.require(sweepId);
    const n = Math.max(0, Math.trunc(limit));
    return (this.reasons.all(sweepKey, 'ok', n) as { status: string; reason: string; example: string | null; n: number }[]).map(
      (row) => ({ status: row.status, reason: row.reason, example: row.example, count: row.n }),
    );
  }

  /** finished_at (ms since the epoch) of every result of the sweep at or after `sinceMs`, ascending. */
  finishedTimes(sweepId: string, sinceMs = 0): Float64Array {
    const { sweepKey } = this.keys.require(sweepId);
    return Float64Array.from(this.finished.all(sweepKey, sinceMs) as number[]).sort();
  }
}

function invalidRow(sweepId: string, pointId: string, details: readonly string[]): DisksweepError {
  return new DisksweepError('store/invalid-row', `the stored result of point ${pointId} (sweep ${sweepId}) is not valid`, { details });
}
