/**
 * Multi-row INSERT for the many small rows of a batch (checkpoints): rows are collected in one flat array of
 * values and written with `INSERT ... VALUES (...), (...), ...` statements of 2^k rows (k ≤ log2 maxRows),
 * prepared once each. One statement for 32 rows costs much less than 32 statements for one row: the per-call
 * overhead of the driver and of the VDBE program start is paid once.
 */
import type Database from 'better-sqlite3';
import { ident } from './registry-columns.js';

export type SqlValue = number | string | Buffer | null;

export class BulkInsert {
  readonly width: number;
  private readonly statements = new Map<number, Database.Statement<SqlValue[]>>();
  private readonly values: SqlValue[] = [];

  /**
   * @param table table name (one of ours)
   * @param columns column names, in the order values are pushed
   * @param maxRows rows per statement at most; a power of two (default 32)
   */
  constructor(
    private readonly db: Database.Database,
    private readonly table: string,
    private readonly columns: readonly string[],
    private readonly maxRows = 32,
  ) {
    this.width = columns.length;
  }

  /** Rows collected and not yet written. */
  get pendingRows(): number {
    return this.values.length / this.width;
  }

  /** Add one row (exactly `width` values, in column order); writes when a full statement's worth is pending. */
  add(row: readonly SqlValue[]): void {
    for (let i = 0; i < row.length; i++) this.values.push(row[i]);
    if (this.values.length >= this.maxRows * this.width) this.flush();
  }

  /** Write every pending row (in the order added). */
  flush(): void {
    const values = this.values;
    const total = values.length / this.width;
    if (total === 0) return;
    if (!Number.isInteger(total)) throw new RangeError(`${this.table}: ${values.length} values do not make rows of ${this.width}`);
    if (total === this.maxRows) {
      this.statement(total).run(...values);
    } else {
      let offset = 0;
      for (let rows = this.maxRows; rows >= 1; rows /= 2) {
        while ((values.length - offset) / this.width >= rows) {
          const n = rows * this.width;
          this.statement(rows).run(...values.slice(offset, offset + n));
          offset += n;
        }
      }
    }
    values.length = 0;
  }

  /** Forget pending rows (after a failed transaction). */
  clear(): void {
    this.values.length = 0;
  }

  private statement(rows: number): Database.Statement<SqlValue[]> {
    let st = this.statements.get(rows);
    if (st === undefined) {
      const one = `(${this.columns.map(() => '?').join(', ')})`;
      st = this.db.prepare<SqlValue[]>(
        `INSERT INTO ${ident(this.table)} (${this.columns.map(ident).join(', ')}) VALUES ${Array.from({ length: rows }, () => one).join(', ')}`,
      );
      this.statements.set(rows, st);
    }
    return st;
  }
}
