/**
 * Schema identity and migrations of a disksweep store.
 *
 * A store is an SQLite file whose header carries our application id and whose `user_version` is the number of
 * the last migration applied. Migrations are plain SQL files `migrations/NNN-name.sql`, applied in order, each
 * in the same immediate transaction that bumps `user_version`, so a crash leaves either the old or the new
 * schema.
 *
 * tsc does not copy `.sql` files into dist/, so the directory is looked up relative to this module: beside it
 * (running from the source tree, e.g. under vitest, or from a build that copied the files) and else in the
 * source tree seen from `dist/orchestrator/store/` (the published package ships both trees).
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';

/** PRAGMA application_id of every disksweep store: the ASCII bytes "DSKW" read as a big-endian int32. */
export const APPLICATION_ID = 0x44534b57;

/** Schema version this build writes and understands: the number of the last migration file. */
export const SCHEMA_VERSION = 1;

export interface Migration {
  readonly version: number;
  readonly name: string;
  readonly sql: string;
}

const MIGRATION_FILE = /^(\d{3})-([a-z0-9][a-z0-9-]*)\.sql$/;

const CANDIDATE_DIRS: readonly URL[] = [
  new URL('./migrations/', import.meta.url),
  new URL('../../../orchestrator/store/migrations/', import.meta.url),
];

/** The directory the migrations are read from (the first candidate that exists). */
export function migrationsDir(): string {
  for (const url of CANDIDATE_DIRS) {
    const dir = fileURLToPath(url);
    if (existsSync(dir)) return dir;
  }
  throw new DisksweepError(
    'store/schema-mismatch',
    'cannot find the store migrations (orchestrator/store/migrations/*.sql)',
    { details: CANDIDATE_DIRS.map((u) => `looked in ${fileURLToPath(u)}`) },
  );
}

const cache = new Map<string, readonly Migration[]>();

/**
 * Every migration, in order. Numbers must run 1, 2, ... SCHEMA_VERSION without gaps, so a missing or stray
 * file is an error here rather than a silently different schema.
 */
export function loadMigrations(dir: string = migrationsDir()): readonly Migration[] {
  const hit = cache.get(dir);
  if (hit !== undefined) return hit;
  const migrations: Migration[] = [];
  for (const file of readdirSync(dir).sort()) {
    if (!file.endsWith('.sql')) continue;
    const m = MIGRATION_FILE.exec(file);
    if (m === null) {
      throw new DisksweepError('store/schema-mismatch', `migration file name "${file}" in ${dir} is not NNN-name.sql`);
    }
    migrations.push({ version: Number(m[1]), name: m[2], sql: readFileSync(`${dir}/${file}`, 'utf8') });
  }
  migrations.forEach((mig, i) => {
    if (mig.version !== i + 1) {
      throw new DisksweepError(
        'store/schema-mismatch',
        `migrations in ${dir} must be numbered 001, 002, ... without gaps (found ${String(mig.version).padStart(3, '0')} at position ${i + 1})`,
      );
    }
  });
  if (migrations.length !== SCHEMA_VERSION) {
    throw new DisksweepError(
      'store/schema-mismatch',
      `this build expects ${SCHEMA_VERSION} migration(s) but ${dir} holds ${migrations.length}`,
    );
  }
  cache.set(dir, migrations);
  return migrations;
}

function pragmaNumber(db: Database.Database, name: 'user_version' | 'application_id'): number {
  const value: unknown = db.pragma(name, { simple: true });
  if (typeof value !== 'number') throw new DisksweepError('internal/unexpected', `PRAGMA ${name} returned ${String(value)}`);
  return value;
}

export const readUserVersion = (db: Database.Database): number => pragmaNumber(db, 'user_version');
export const readApplicationId = (db: Database.Database): number => pragmaNumber(db, 'application_id');

/**
 * Bring a writable connection to SCHEMA_VERSION. The version is read again inside the immediate transaction,
 * so two processes opening the same new file cannot both apply a migration. Returns the versions applied.
 */
export function applyMigrations(db: Database.Database, file: string): number[] {
  const migrations = loadMigrations();
  const applied: number[] = [];
  db.transaction(() => {
    const appId = readApplicationId(db);
    const current = readUserVersion(db);
    if (appId !== APPLICATION_ID) {
      throw new DisksweepError('input/not-our-database', `${file} is not a disksweep database (application_id ${appId})`);
    }
    if (current > SCHEMA_VERSION) throw newerSchemaError(file, current);
    for (const mig of migrations) {
      if (mig.version <= current) continue;
      db.exec(mig.sql);
      // PRAGMA takes no bound parameters; the value is an integer from our own migration list.
      db.pragma(`user_version = ${Math.trunc(mig.version)}`);
      applied.push(mig.version);
    }
  }).immediate();
  return applied;
}

export function newerSchemaError(file: string, found: number): DisksweepError {
  return new DisksweepError(
    'input/newer-schema',
    `${file} has store schema version ${found}, newer than the ${SCHEMA_VERSION} this disksweep understands; ` +
      'upgrade disksweep to read it (the file was left untouched)',
  );
}
