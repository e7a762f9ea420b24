/**
 * Reading a sweep database from a test, read-only, with plain SQL (not through the store), so the tests check
 * what is really in the file: every row of the output tables, with the timing and provenance columns apart
 * from the deterministic ones.
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import type { CliProcess } from './cli.js';
import { waitFor } from './wait.js';

/** Columns that legitimately differ between two runs of the same points. */
export const TIMING_COLUMNS = ['wall_ms', 'worker_host', 'finished_at'] as const;

/**
 * Integer row keys of the store, if it has them: storage layout (they depend on the order sweeps were
 * registered in a database), not outputs. Rows are matched by sweep_id and point_id instead.
 */
const STORAGE_KEYS = ['point_key', 'sweep_key'];

type Row = Record<string, unknown>;

export function openReadOnly(file: string): Database.Database {
  return new Database(file, { readonly: true, fileMustExist: true });
}

function withDb<T>(file: string, fn: (db: Database.Database) => T): T {
  const db = openReadOnly(file);
  try {
    return fn(db);
  } finally {
    db.close();
  }
}

/** Rows of one read-only SQL statement on a database file (opened and closed around it). */
export function queryRows<T>(file: string, sql: string, ...params: unknown[]): T[] {
  return withDb(file, (db) => db.prepare(sql).all(...params) as T[]);
}

const without = (row: Row, columns: readonly string[]): Row => Object.fromEntries(Object.entries(row).filter(([k]) => !columns.includes(k)));
const dropKeys = (row: Row): Row => without(row, STORAGE_KEYS);
const dropTiming = (row: Row): Row => without(row, [...TIMING_COLUMNS, ...STORAGE_KEYS]);

/** Blobs as hex, so a difference shows up as readable text in a diff. */
const blobsAsHex = (row: Row): Row =>
  Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Buffer.isBuffer(v) ? v.toString('hex') : v]));

export interface DeterministicRows {
  readonly points: Row[];
  readonly results: Row[];
  readonly checkpoints: Row[];
  readonly series: Row[];
}

/** Every row of points, results, checkpoints and series, by sweep and point id, without the timing columns. */
export function deterministicRows(file: string): DeterministicRows {
  return withDb(file, (db) => ({
    points: (db.prepare('SELECT * FROM points ORDER BY sweep_id, point_id').all() as Row[]).map(dropKeys),
    results: (db.prepare('SELECT * FROM results ORDER BY sweep_id, point_id').all() as Row[]).map(dropTiming),
    checkpoints: (db.prepare('SELECT * FROM checkpoints ORDER BY sweep_id, point_id, t_myr').all() as Row[]).map(dropKeys),
    series: (db.prepare('SELECT * FROM series ORDER BY sweep_id, point_id').all() as Row[]).map((r) => blobsAsHex(dropKeys(r))),
  }));
}

/** Timing and provenance of each stored result, by point id: what a recomputation would change. */
export interface Provenance {
  readonly status: string;
  readonly wall_ms: number | null;
  readonly worker_host: string;
  readonly finished_at: number;
}

export function provenanceByPoint(file: string): Map<string, Provenance> {
  return withDb(file, (db) => {
    const rows = db.prepare('SELECT point_id, status, wall_ms, worker_host, finished_at FROM results').all() as (Provenance & { point_id: string })[];
    return new Map(rows.map(({ point_id, ...rest }) => [point_id, rest]));
  });
}

/** Status of each point that has a result, by point index. */
export function statusByIndex(file: string): Map<number, { status: string; reason: string | null }> {
  return withDb(file, (db) => {
    const rows = db.prepare(
      `SELECT p.point_index AS i, r.status AS status, r.status_reason AS reason FROM results r
       JOIN points p ON p.sweep_id = r.sweep_id AND p.point_id = r.point_id`,
    ).all() as { i: number; status: string; reason: string | null }[];
    return new Map(rows.map((r) => [r.i, { status: r.status, reason: r.reason }]));
  });
}

/** Result rows per point (1 everywhere means exactly one result per point). */
export function resultsPerPoint(file: string): { points: number; results: number; maxPerPoint: number } {
  return withDb(file, (db) => {
    const points = db.prepare('SELECT count(*) FROM points').pluck().get() as number;
    const results = db.prepare('SELECT count(*) FROM results').pluck().get() as number;
    const maxPerPoint = (db.prepare('SELECT max(n) FROM (SELECT count(*) AS n FROM results GROUP BY sweep_id, point_id)').pluck().get() as number | null) ?? 0;
    return { points, results, maxPerPoint };
  });
}

/** Rows of the locks table (who holds the database). */
export function lockRows(file: string): { scope: string; host: string; pid: number }[] {
  return withDb(file, (db) => db.prepare('SELECT scope, host, pid FROM locks').all() as { scope: string; host: string; pid: number }[]);
}

/** Result rows in the database now (0 while the file or its tables do not exist yet). */
export function resultCount(file: string): number {
  if (!existsSync(file)) return 0;
  return withDb(file, (db) => {
    const hasTable = db.prepare("SELECT count(*) FROM sqlite_schema WHERE type = 'table' AND name = 'results'").pluck().get() as number;
    return hasTable === 0 ? 0 : (db.prepare('SELECT count(*) FROM results').pluck().get() as number);
  });
}

/**
 * Wait (bounded) until a running sweep has committed at least `n` results, reading the database read-only;
 * fails early, with the process's output, if the process exits first.
 */
export async function waitForResults(file: string, n: number, run: CliProcess, timeoutMs = 90_000): Promise<number> {
  let seen = 0;
  await waitFor(() => {
    if (run.done) throw new Error(`the sweep process exited after ${seen} results, before ${n} were committed; stderr:\n${run.stderr()}`);
    seen = resultCount(file);
    return seen >= n;
  }, { timeoutMs, what: () => `${n} results in ${file} (saw ${seen})` });
  return seen;
}

/** Point index of each stored point, by point id. */
export function pointIndexById(file: string): Map<string, number> {
  return withDb(file, (db) => {
    const rows = db.prepare('SELECT point_id, point_index FROM points').all() as { point_id: string; point_index: number }[];
    return new Map(rows.map((r) => [r.point_id, r.point_index]));
  });
}
