/**
 * Stream one sweep's results as a table: rows come from one SQLite statement in point order and go out in
 * chunks of about 1 MB with back-pressure, so 10^6 points never sit in memory as objects (one row array at a
 * time, and the text of one chunk).
 */
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type Database from 'better-sqlite3';
import { MODEL_VERSION } from '../../shared/model-version.js';
import type { SweepRecord } from '../store/index.js';
import { SweepKeys, sweepKeyRange } from '../store/point-keys.js';
import { checkpointTimes, exportLayout, exportStatement, type ExportColumn } from './export-columns.js';
import { tableWriter, toCell, type Cell, type ExportFormat } from './table-writers.js';

/** A column computed outside the table (a target's pass flag), looked up by point index. */
export interface ExtraColumn {
  readonly column: ExportColumn;
  valueAt(pointIndex: number): Cell;
}

export interface ExportOptions {
  readonly format: ExportFormat;
  readonly extra?: readonly ExtraColumn[];
  /** Only the rows of points this accepts (by point index); default all. */
  readonly include?: (pointIndex: number) => boolean;
  /** Called every `progressEvery` rows (default 100 000) with the rows written so far. */
  readonly onProgress?: (rows: number) => void;
  readonly progressEvery?: number;
}

const CHUNK_BYTES = 1 << 20;

async function put(out: Writable, text: string): Promise<void> {
  if (!out.write(text)) await once(out, 'drain');
}

/** Write the sweep's table to `out` (not ended here). Returns the number of rows. */
export async function exportTable(db: Database.Database, sweep: SweepRecord, out: Writable, options: ExportOptions): Promise<number> {
  const { sweepKey } = new SweepKeys(db).require(sweep.sweepId);
  const times = checkpointTimes(db, sweepKey);
  const layout = exportLayout(db, times);
  const extra = options.extra ?? [];
  const columns = [...layout.columns, ...extra.map((e) => e.column)];
  const writer = tableWriter(options.format, columns, {
    sweep_name: sweep.name,
    sweep_id: sweep.sweepId,
    model_version: sweep.modelVersion,
    exported_by: `disksweep (model ${MODEL_VERSION})`,
  });
  const { from, to } = sweepKeyRange(sweepKey);
  const base = layout.columns;
  const indexAt = base.findIndex((c) => c.name === 'point_index');
  const every = options.progressEvery ?? 100_000;
  let chunk = writer.header();
  let rows = 0;
  const cells: Cell[] = new Array<Cell>(columns.length);
  for (const raw of exportStatement(db, layout).iterate(...times, from, to) as Iterable<unknown[]>) {
    const pointIndex = raw[indexAt] as number;
    if (options.include !== undefined && !options.include(pointIndex)) continue;
    for (let k = 0; k < base.length; k++) cells[k] = toCell(base[k], raw[k]);
    for (let k = 0; k < extra.length; k++) cells[base.length + k] = extra[k].valueAt(pointIndex);
    chunk += writer.row(cells);
    rows++;
    if (chunk.length >= CHUNK_BYTES) {
      await put(out, chunk);
      chunk = '';
    }
    if (options.onProgress !== undefined && rows % every === 0) options.onProgress(rows);
  }
  if (chunk.length > 0) await put(out, chunk);
  return rows;
}
