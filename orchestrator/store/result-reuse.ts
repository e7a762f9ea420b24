/**
 * Reuse across sweeps of one database. A point id hashes the resolved model input and the model version, so a
 * result stored under another sweep with the same point id is the result this sweep would compute. When a spec
 * is edited, the new sweep copies those rows (point, result, checkpoints, series) under its own sweep id and
 * its own point index (so under its own point keys), instead of recomputing them. The same never-overwrite-ok
 * rule applies.
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import { pointKeyOf, preparePointLookup, SweepKeys, type PointLookup, type SweepKeyInfo } from './point-keys.js';
import { ident, tableColumns } from './registry-columns.js';
import { INFRASTRUCTURE_ERROR } from './store-types.js';

export interface ReuseSummary {
  /** Points of the new sweep whose id was looked up in the old one. */
  readonly considered: number;
  /** Results copied (new rows, or replacing a non-ok row of the new sweep). */
  readonly copied: number;
  /** Copied results by status. */
  readonly byStatus: Readonly<Record<string, number>>;
}

export interface ReusablePoint {
  readonly pointId: string;
  /** Index of the point in the new sweep's expansion. */
  readonly pointIndex: number;
}

/** Points copied per transaction: keeps each commit short so readers and the WAL stay small. */
const REUSE_BATCH = 2000;

/** Every column of a table except the ones listed (read from the table, so stray old columns are copied too). */
function columnsExcept(db: Database.Database, table: 'points' | 'results' | 'checkpoint_rows', skip: readonly string[]): string[] {
  return [...tableColumns(db, table).keys()].filter((c) => !skip.includes(c)).map(ident);
}

export class ResultReuse {
  private readonly keys: SweepKeys;
  private readonly findPoint: PointLookup;
  private readonly copyPoint: Database.Statement<[number, number, number, string, number]>;
  private readonly copyResult: Database.Statement<[number, number, string, number]>;
  private readonly replaceResult: Database.Statement<[number, number]>;
  private readonly deleteCheckpoints: Database.Statement<[number]>;
  private readonly copyCheckpoints: Database.Statement<[number, number]>;
  private readonly deleteSeries: Database.Statement<[number]>;
  private readonly copySeries: Database.Statement<[number, number]>;
  private readonly copyBatch: (
    from: SweepKeyInfo,
    to: SweepKeyInfo & { readonly sweepId: string },
    points: readonly ReusablePoint[],
    retryFailed: boolean,
    byStatus: Record<string, number>,
  ) => number;

