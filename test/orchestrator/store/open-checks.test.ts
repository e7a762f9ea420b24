/**
 * Opening refuses what is not ours, and leaves it byte-for-byte as it was: a foreign SQLite file, a text
 * file, binary junk, a database from a newer disksweep. Read mode never writes.
 */
import Database from 'better-sqlite3';
import { writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { EXIT_BAD_INPUT, exitCodeFor } from '../../../shared/errors.js';
import { APPLICATION_ID, SCHEMA_VERSION, loadMigrations, migrationsDir } from '../../../orchestrator/store/schema.js';
import { openStore } from '../../../orchestrator/store/sweep-store.js';
import { dirSnapshot, modelOutcome, modelRun, sha256File, sweepFixture } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();

type Mode = 'write' | 'read';
const MODES: Mode[] = ['write', 'read'];

/** Open must throw `code` with a message naming the file and `found`, and change nothing in the directory. */
function expectRefused(file: string, mode: Mode, code: string, found: RegExp): void {
  const before = dirSnapshot(tmp.path);
  const hash = sha256File(file);
  let thrown: unknown;
  try {
    openStore(file, { mode }).close();
  } catch (error) {
    thrown = error;
  }
  expect(thrown).toMatchObject({ name: 'DisksweepError', code });
  expect(exitCodeFor(thrown)).toBe(EXIT_BAD_INPUT);
  const message = (thrown as Error).message;
  expect(message).toContain(file);
  expect(message).toMatch(found);
  expect(sha256File(file)).toBe(hash);
  expect(dirSnapshot(tmp.path)).toEqual(before);
}

describe.each(MODES)('openStore in %s mode', (mode) => {
  it('refuses a foreign SQLite database', () => {
    const file = tmp.file('foreign.sqlite');
    const raw = new Database(file);
    raw.exec("CREATE TABLE photos (id INTEGER PRIMARY KEY, path TEXT); INSERT INTO photos (path) VALUES ('a.jpg')");
    raw.pragma('user_version = 7');
    raw.close();
    expectRefused(file, mode, 'input/not-our-database', /another program \(application_id 0x00000000, user_version 7/);
  });

  it('refuses a foreign SQLite database in WAL mode with its own application id', () => {
    const file = tmp.file('foreign-wal.db');
    const raw = new Database(file);
    raw.pragma('application_id = 1234');
    raw.pragma('journal_mode = WAL');
    raw.exec('CREATE TABLE t (x)');
    raw.close();
    expectRefused(file, mode, 'input/not-our-database', /application_id 0x000004d2/);
  });

  it('refuses a text file', () => {
    const file = tmp.file('notes.sqlite');
    writeFileSync(file, 'name: corvid-rift-cores\nvary:\n  alpha_active: { log: [1e-3, 1e-1], count: 4 }\n'.repeat(4));
    expectRefused(file, mode, 'input/not-our-database', /a text file, not SQLite \(it starts "name: corvid-rift-cores/);
  });

  it('refuses a short binary file', () => {
    const file = tmp.file('junk.bin');
    writeFileSync(file, Buffer.from([0x00, 0xff, 0x13, 0x37, 0x80, 0x81]));
    expectRefused(file, mode, 'input/not-our-database', /not an SQLite file \(it starts with bytes 00ff13378081\)/);
  });

  it('refuses a database with a newer schema', () => {
    const file = tmp.file('newer.sqlite');
    openStore(file, { mode: 'write' }).close();
    const raw = new Database(file);
    raw.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    raw.close();
    expectRefused(file, mode, 'input/newer-schema', new RegExp(`schema version ${SCHEMA_VERSION + 1}, newer than the ${SCHEMA_VERSION}`));
  });
});

describe('openStore', () => {
  it('refuses a newer schema that is still only in the WAL (the header says otherwise)', () => {
    const file = tmp.file('newer-in-wal.sqlite');
    openStore(file, { mode: 'write' }).close();
    const other = new Database(file); // a newer disksweep, still running: its upgrade is not checkpointed yet
    other.pragma('wal_autocheckpoint = 0');
    other.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    const hash = sha256File(file);
    for (const mode of MODES) {
      expect(() => openStore(file, { mode })).toThrow(expect.objectContaining({ code: 'input/newer-schema' }));
    }
    expect(sha256File(file)).toBe(hash);
    other.close();
  });

  it('read mode: a missing file is an input error and nothing is created', () => {
    const file = tmp.file('absent.sqlite');
    expect(() => openStore(file, { mode: 'read' })).toThrow(expect.objectContaining({ code: 'input/missing-database' }));
    expect(dirSnapshot(tmp.path)).toEqual({});
  });

  it('write mode: a missing directory is an input error', () => {
    expect(() => openStore(tmp.file('no/such/dir/x.sqlite'), { mode: 'write' })).toThrow(
      expect.objectContaining({ code: 'input/missing-database', message: expect.stringContaining('does not exist') }),
    );
  });

  it('write mode: an empty file becomes a new store; read mode refuses it untouched', () => {
    const file = tmp.file('empty.sqlite');
    writeFileSync(file, '');
    expectRefused(file, 'read', 'input/not-our-database', /an empty file/);
    const store = openStore(file, { mode: 'write' });
    expect(store.created).toBe(true);
    store.close();
    const raw = new Database(file, { readonly: true });
    expect(raw.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
    raw.close();
  });

  it('read mode never writes: the directory is unchanged after reads of a closed store', () => {
    const file = tmp.file('closed.sqlite');
    const writer = openStore(file, { mode: 'write' });
    const sweep = sweepFixture();
    writer.registerSweep(sweep);
    const item = modelOutcome(sweep.sweepId, 0, modelRun({}));
    writer.writeResults([item]);
    writer.close();
    const before = dirSnapshot(tmp.path);
    const reader = openStore(file, { mode: 'read' });
    expect(reader.readResult(sweep.sweepId, item.pointId)).toEqual(item);
    expect(reader.statusCounts(sweep.sweepId).withResult).toBe(1);
    expect(reader.listSweeps()).toHaveLength(1);
    // The reader exposes no write methods at all.
    expect('writeResults' in reader).toBe(false);
    reader.close();
    const after = dirSnapshot(tmp.path);
    // A WAL reader may leave an empty -wal and the shared-memory index beside the file; the database is unchanged.
    expect(after['closed.sqlite']).toBe(before['closed.sqlite']);
    for (const name of Object.keys(after)) expect(name).toMatch(/^closed\.sqlite(-wal|-shm)?$/);
    if (after['closed.sqlite-wal'] !== undefined) expect(after['closed.sqlite-wal']).toMatch(/^0:/);
  });

  it('finds its migrations, numbered without gaps up to the schema version', () => {
    const migrations = loadMigrations();
    expect(migrations.map((m) => m.version)).toEqual(Array.from({ length: SCHEMA_VERSION }, (_, i) => i + 1));
    expect(migrations[0]).toMatchObject({ version: 1, name: 'initial' });
    expect(migrationsDir()).toMatch(/orchestrator[/\\]store[/\\]migrations[/\\]?$/);
  });

  it('refuses a migrations directory with a gap', () => {
    const dir = tmp.path;
    writeFileSync(`${dir}/001-initial.sql`, 'CREATE TABLE a (x);');
    writeFileSync(`${dir}/003-later.sql`, 'CREATE TABLE b (x);');
    expect(() => loadMigrations(dir)).toThrow(expect.objectContaining({ code: 'store/schema-mismatch', message: expect.stringContaining('without gaps') }));
  });
});
