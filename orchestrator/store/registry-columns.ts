/**
 * The typed columns that come from our registries rather than from the migration SQL: one per model
 * parameter (points), one per scalar output (results), one per checkpoint output (checkpoint_rows, which the
 * view `checkpoints` shows with the sweep and point ids). A new parameter or output becomes a new nullable
 * column the next time a writer opens the store.
 *
 * Column names are identifiers from our own tables, never user input; they are still checked against a strict
 * pattern before they are put into SQL text.
 */
import type Database from 'better-sqlite3';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { PARAMS, PARAM_NAMES, type ParamDescriptor } from '../../shared/model-params.js';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS, type OutputDescriptor } from '../../shared/model-outputs.js';

export type SqlType = 'REAL' | 'INTEGER' | 'TEXT';
export type RegistryTable = 'points' | 'results' | 'checkpoint_rows';

export interface ParamColumn {
  readonly name: string;
  readonly sqlType: SqlType;
  readonly descriptor: ParamDescriptor;
}

export interface OutputColumn {
  readonly name: string;
  readonly sqlType: SqlType;
  readonly descriptor: OutputDescriptor;
}

const IDENTIFIER = /^[a-z][a-z0-9_]*$/;

/** Double-quote an identifier after checking it is one of ours; anything else is a programming error. */
export function ident(name: string): string {
  if (!IDENTIFIER.test(name)) {
    throw new DisksweepError('internal/unexpected', `refusing to use "${name}" as an SQL column name (expected ${IDENTIFIER})`);
  }
  return `"${name}"`;
}

/** Columns the migration creates; a registry name equal to one of them would be ambiguous. */
export const BASE_COLUMNS: Readonly<Record<RegistryTable, readonly string[]>> = {
  points: ['point_key', 'sweep_key', 'point_id', 'point_index', 'sweep_id'],
  results: [
    'point_key', 'sweep_key', 'sweep_id', 'point_id', 'status', 'status_reason', 'model_version', 'steps', 'rejected_steps',
    'wall_ms', 'worker_host', 'finished_at',
  ],
  // The view `checkpoints` puts sweep_id and point_id in front of these: registry names must not take them.
  checkpoint_rows: ['point_key', 't_myr', 'sweep_id', 'point_id'],
};

const paramSqlType = (d: ParamDescriptor): SqlType => (d.kind === 'number' ? 'REAL' : 'TEXT');
const outputSqlType = (d: OutputDescriptor): SqlType => (d.type === 'flag' ? 'INTEGER' : 'REAL');

export const PARAM_COLUMNS: readonly ParamColumn[] = PARAM_NAMES.map((name) => ({
  name,
  sqlType: paramSqlType(PARAMS[name]),
  descriptor: PARAMS[name],
}));

export const SCALAR_COLUMNS: readonly OutputColumn[] = SCALAR_OUTPUTS.map((d) => ({
  name: d.name,
  sqlType: outputSqlType(d),
  descriptor: d,
}));

export const CHECKPOINT_COLUMNS: readonly OutputColumn[] = CHECKPOINT_OUTPUTS.map((d) => ({
  name: d.name,
  sqlType: outputSqlType(d),
  descriptor: d,
}));

const REGISTRY: Readonly<Record<RegistryTable, readonly { name: string; sqlType: SqlType }[]>> = {
  points: PARAM_COLUMNS,
  results: SCALAR_COLUMNS,
  checkpoint_rows: CHECKPOINT_COLUMNS,
};

const tableInfoRow = z.object({ name: z.string(), type: z.string() });

/** Declared column types of a table, by name. */
export function tableColumns(db: Database.Database, table: RegistryTable | 'series_rows' | 'sweeps' | 'locks'): Map<string, string> {
  const rows = z.array(tableInfoRow).parse(db.pragma(`table_info(${ident(table)})`));
  return new Map(rows.map((r) => [r.name, r.type.toUpperCase()]));
}

