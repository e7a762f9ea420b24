/**
 * Opening the SQLite file. Nothing is written before the file is known to be ours:
 *
 * - existing file: header read with plain I/O, then a read-only connection confirms application_id and
 *   user_version; only then (write mode) is it reopened for writing and migrated;
 * - new (absent or empty) file, write mode: created, stamped with our application_id, switched to WAL and
 *   migrated in one immediate transaction;
 * - read mode never writes: it keeps the read-only connection (readers run beside a writer under WAL).
 */
import { existsSync } from 'node:fs';
import { dirname } from 'node:path';
import Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import { inspectStoreFile, verifyConnection } from './file-check.js';
import { ensureRegistryColumns } from './registry-columns.js';
import { APPLICATION_ID, SCHEMA_VERSION, applyMigrations, readApplicationId, readUserVersion } from './schema.js';

export type StoreMode = 'write' | 'read';

/** How long a statement waits for a lock held by another connection before failing with SQLITE_BUSY. */
export const BUSY_TIMEOUT_MS = 10_000;

export interface OpenedConnection {
  readonly db: Database.Database;
  /** True when this open created the store (the file was absent or empty). */
  readonly created: boolean;
  /** Migration versions applied by this open. */
  readonly migrated: readonly number[];
  /** Registry columns added by this open, as `table.column`. */
  readonly addedColumns: readonly string[];
}

function openReadOnly(file: string): Database.Database {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    db.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    return db;
  } catch (error) {
    db.close();
    throw error;
  }
}

function openWritable(file: string, mustExist: boolean): Database.Database {
  if (!mustExist && !existsSync(dirname(file))) {
    throw new DisksweepError('input/missing-database', `cannot create ${file}: directory ${dirname(file)} does not exist`);
  }
  const db = new Database(file, { fileMustExist: mustExist });
  db.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
  return db;
}

/**
 * Page size of a new store. Larger than SQLite's 4 KiB default: a batch appends tens of kilobytes to each of
 * the key-ordered tables, and fewer, fuller pages mean fewer B-tree splits and WAL frames per commit (about
 * 1.2x the ingest rate in `npm run bench`, sqlite_ingest). It can only be set before the first write.
 */
export const PAGE_SIZE = 16_384;

/** Stamp a brand-new, empty database as ours (before WAL, so the main file's header always says so). */
function stampIfEmpty(db: Database.Database): void {
  const empty = (): boolean => db.prepare('SELECT count(*) FROM sqlite_schema').pluck().get() === 0;
  if (empty()) db.pragma(`page_size = ${PAGE_SIZE}`); // outside a transaction, before the first write
  db.transaction(() => {
    if (empty() && readApplicationId(db) === 0 && readUserVersion(db) === 0) {
      db.pragma(`application_id = ${APPLICATION_ID}`);
    }
  }).immediate();
}

function configureWriter(db: Database.Database, file: string): void {
  const mode: unknown = db.pragma('journal_mode = WAL', { simple: true });
  if (mode !== 'wal') throw new DisksweepError('internal/unexpected', `${file}: could not switch to WAL (journal_mode is ${String(mode)})`);
  db.pragma('synchronous = NORMAL');
  // 64 MiB of page cache: keeps the key indexes of a large sweep in memory while it is written.
  db.pragma('cache_size = -65536');
  db.pragma('foreign_keys = ON');
}

export function openConnection(file: string, mode: StoreMode): OpenedConnection {
  const state = inspectStoreFile(file);
  if (mode === 'read') {
    if (state.kind === 'absent') throw new DisksweepError('input/missing-database', `${file} does not exist`);
    if (state.kind === 'empty') {
      throw new DisksweepError('input/not-our-database', `${file} is not a disksweep database: it is an empty file`);
    }
    const db = openReadOnly(file);
    try {
      const version = verifyConnection(db, file);
      if (version < SCHEMA_VERSION) {
        throw new DisksweepError(
          'input/older-schema',
          `${file} has store schema version ${version}; this disksweep reads version ${SCHEMA_VERSION}. ` +
            'Any command that writes (run, resume) upgrades it in place.',
        );
      }
      db.pragma('query_only = ON');
      return { db, created: false, migrated: [], addedColumns: [] };
    } catch (error) {
      db.close();
      throw error;
    }
  }

  if (state.kind === 'store') {
    const probe = openReadOnly(file);
    try {
      verifyConnection(probe, file);
    } finally {
      probe.close();
    }
  }
  const created = state.kind !== 'store';
  const db = openWritable(file, !created);
  try {
    if (created) stampIfEmpty(db);
    configureWriter(db, file);
    const migrated = applyMigrations(db, file);
    const addedColumns = ensureRegistryColumns(db, file);
    return { db, created, migrated, addedColumns };
  } catch (error) {
    db.close();
    throw error;
  }
}
