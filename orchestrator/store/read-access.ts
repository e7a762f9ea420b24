/**
 * Read-only access for the commands that read results in bulk (show, export, map, report): the StoreReader
 * for sweeps and single results, and its connection for the streaming statements those commands prepare
 * themselves. Opening checks the file is a disksweep store of this schema (exit 2 otherwise) and never writes.
 */
import type Database from 'better-sqlite3';
import { openConnection } from './open-connection.js';
import { StoreReader } from './sweep-store.js';

export interface ReadAccess {
  readonly reader: StoreReader;
  readonly db: Database.Database;
  close(): void;
}

export function openReadAccess(file: string): ReadAccess {
  const { db } = openConnection(file, 'read');
  const reader = new StoreReader(file, db);
  return { reader, db, close: () => reader.close() };
}

/** Run `fn` with read access and close it afterwards, whatever happens. */
export function withReadAccess<T>(file: string, fn: (access: ReadAccess) => T): T {
  const access = openReadAccess(file);
  try {
    return fn(access);
  } finally {
    access.close();
  }
}

/** The same for async work: the connection stays open until `fn`'s promise settles. */
export async function withReadAccessAsync<T>(file: string, fn: (access: ReadAccess) => Promise<T>): Promise<T> {
  const access = openReadAccess(file);
  try {
    return await fn(access);
  } finally {
    access.close();
  }
}
