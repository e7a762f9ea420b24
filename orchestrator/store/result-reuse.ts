/**
 * Reuse across sweeps of one database. A point id hashes the resolved model input and the model version, so a
 * result stored under another sweep with the same point id is the result this sweep would compute. When a spec
 * is edited, the new sweep copies those rows (point, result, checkpoints, series) under its own sweep id and
 * its own point index, instead of recomputing them. The same never-overwrite-ok rule applies.
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
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
function columnsExcept(db: Database.Database, table: 'points' | 'results' | 'checkpoints', skip: readonly string[]): string[] {
  return [...tableColumns(db, table).keys()].filter((c) => !skip.includes(c)).map(ident);
}

export class ResultReuse {
  private readonly sourceStatus: Database.Statement<[string, string]>;
  private readonly copyPoint: Database.Statement<[string, number, string, string]>;
  private readonly copyResult: Database.Statement<[string, number, string, string]>;
  private readonly deleteCheckpoints: Database.Statement<[string, string]>;
  private readonly copyCheckpoints: Database.Statement<[string, string, string]>;
  private readonly deleteSeries: Database.Statement<[string, string]>;
  private readonly copySeries: Database.Statement<[string, string, string]>;
  private readonly sweepSize: Database.Statement<[string]>;
  private readonly copyBatch: (
    from: string,
    to: string,
    points: readonly ReusablePoint[],
    retryFailed: boolean,
    byStatus: Record<string, number>,
  ) => number;

  constructor(db: Database.Database) {
    this.sourceStatus = db.prepare('SELECT status FROM results WHERE sweep_id = ? AND point_id = ?').pluck();
    const pointCols = columnsExcept(db, 'points', ['sweep_id', 'point_id', 'point_index']);
    const extra = pointCols.length > 0 ? `, ${pointCols.join(', ')}` : '';
    this.copyPoint = db.prepare(
      `INSERT INTO points (sweep_id, point_id, point_index${extra})
       SELECT ?, point_id, ?${extra} FROM points WHERE sweep_id = ? AND point_id = ?
       ON CONFLICT (sweep_id, point_id) DO NOTHING`,
    );
    const resultCols = columnsExcept(db, 'results', ['sweep_id', 'point_id', 'point_index']);
    const set = resultCols.map((c) => `${c} = excluded.${c}`).join(', ');
    this.copyResult = db.prepare(
      `INSERT INTO results (sweep_id, point_id, point_index, ${resultCols.join(', ')})
       SELECT ?, point_id, ?, ${resultCols.join(', ')} FROM results WHERE sweep_id = ? AND point_id = ?
       ON CONFLICT (sweep_id, point_id) DO UPDATE SET ${set} WHERE results.status <> 'ok'`,
    );
    const cpCols = columnsExcept(db, 'checkpoints', ['sweep_id', 'point_id']).join(', ');
    this.deleteCheckpoints = db.prepare('DELETE FROM checkpoints WHERE sweep_id = ? AND point_id = ?');
    this.copyCheckpoints = db.prepare(
      `INSERT INTO checkpoints (sweep_id, point_id, ${cpCols})
       SELECT ?, point_id, ${cpCols} FROM checkpoints WHERE sweep_id = ? AND point_id = ?`,
    );
    this.deleteSeries = db.prepare('DELETE FROM series WHERE sweep_id = ? AND point_id = ?');
    this.copySeries = db.prepare(
      `INSERT INTO series (sweep_id, point_id, columns, n_samples, data)
       SELECT ?, point_id, columns, n_samples, data FROM series WHERE sweep_id = ? AND point_id = ?`,
    );
    this.sweepSize = db.prepare('SELECT n_points FROM sweeps WHERE sweep_id = ?').pluck();
    this.copyBatch = db.transaction(
      (from: string, to: string, points: readonly ReusablePoint[], retryFailed: boolean, byStatus: Record<string, number>) => {
        let copied = 0;
        for (const p of points) {
          const status: unknown = this.sourceStatus.get(from, p.pointId);
          if (typeof status !== 'string' || status === INFRASTRUCTURE_ERROR) continue;
          if (status !== 'ok' && retryFailed) continue;
          this.copyPoint.run(to, p.pointIndex, from, p.pointId);
          if (this.copyResult.run(to, p.pointIndex, from, p.pointId).changes === 0) continue;
          this.deleteCheckpoints.run(to, p.pointId);
          this.deleteSeries.run(to, p.pointId);
          this.copyCheckpoints.run(to, from, p.pointId);
          this.copySeries.run(to, from, p.pointId);
          byStatus[status] = (byStatus[status] ?? 0) + 1;
          copied++;
        }
        return copied;
      },
    );
  }

  private size(sweepId: string): number {
    const n: unknown = this.sweepSize.get(sweepId);
    if (typeof n !== 'number') throw new DisksweepError('store/unknown-sweep', `this database holds no sweep ${sweepId}`);
    return n;
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
    this.size(fromSweepId);
    const n = this.size(toSweepId);
    if (fromSweepId === toSweepId) return { considered: 0, copied: 0, byStatus: {} };
    const byStatus: Record<string, number> = {};
    let considered = 0;
    let copied = 0;
    let pending: ReusablePoint[] = [];
    const flush = () => {
      copied += this.copyBatch(fromSweepId, toSweepId, pending, options.retryFailed === true, byStatus);
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
