/**
 * The columns of an export, in order: the point (id, index, status), every model parameter, every scalar
 * output, and every checkpoint output at every checkpoint time the sweep recorded (`m_star_msun@1myr`), each
 * with its unit and meaning from the parameter table or the output registry. Extra columns (a target's pass
 * flag) go at the end.
 */
import type Database from 'better-sqlite3';
import { PARAMS, PARAM_NAMES } from '../../shared/model-params.js';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS } from '../../shared/model-outputs.js';
import { ident, tableColumns } from '../store/registry-columns.js';
import { sweepKeyRange } from '../store/point-keys.js';

export type ColumnType = 'string' | 'float64' | 'int64' | 'bool';

/** How a stored value becomes a cell: as it is, a JSON list kept as text, or a 0/1 flag as a boolean. */
export type ColumnSource = 'value' | 'json-list' | 'flag';

export interface ExportColumn {
  readonly name: string;
  readonly type: ColumnType;
  /** Our unit string (`M_sun/yr`); null for ids, text and dimensionless values. */
  readonly unit: string | null;
  readonly description: string;
  readonly source: ColumnSource;
}

export interface ExportLayout {
  readonly columns: readonly ExportColumn[];
  /** Column expressions of the SELECT, in column order (identifiers from our registries only). */
  readonly select: readonly string[];
  /** Checkpoint times joined, in order (bound as parameters of the LEFT JOINs). */
  readonly checkpointTimes: readonly number[];
}

const unitOf = (u: string): string | null => (u === '1' ? null : u);

/** A checkpoint output at time t, as filters and exports write it: `m_star_msun@1myr`. */
export const checkpointColumnName = (name: string, tMyr: number): string => `${name}@${Number(tMyr.toPrecision(6))}myr`;

/** Distinct checkpoint times of a sweep (a scan of the checkpoint index's key range, no table rows). */
export function checkpointTimes(db: Database.Database, sweepKey: number): number[] {
  const { from, to } = sweepKeyRange(sweepKey);
  return db.prepare('SELECT DISTINCT t_myr FROM checkpoint_rows WHERE point_key >= ? AND point_key < ? ORDER BY t_myr').pluck().all(from, to) as number[];
}

export function exportLayout(db: Database.Database, times: readonly number[]): ExportLayout {
  const have = {
    points: tableColumns(db, 'points'),
    results: tableColumns(db, 'results'),
    checkpoint_rows: tableColumns(db, 'checkpoint_rows'),
  };
  const columns: ExportColumn[] = [
    { name: 'point_id', type: 'string', unit: null, description: 'hash of the resolved model input and model version', source: 'value' },
    { name: 'point_index', type: 'int64', unit: null, description: "position of the point in the sweep's expansion order (0-based)", source: 'value' },
    { name: 'status', type: 'string', unit: null, description: 'ok, or why the model did not finish (step_limit, step_collapse, non_finite, budget_error, infrastructure_error)', source: 'value' },
    { name: 'status_reason', type: 'string', unit: null, description: 'what went wrong, for a status other than ok', source: 'value' },
  ];
  const select = ['p.point_id', 'p.point_index', 'r.status', 'r.status_reason'];
  // A column the database does not have yet (an older store) is exported empty, as NULL.
  const col = (table: keyof typeof have, alias: string, name: string) => (have[table].has(name) ? `${alias}.${ident(name)}` : 'NULL');
  for (const name of PARAM_NAMES) {
    const p = PARAMS[name];
    const type: ColumnType = p.kind === 'number' ? (p.integer === true ? 'int64' : 'float64') : 'string';
    const description = p.kind === 'list' ? `${p.description} (JSON list)` : p.description;
    columns.push({ name, type, unit: p.kind === 'choice' ? null : unitOf(p.unit), description, source: p.kind === 'list' ? 'json-list' : 'value' });
    select.push(col('points', 'p', name));
  }
  for (const d of SCALAR_OUTPUTS) {
    columns.push({ name: d.name, type: d.type === 'flag' ? 'bool' : 'float64', unit: unitOf(d.unit), description: d.description, source: d.type === 'flag' ? 'flag' : 'value' });
    select.push(col('results', 'r', d.name));
  }
  times.forEach((t, k) => {
    for (const d of CHECKPOINT_OUTPUTS) {
      columns.push({ name: checkpointColumnName(d.name, t), type: d.type === 'flag' ? 'bool' : 'float64', unit: unitOf(d.unit), description: `${d.description}, at t = ${t} Myr`, source: d.type === 'flag' ? 'flag' : 'value' });
      select.push(col('checkpoint_rows', `c${k}`, d.name));
    }
  });
  return { columns, select, checkpointTimes: times };
}

/**
 * The statement that yields one row per point with a result, in point order, as arrays in column order.
 * Bind: the checkpoint times, then the sweep's key range [from, to).
 */
export function exportStatement(db: Database.Database, layout: ExportLayout): Database.Statement<unknown[]> {
  const joins = layout.checkpointTimes.map((_, k) => `LEFT JOIN checkpoint_rows c${k} ON c${k}.point_key = p.point_key AND c${k}.t_myr = ?`).join('\n');
  return db.prepare(
    `SELECT ${layout.select.join(', ')}
     FROM points p JOIN results r ON r.point_key = p.point_key
     ${joins}
     WHERE p.point_key >= ? AND p.point_key < ?
     ORDER BY p.point_key`,
  ).raw(true);
}