/** Registry columns that the table lacks, and registry columns whose declared type differs. */
export function registryColumnDiff(db: Database.Database): { missing: { table: RegistryTable; name: string; sqlType: SqlType }[]; wrongType: string[] } {
  const missing: { table: RegistryTable; name: string; sqlType: SqlType }[] = [];
  const wrongType: string[] = [];
  for (const table of Object.keys(REGISTRY) as RegistryTable[]) {
    const existing = tableColumns(db, table);
    for (const col of REGISTRY[table]) {
      ident(col.name);
      if (BASE_COLUMNS[table].includes(col.name)) {
        throw new DisksweepError('internal/unexpected', `registry name "${col.name}" collides with a base column of ${table}`);
      }
      const found = existing.get(col.name);
      if (found === undefined) missing.push({ table, name: col.name, sqlType: col.sqlType });
      else if (found !== col.sqlType) wrongType.push(`${table}.${col.name}: declared ${found}, the registry needs ${col.sqlType}`);
    }
  }
  return { missing, wrongType };
}

/**
 * Add every missing registry column (one immediate transaction) and check the types of those present.
 * Returns the columns added as `table.column`.
 */
export function ensureRegistryColumns(db: Database.Database, file: string): string[] {
  const added: string[] = [];
  db.transaction(() => {
    const { missing, wrongType } = registryColumnDiff(db);
    if (wrongType.length > 0) {
      throw new DisksweepError('store/schema-mismatch', `${file}: columns disagree with the parameter table or output registry`, {
        details: wrongType,
      });
    }
    for (const col of missing) {
      db.exec(`ALTER TABLE ${ident(col.table)} ADD COLUMN ${ident(col.name)} ${col.sqlType}`);
      added.push(`${col.table}.${col.name}`);
    }
  }).immediate();
  return added;
}

/** A parameter value as stored: numbers as REAL, choices as TEXT, lists as JSON TEXT. */
export function paramToSql(col: ParamColumn, value: unknown): number | string {
  const d = col.descriptor;
  if (d.kind === 'number' && typeof value === 'number' && Number.isFinite(value)) return value;
  if (d.kind === 'choice' && typeof value === 'string' && d.choices.includes(value)) return value;
  if (d.kind === 'list' && Array.isArray(value) && value.every((v) => typeof v === 'number' && Number.isFinite(v))) {
    return JSON.stringify(value);
  }
  const expected =
    d.kind === 'number' ? 'a finite number' : d.kind === 'choice' ? `one of ${d.choices.join(', ')}` : 'a list of finite numbers';
  throw new DisksweepError('store/invalid-outcome', `parameter ${col.name}: expected ${expected} (got ${JSON.stringify(value) ?? String(value)})`);
}

const listValue = z.array(z.number());

/** The inverse of paramToSql; `undefined` when the column is missing or NULL (a parameter newer than the row). */
export function paramFromSql(col: ParamColumn, value: unknown): number | string | number[] | undefined {
  if (value === null || value === undefined) return undefined;
  const d = col.descriptor;
  if (d.kind === 'number' && typeof value === 'number') return value;
  if (d.kind === 'choice' && typeof value === 'string') return value;
  if (d.kind === 'list' && typeof value === 'string') {
    let json: unknown;
    try {
      json = JSON.parse(value);
    } catch {
      json = undefined;
    }
    const parsed = listValue.safeParse(json);
    if (parsed.success) return parsed.data;
  }
  throw new DisksweepError('store/invalid-row', `points.${col.name}: unexpected stored value ${JSON.stringify(value)}`);
}

/** An output value as stored: flags as INTEGER 0/1, numbers as REAL, null as NULL. */
export function outputToSql(value: number | boolean | null): number | null {
  if (typeof value === 'boolean') return value ? 1 : 0;
  return value;
}

/** The inverse of outputToSql, by descriptor. Leaves unexpected values as they are for the zod check. */
export function outputFromSql(col: OutputColumn, value: unknown): unknown {
  if (col.descriptor.type === 'flag' && (value === 0 || value === 1)) return value === 1;
  return value;
}
