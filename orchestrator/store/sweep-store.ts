/**
 * The SQLite store of sweeps and results, one writer (the orchestrator) and any number of readers.
 *
 * ```ts
 * const store = openStore('corvid.sqlite', { mode: 'write' });
 * store.acquireLock({ host: hostname(), pid: process.pid });
 * const { sweep } = store.registerSweep({ sweepId, name, specJson, specHash, modelVersion, nPoints, chunkSize });
 * const done = store.pointIndexesWithResult(sweep.sweepId, { retryFailed: false });
 * store.writeResults(batch);            // one transaction per batch; never overwrites an ok row
 * store.close();                        // releases the lock
 *
 * const reader = openStore('corvid.sqlite', { mode: 'read' });   // never writes; fine while a sweep runs
 * reader.statusCounts(sweepId);
 * ```
 */
import { hostname } from 'node:os';
import type Database from 'better-sqlite3';
import { openConnection, type StoreMode } from './open-connection.js';
import { ResultReader, type FailureReason, type StatusCounts } from './result-reader.js';
import { ResultReuse, type ReusablePoint, type ReuseSummary } from './result-reuse.js';
import { ResultWriter } from './result-writer.js';
import { LOCK_STALE_MS, StoreLock, isPidAlive, type AcquireOutcome, type LockInfo, type LockRequest } from './store-lock.js';
import type { NewSweep, RegisterOutcome, StoredOutcome, StoredRecord, SweepRecord, WriteSummary } from './store-types.js';
import { SweepReader, SweepWriter } from './sweep-records.js';

export type { NewSweep, RegisterOutcome, StoredOutcome, StoredRecord, SweepRecord, WriteSummary } from './store-types.js';
export type { StoreMode } from './open-connection.js';

export interface StoreOptions {
  readonly mode: StoreMode;
  /** Clock in ms since the epoch (tests inject one). Default `Date.now`. */
  readonly now?: () => number;
  /** Write mode: passive WAL checkpoint after this many batches. Default 50. */
  readonly checkpointEveryBatches?: number;
  /** Write mode: passive WAL checkpoint when this long has passed since the last one. Default 10 000 ms. */
  readonly checkpointEveryMs?: number;
  /** Write mode: a lock whose heartbeat is older than this is stale. Default 60 000 ms. */
  readonly lockStaleMs?: number;
  /** Write mode: decides whether a pid on this host is alive (tests inject one). Default: signal 0. */
  readonly pidAlive?: (pid: number) => boolean;
}

/** Result of `PRAGMA wal_checkpoint(PASSIVE)`: busy flag, WAL frames, frames copied back to the database. */
export interface WalCheckpoint {
  readonly busy: number;
  readonly log: number;
  readonly checkpointed: number;
}

/** Read access; what `openStore(file, { mode: 'read' })` returns. */
export class StoreReader {
  readonly file: string;
  protected readonly db: Database.Database;
  private readonly sweepsRead: SweepReader;
  private readonly results: ResultReader;

  constructor(file: string, db: Database.Database) {
    this.file = file;
    this.db = db;
    this.sweepsRead = new SweepReader(db);
    this.results = new ResultReader(db);
  }

  getSweep(sweepId: string): SweepRecord | undefined {
    return this.sweepsRead.getSweep(sweepId);
  }

  listSweeps(): SweepRecord[] {
    return this.sweepsRead.listSweeps();
  }

  /** The stored outcome of one point, validated (undefined when there is none). */
  readResult(sweepId: string, pointId: string): StoredRecord | undefined {
    return this.results.readResult(sweepId, pointId);
  }

  /** One byte per point index, 1 where the point needs no rerun (see ResultReader.pointIndexesWithResult). */
  pointIndexesWithResult(sweepId: string, options: { retryFailed?: boolean } = {}): Uint8Array {
    return this.results.pointIndexesWithResult(sweepId, options);
  }

  statusCounts(sweepId: string): StatusCounts {
    return this.results.statusCounts(sweepId);
  }

  topFailureReasons(sweepId: string, limit: number): FailureReason[] {
    return this.results.topFailureReasons(sweepId, limit);
  }

  /** finished_at of the sweep's results at or after `sinceMs`, ascending (for rates and ETAs). */
  finishedTimes(sweepId: string, sinceMs = 0): Float64Array {
    return this.results.finishedTimes(sweepId, sinceMs);
  }

  get isOpen(): boolean {
    return this.db.open;
  }

  /**
   * The connection itself, for the query layer (orchestrator/query), which builds its own statements from the
   * registry whitelist with bound parameters only. A reader's connection is read-only (`query_only`).
   */
  get connection(): Database.Database {
    return this.db;
  }

