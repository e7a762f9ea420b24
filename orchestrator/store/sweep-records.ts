/**
 * The sweeps table: one row per sweep a database holds (spec, hashes, model version, counts, chunk size).
 * Its integer sweep_key (the rowid, given on insert) stays inside the store: records carry the sweep_id.
 */
import type Database from 'better-sqlite3';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { issuesToDetails } from '../../shared/model-params.js';
import { checkSweepKey } from './point-keys.js';
import { newSweepSchema, sweepRecordSchema, type NewSweep, type RegisterOutcome, type SweepRecord } from './store-types.js';

const SWEEP_COLUMNS =
  'sweep_id, name, description, spec_json, spec_hash, model_version, n_points, chunk_size, created_at, updated_at';

const sweepRow = z.object({
  sweep_id: z.string(),
  name: z.string(),
  description: z.string().nullable(),
  spec_json: z.string(),
  spec_hash: z.string(),
  model_version: z.string(),
  n_points: z.number(),
  chunk_size: z.number(),
  created_at: z.number(),
  updated_at: z.number(),
});

function toRecord(raw: unknown): SweepRecord {
  const row = sweepRow.safeParse(raw);
  const record = row.success
    ? sweepRecordSchema.safeParse({
        sweepId: row.data.sweep_id,
        name: row.data.name,
        description: row.data.description,
        specJson: row.data.spec_json,
        specHash: row.data.spec_hash,
        modelVersion: row.data.model_version,
        nPoints: row.data.n_points,
        chunkSize: row.data.chunk_size,
        createdAt: row.data.created_at,
        updatedAt: row.data.updated_at,
      })
    : row;
  if (!record.success) {
    throw new DisksweepError('store/invalid-row', 'a sweeps row does not match the sweep schema', {
      details: issuesToDetails(record.error),
    });
  }
  return record.data;
}

/** Read access to the sweeps table (works on a read-only connection). */
export class SweepReader {
  private readonly byId: Database.Statement<[string]>;
  private readonly all: Database.Statement<[]>;

  constructor(db: Database.Database) {
    this.byId = db.prepare(`SELECT ${SWEEP_COLUMNS} FROM sweeps WHERE sweep_id = ?`);
    this.all = db.prepare(`SELECT ${SWEEP_COLUMNS} FROM sweeps ORDER BY created_at, sweep_id`);
  }

  getSweep(sweepId: string): SweepRecord | undefined {
    const row: unknown = this.byId.get(sweepId);
    return row === undefined ? undefined : toRecord(row);
  }

  /** Every sweep, oldest first. */
  listSweeps(): SweepRecord[] {
    return this.all.all().map(toRecord);
  }
}

/** Write access: registration and the last-write time. */
export class SweepWriter extends SweepReader {
  private readonly db: Database.Database;
  private readonly insert: Database.Statement<unknown[]>;
  private readonly touch: Database.Statement<[number, string]>;

  constructor(db: Database.Database, private readonly now: () => number) {
    super(db);
    this.db = db;
    this.insert = db.prepare(`INSERT INTO sweeps (${SWEEP_COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`);
    this.touch = db.prepare('UPDATE sweeps SET updated_at = ? WHERE sweep_id = ?');
  }

  /**
   * Insert a sweep, or return the one already stored under its id. The stored row wins (its chunk size keeps
   * chunk boundaries fixed across resumes); a different model version is reported for the caller to refuse.
   */
  registerSweep(input: NewSweep): RegisterOutcome {
    const parsed = newSweepSchema.safeParse(input);
    if (!parsed.success) {
      throw new DisksweepError('store/invalid-outcome', 'a sweep record does not match the sweep schema', {
        details: issuesToDetails(parsed.error),
      });
    }
    const s = parsed.data;
    return this.db
      .transaction((): RegisterOutcome => {
        const existing = this.getSweep(s.sweepId);
        if (existing !== undefined) {
          return existing.modelVersion === s.modelVersion
            ? { kind: 'existing', sweep: existing }
            : { kind: 'model-version-mismatch', sweep: existing, requestedModelVersion: s.modelVersion };
        }
        const t = this.now();
        const { lastInsertRowid } = this.insert.run(s.sweepId, s.name, s.description, s.specJson, s.specHash, s.modelVersion, s.nPoints, s.chunkSize, t, t);
        checkSweepKey(Number(lastInsertRowid)); // the new sweep_key: its point keys must stay exact numbers
        return { kind: 'created', sweep: { ...s, createdAt: t, updatedAt: t } };
      })
      .immediate();
  }

  /** Record that results of a sweep were written now; false when the sweep is unknown. */
  touchSweep(sweepId: string): boolean {
    return this.touch.run(this.now(), sweepId).changes === 1;
  }
}
