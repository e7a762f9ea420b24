/**
 * The sweep lock: at most one live process runs or resumes sweeps on a database at a time. The owner is a
 * row in `locks` (host, pid, start, heartbeat). A lock is stale, and is taken over, when its owner is on this
 * host and its pid is not alive, or when its heartbeat is older than the stale limit (an owner on another
 * machine cannot be probed; clocks are assumed to agree to well within the limit).
 */
import type Database from 'better-sqlite3';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';

/** A heartbeat older than this marks the lock stale. */
export const LOCK_STALE_MS = 60_000;
/** Scope of the database-wide lock (a sweep id scopes a lock to one sweep). */
export const DATABASE_SCOPE = '*';

export interface LockOwner {
  readonly host: string;
  readonly pid: number;
}

export interface LockRequest extends LockOwner {
  /** '*' (default) for the whole database, or a sweep id. */
  readonly scope?: string;
}

export interface LockInfo extends LockOwner {
  readonly scope: string;
  readonly startedAt: number;
  readonly heartbeatAt: number;
}

/** What acquire did: a fresh lock, our own lock again, or a stale one taken over (whose owner is named). */
export type AcquireOutcome =
  | { readonly kind: 'acquired' }
  | { readonly kind: 'reacquired' }
  | { readonly kind: 'taken-over'; readonly previous: LockInfo };

const lockRow = z.object({
  scope: z.string(),
  host: z.string(),
  pid: z.number().int(),
  started_at: z.number().int(),
  heartbeat_at: z.number().int(),
});

/** True when a process with this pid exists on this machine (EPERM: it exists but belongs to someone else). */
export function isPidAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

export interface LockEnvironment {
  readonly file: string;
  readonly now: () => number;
  readonly thisHost: string;
  readonly staleMs: number;
  readonly pidAlive: (pid: number) => boolean;
}

export class StoreLock {
  private readonly select: Database.Statement<[string]>;
  private readonly upsert: Database.Statement<[string, string, number, number, number]>;
  private readonly beat: Database.Statement<[number, string, string, number]>;
  private readonly remove: Database.Statement<[string, string, number]>;
  private readonly acquireTx: (req: Required<LockRequest>) => AcquireOutcome;
  private held: Required<LockRequest> | undefined;

  constructor(db: Database.Database, private readonly env: LockEnvironment) {
    this.select = db.prepare('SELECT scope, host, pid, started_at, heartbeat_at FROM locks WHERE scope = ?');
    this.upsert = db.prepare(
      `INSERT INTO locks (scope, host, pid, started_at, heartbeat_at) VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (scope) DO UPDATE SET host = excluded.host, pid = excluded.pid,
         started_at = excluded.started_at, heartbeat_at = excluded.heartbeat_at`,
    );
    this.beat = db.prepare('UPDATE locks SET heartbeat_at = ? WHERE scope = ? AND host = ? AND pid = ?');
    this.remove = db.prepare('DELETE FROM locks WHERE scope = ? AND host = ? AND pid = ?');
    const tx = db.transaction((req: Required<LockRequest>) => this.acquireInTransaction(req));
    this.acquireTx = (req) => tx.immediate(req);
  }

  /** The current owner of a scope, if any (stale or not). */
  owner(scope: string = DATABASE_SCOPE): LockInfo | undefined {
    const raw: unknown = this.select.get(scope);
    if (raw === undefined) return undefined;
    const row = lockRow.parse(raw);
    return { scope: row.scope, host: row.host, pid: row.pid, startedAt: row.started_at, heartbeatAt: row.heartbeat_at };
  }

  /** Whether a recorded owner can no longer be running. */
  isStale(lock: LockInfo): boolean {
    if (lock.host === this.env.thisHost && !this.env.pidAlive(lock.pid)) return true;
    return this.env.now() - lock.heartbeatAt > this.env.staleMs;
  }

  /** Take the lock, or throw `store/locked` naming the live owner's host and pid. */
  acquire(request: LockRequest): AcquireOutcome {
    const req: Required<LockRequest> = { scope: request.scope ?? DATABASE_SCOPE, host: request.host, pid: request.pid };
    if (this.held !== undefined && this.held.scope !== req.scope) {
      throw new DisksweepError('internal/unexpected', `this store already holds the lock of scope ${this.held.scope}`);
    }
    const outcome = this.acquireTx(req);
    this.held = req;
    return outcome;
  }

  private acquireInTransaction(req: Required<LockRequest>): AcquireOutcome {
    const t = this.env.now();
    const current = this.owner(req.scope);
    if (current !== undefined && current.host === req.host && current.pid === req.pid) {
      this.beat.run(t, req.scope, req.host, req.pid);
      return { kind: 'reacquired' };
    }
    if (current !== undefined && !this.isStale(current)) {
      const age = Math.max(0, Math.round((t - current.heartbeatAt) / 1000));
      throw new DisksweepError(
        'store/locked',
        `${this.env.file} is in use by another disksweep: host ${current.host}, pid ${current.pid}, ` +
          `running since ${new Date(current.startedAt).toISOString()}, last heartbeat ${age} s ago; ` +
          `wait for it to finish or stop it (a lock whose heartbeat is older than ${this.env.staleMs / 1000} s is taken over)`,
      );
    }
    this.upsert.run(req.scope, req.host, req.pid, t, t);
    return current === undefined ? { kind: 'acquired' } : { kind: 'taken-over', previous: current };
  }

  /** Refresh our heartbeat; throws `store/lock-lost` when another process has taken the lock over. */
  heartbeat(): void {
    const held = this.requireHeld('heartbeat');
    if (this.beat.run(this.env.now(), held.scope, held.host, held.pid).changes === 0) {
      const now = this.owner(held.scope);
      this.held = undefined;
      throw new DisksweepError(
        'store/lock-lost',
        `${this.env.file}: the sweep lock was taken over` +
          (now === undefined ? '' : ` by host ${now.host}, pid ${now.pid}`) +
          '; stop writing (this process missed its heartbeat for too long)',
      );
    }
  }

  /** Give the lock up (a no-op when not held or already taken over). */
  release(): void {
    if (this.held === undefined) return;
    this.remove.run(this.held.scope, this.held.host, this.held.pid);
    this.held = undefined;
  }

  get isHeld(): boolean {
    return this.held !== undefined;
  }

  private requireHeld(what: string): Required<LockRequest> {
    if (this.held === undefined) throw new DisksweepError('internal/unexpected', `${what}: this store does not hold the lock`);
    return this.held;
  }
}