  close(): void {
    if (this.db.open) this.db.close();
  }
}

/** Read and write access; what `openStore(file, { mode: 'write' })` returns. */
export class SweepStore extends StoreReader {
  /** True when this open created the database. */
  readonly created: boolean;
  /** Registry columns this open added (`table.column`). */
  readonly addedColumns: readonly string[];
  private readonly sweepsWrite: SweepWriter;
  private readonly writer: ResultWriter;
  private readonly reuse: ResultReuse;
  private readonly lock: StoreLock;
  private readonly now: () => number;
  private readonly checkpointEveryBatches: number;
  private readonly checkpointEveryMs: number;
  private batchesSinceCheckpoint = 0;
  private lastCheckpointAt: number;

  constructor(file: string, db: Database.Database, info: { created: boolean; addedColumns: readonly string[] }, options: StoreOptions) {
    super(file, db);
    this.created = info.created;
    this.addedColumns = info.addedColumns;
    this.now = options.now ?? Date.now;
    this.checkpointEveryBatches = Math.max(1, options.checkpointEveryBatches ?? 50);
    this.checkpointEveryMs = Math.max(0, options.checkpointEveryMs ?? 10_000);
    this.lastCheckpointAt = this.now();
    this.sweepsWrite = new SweepWriter(db, this.now);
    this.writer = new ResultWriter(db, this.now);
    this.reuse = new ResultReuse(db);
    this.lock = new StoreLock(db, {
      file,
      now: this.now,
      thisHost: hostname(),
      staleMs: options.lockStaleMs ?? LOCK_STALE_MS,
      pidAlive: options.pidAlive ?? isPidAlive,
    });
  }

  /** Insert a sweep or return the stored one; a different model version under the same id is reported. */
  registerSweep(sweep: NewSweep): RegisterOutcome {
    return this.sweepsWrite.registerSweep(sweep);
  }

  /** Write a batch of outcomes in one transaction; see ResultWriter. Runs a passive WAL checkpoint now and then. */
  writeResults(batch: readonly StoredOutcome[]): WriteSummary {
    const summary = this.writer.writeResults(batch);
    this.batchesSinceCheckpoint++;
    if (this.batchesSinceCheckpoint >= this.checkpointEveryBatches || this.now() - this.lastCheckpointAt >= this.checkpointEveryMs) {
      this.checkpointWal();
    }
    return summary;
  }

  /** Copy reusable results of another sweep of this database (matching point ids) into `toSweepId`. */
  reuseResults(fromSweepId: string, toSweepId: string, points: Iterable<ReusablePoint>, options: { retryFailed?: boolean } = {}): ReuseSummary {
    return this.reuse.reuseResults(fromSweepId, toSweepId, points, options);
  }

  /** `PRAGMA wal_checkpoint(PASSIVE)`: copies committed WAL frames back without waiting for readers. */
  checkpointWal(): WalCheckpoint {
    const [row] = this.db.pragma('wal_checkpoint(PASSIVE)') as WalCheckpoint[];
    this.batchesSinceCheckpoint = 0;
    this.lastCheckpointAt = this.now();
    return row;
  }

  /** Become the one process running sweeps on this database; throws `store/locked` naming a live owner. */
  acquireLock(request: LockRequest): AcquireOutcome {
    return this.lock.acquire(request);
  }

  /** Refresh the lock's heartbeat (call at least every LOCK_STALE_MS / 3); throws `store/lock-lost`. */
  heartbeat(): void {
    this.lock.heartbeat();
  }

  releaseLock(): void {
    this.lock.release();
  }

  /** Who holds the lock of a scope ('*' = the database), if anyone. */
  lockOwner(scope?: string): LockInfo | undefined {
    return this.lock.owner(scope);
  }

  /** Release the lock if held, then close (SQLite checkpoints the WAL when the last connection closes). */
  override close(): void {
    if (this.isOpen) this.lock.release();
    super.close();
  }
}

export function openStore(file: string, options: StoreOptions & { mode: 'write' }): SweepStore;
export function openStore(file: string, options: StoreOptions & { mode: 'read' }): StoreReader;
export function openStore(file: string, options: StoreOptions): StoreReader | SweepStore;
/**
 * Open a store. Foreign, non-SQLite and newer files throw an `input/...` DisksweepError (exit 2) and are left
 * untouched. Write mode creates and migrates as needed and adds missing registry columns.
 */
export function openStore(file: string, options: StoreOptions): StoreReader | SweepStore {
  const opened = openConnection(file, options.mode);
  try {
    return options.mode === 'read' ? new StoreReader(file, opened.db) : new SweepStore(file, opened.db, opened, options);
  } catch (error) {
    opened.db.close();
    throw error;
  }
}
