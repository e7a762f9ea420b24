/**
 * Integer keys of the store. A sweep gets a small integer `sweep_key` when it is registered; point i of it has
 * `point_key = sweep_key * 2^32 + i` (i the index it was first written under). So:
 *
 * - the rows of one sweep in points, results, checkpoint_rows and series_rows form one key range, read
 *   without an index on the sweep;
 * - rows are appended in index order, at the right edge of each B-tree (a chunk is a run of indexes);
 * - a key depends on the sweep's registration order and the point's index only, never on commit order, so two
 *   databases that ran the same sweep (with any thread count, interrupted or not) hold the same keys.
 *
 * Keys are exact JavaScript numbers: sweep keys stay below 2^21, so every point key is below 2^53.
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';

/** Point indexes per sweep key: a sweep holds at most this many points. */
export const POINTS_PER_SWEEP_KEY = 2 ** 32;
/** Sweep keys are below this, so that every point key is a safe integer. */
export const SWEEP_KEY_LIMIT = 2 ** 21;

export function pointKeyOf(sweepKey: number, pointIndex: number): number {
  return sweepKey * POINTS_PER_SWEEP_KEY + pointIndex;
}

/** The half-open key range [from, to) of one sweep's points. */
export function sweepKeyRange(sweepKey: number): { readonly from: number; readonly to: number } {
  return { from: pointKeyOf(sweepKey, 0), to: pointKeyOf(sweepKey + 1, 0) };
}

export function checkSweepKey(sweepKey: number): number {
  if (!Number.isSafeInteger(sweepKey) || sweepKey < 1 || sweepKey >= SWEEP_KEY_LIMIT) {
    throw new DisksweepError('internal/unexpected', `sweep key ${sweepKey} is outside 1 ... ${SWEEP_KEY_LIMIT - 1}`);
  }
  return sweepKey;
}

export interface SweepKeyInfo {
  readonly sweepKey: number;
  readonly nPoints: number;
}

/**
 * sweep_id -> (sweep_key, n_points), remembered once found: neither changes after registration. A miss is
 * asked again each time (the sweep may be registered later, by this process or, for a reader, by the writer).
 */
export class SweepKeys {
  private readonly byId: Database.Statement<[string]>;
  private readonly known = new Map<string, SweepKeyInfo>();

  constructor(db: Database.Database) {
    this.byId = db.prepare('SELECT sweep_key, n_points FROM sweeps WHERE sweep_id = ?').raw(true);
  }

  find(sweepId: string): SweepKeyInfo | undefined {
    const hit = this.known.get(sweepId);
    if (hit !== undefined) return hit;
    const row = this.byId.get(sweepId) as [unknown, unknown] | undefined;
    if (row === undefined) return undefined;
    const [sweepKey, nPoints] = row;
    if (typeof sweepKey !== 'number' || typeof nPoints !== 'number') {
      throw new DisksweepError('store/invalid-row', `sweeps row of ${sweepId}: sweep_key ${String(sweepKey)}, n_points ${String(nPoints)}`);
    }
    const info = { sweepKey: checkSweepKey(sweepKey), nPoints };
    this.known.set(sweepId, info);
    return info;
  }

  /** Like find, but an unknown sweep is a `store/unknown-sweep` error with the given message. */
  require(sweepId: string, message: string = `this database holds no sweep ${sweepId}`): SweepKeyInfo {
    const info = this.find(sweepId);
    if (info === undefined) throw new DisksweepError('store/unknown-sweep', message);
    return info;
  }
}

/** A point's key and its result status (null: no result row yet), or undefined when the sweep lacks the point. */
export type PointLookup = (sweepKey: number, pointId: string) => [number, string | null] | undefined;

/** The one prepared lookup of a point by (sweep key, point id), shared by the writer and the reuse copier. */
export function preparePointLookup(db: Database.Database): PointLookup {
  const statement = db
    .prepare<[number, string]>(
      `SELECT p.point_key, r.status FROM points p LEFT JOIN results r ON r.point_key = p.point_key
       WHERE p.sweep_key = ? AND p.point_id = ?`,
    )
    .raw(true);
  return (sweepKey, pointId) => statement.get(sweepKey, pointId) as [number, string | null] | undefined;
}