  constructor(db: Database.Database) {
    this.keys = new SweepKeys(db);
    this.findPoint = preparePointLookup(db);
    const pointCols = columnsExcept(db, 'points', ['point_key', 'sweep_key', 'point_id', 'point_index', 'sweep_id']);
    const extra = pointCols.length > 0 ? `, ${pointCols.join(', ')}` : '';
    // (new key, new sweep key, new index, new sweep id, source key)
    this.copyPoint = db.prepare(
      `INSERT INTO points (point_key, sweep_key, point_index, sweep_id, point_id${extra})
       SELECT ?, ?, ?, ?, point_id${extra} FROM points WHERE point_key = ?`,
    );
    const resultCols = columnsExcept(db, 'results', ['point_key', 'sweep_key', 'sweep_id', 'point_id']);
    // (new key, new sweep key, new sweep id, source key)
    this.copyResult = db.prepare(
      `INSERT INTO results (point_key, sweep_key, sweep_id, point_id, ${resultCols.join(', ')})
       SELECT ?, ?, ?, point_id, ${resultCols.join(', ')} FROM results WHERE point_key = ?`,
    );
    // (source key, target key): replaces a non-ok row of the target with the source's values.
    this.replaceResult = db.prepare(
      `UPDATE results SET (${resultCols.join(', ')}) = (SELECT ${resultCols.join(', ')} FROM results WHERE point_key = ?)
       WHERE point_key = ? AND status <> 'ok'`,
    );
    const cpCols = columnsExcept(db, 'checkpoint_rows', ['point_key']).join(', ');
    this.deleteCheckpoints = db.prepare('DELETE FROM checkpoint_rows WHERE point_key = ?');
    this.copyCheckpoints = db.prepare(
      `INSERT INTO checkpoint_rows (point_key, ${cpCols}) SELECT ?, ${cpCols} FROM checkpoint_rows WHERE point_key = ?`,
    );
    this.deleteSeries = db.prepare('DELETE FROM series_rows WHERE point_key = ?');
    this.copySeries = db.prepare(
      `INSERT INTO series_rows (point_key, columns, n_samples, data)
       SELECT ?, columns, n_samples, data FROM series_rows WHERE point_key = ?`,
    );
    this.copyBatch = db.transaction(
      (
        from: SweepKeyInfo,
        to: SweepKeyInfo & { readonly sweepId: string },
        points: readonly ReusablePoint[],
        retryFailed: boolean,
        byStatus: Record<string, number>,
      ) => {
        let copied = 0;
        for (const p of points) {
          const source = this.findPoint(from.sweepKey, p.pointId);
          const status = source?.[1];
          if (source === undefined || typeof status !== 'string' || status === INFRASTRUCTURE_ERROR) continue;
          if (status !== 'ok' && retryFailed) continue;
          const sourceKey = source[0];
          const target = this.findPoint(to.sweepKey, p.pointId);
          let key: number;
          if (target === undefined) {
            key = pointKeyOf(to.sweepKey, p.pointIndex);
            this.copyPoint.run(key, to.sweepKey, p.pointIndex, to.sweepId, sourceKey);
            this.copyResult.run(key, to.sweepKey, to.sweepId, sourceKey);
          } else if (target[1] === null) {
            key = target[0];
            this.copyResult.run(key, to.sweepKey, to.sweepId, sourceKey);
          } else {
            key = target[0];
            if (target[1] === 'ok' || this.replaceResult.run(sourceKey, key).changes === 0) continue;
            this.deleteCheckpoints.run(key);
            this.deleteSeries.run(key);
          }
          this.copyCheckpoints.run(key, sourceKey);
          this.copySeries.run(key, sourceKey);
          byStatus[status] = (byStatus[status] ?? 0) + 1;
          copied++;
        }
        return copied;
      },
    );
  }

  /**
   * Copy the results of `fromSweepId` whose point id matches a point of `toSweepId`. Copies ok rows, and
   * model failures unless `retryFailed`; never infrastructure errors. `points` is streamed (any iterable), so
   * a 10^6-point expansion is never held in memory.
   */
  reuseResults(
    fromSweepId: string,
    toSweepId: string,
    points: Iterable<ReusablePoint>,
    options: { retryFailed?: boolean } = {},
  ): ReuseSummary {
    const from = this.keys.require(fromSweepId);
    const to = { ...this.keys.require(toSweepId), sweepId: toSweepId };
    const n = to.nPoints;
    if (fromSweepId === toSweepId) return { considered: 0, copied: 0, byStatus: {} };
    const byStatus: Record<string, number> = {};
    let considered = 0;
    let copied = 0;
    let pending: ReusablePoint[] = [];
    const flush = () => {
      copied += this.copyBatch(from, to, pending, options.retryFailed === true, byStatus);
      pending = [];
    };
    for (const p of points) {
      if (!Number.isInteger(p.pointIndex) || p.pointIndex < 0 || p.pointIndex >= n) {
        throw new DisksweepError('store/invalid-outcome', `point ${p.pointId}: index ${p.pointIndex} is outside sweep ${toSweepId} (0 ... ${n - 1})`);
      }
      pending.push(p);
      considered++;
      if (pending.length >= REUSE_BATCH) flush();
    }
    if (pending.length > 0) flush();
    return { considered, copied, byStatus };
  }
}
