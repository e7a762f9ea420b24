/**
 * Is this file ours? Checked before SQLite opens anything for writing, so a foreign or newer file is reported
 * and left byte-for-byte untouched.
 *
 * Two steps: the 100-byte SQLite header is read with plain file I/O (no SQLite, no side files), then a
 * read-only connection confirms what the header said (a WAL may hold a newer user_version than the header).
 */
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import { APPLICATION_ID, SCHEMA_VERSION, newerSchemaError, readApplicationId, readUserVersion } from './schema.js';

/** What a path holds: nothing yet, an empty file (SQLite treats it as a new database), or one of our stores. */
export type StoreFileState =
  | { readonly kind: 'absent' }
  | { readonly kind: 'empty' }
  | { readonly kind: 'store'; readonly userVersion: number };

const SQLITE_MAGIC = Buffer.from('SQLite format 3\0', 'latin1');
const HEADER_BYTES = 100;
/** Offsets in the SQLite database header (https://www.sqlite.org/fileformat.html, section 1.3). */
const USER_VERSION_OFFSET = 60;
const APPLICATION_ID_OFFSET = 68;

const hex32 = (n: number): string => `0x${(n >>> 0).toString(16).padStart(8, '0')}`;

function notOurs(file: string, found: string): DisksweepError {
  return new DisksweepError(
    'input/not-our-database',
    `${file} is not a disksweep database: it is ${found} (the file was left untouched; pass another --db path)`,
  );
}

/** A short, safe rendering of what a non-SQLite file starts with. */
function describeContent(head: Buffer): string {
  if (head.length === 0) return 'empty';
  const text = head.toString('utf8');
  const printable = /^[\t\n\r\x20-\x7e\u00a0-\uffff]*$/u.test(text) && !text.includes('\ufffd');
  if (printable) {
    const shown = text.slice(0, 40).replace(/\s+/g, ' ').trim();
    return `a text file, not SQLite (it starts "${shown}${text.length > 40 ? '…' : ''}")`;
  }
  return `not an SQLite file (it starts with bytes ${head.subarray(0, 16).toString('hex')})`;
}

/** Read the header of an existing file and decide whether it is one of ours, without writing anything. */
export function inspectStoreFile(file: string): StoreFileState {
  let size: number;
  try {
    const st = statSync(file);
    if (!st.isFile()) throw notOurs(file, st.isDirectory() ? 'a directory' : 'not a regular file');
    size = st.size;
  } catch (error) {
    if (error instanceof DisksweepError) throw error;
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return { kind: 'absent' };
    throw new DisksweepError('input/missing-database', `cannot read ${file}: ${(error as Error).message}`, { cause: error });
  }
  if (size === 0) return { kind: 'empty' };

  const head = Buffer.alloc(Math.min(size, HEADER_BYTES));
  const fd = openSync(file, 'r');
  try {
    readSync(fd, head, 0, head.length, 0);
  } finally {
    closeSync(fd);
  }
  if (head.length < HEADER_BYTES || !head.subarray(0, SQLITE_MAGIC.length).equals(SQLITE_MAGIC)) {
    throw notOurs(file, describeContent(head));
  }
  const appId = head.readInt32BE(APPLICATION_ID_OFFSET);
  const userVersion = head.readInt32BE(USER_VERSION_OFFSET);
  checkIdentity(file, appId, userVersion);
  return { kind: 'store', userVersion };
}

function checkIdentity(file: string, appId: number, userVersion: number): void {
  if (appId !== APPLICATION_ID) {
    throw notOurs(
      file,
      `an SQLite database of another program (application_id ${hex32(appId)}, user_version ${userVersion}; ` +
        `disksweep stores have application_id ${hex32(APPLICATION_ID)})`,
    );
  }
  if (userVersion > SCHEMA_VERSION) throw newerSchemaError(file, userVersion);
}

/**
 * Confirm on an open (read-only) connection what the header said; returns the schema version. SQLite's own
 * "file is not a database" (a damaged or encrypted file) becomes the same input error.
 */
export function verifyConnection(db: Database.Database, file: string): number {
  let appId: number;
  let userVersion: number;
  try {
    appId = readApplicationId(db);
    userVersion = readUserVersion(db);
  } catch (error) {
    if ((error as { code?: unknown }).code === 'SQLITE_NOTADB') throw notOurs(file, 'not a readable SQLite database');
    throw error;
  }
  checkIdentity(file, appId, userVersion);
  return userVersion;
}
