/**
 * `disksweep export DB --format csv|jsonl|ecsv`: one row per point with a result — id, status, every
 * parameter, every scalar output and every checkpoint output at every checkpoint (`m_star_msun@1myr`), names
 * with their unit suffix; ECSV carries units and descriptions for astropy. Streams: 10^6 rows are fine.
 */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { Command, Option } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { exportTable } from '../export/export-table.js';
import { targetColumnOptions } from '../export/target-column.js';
import { evaluateTargets, type Evaluation } from '../query/index.js';
import type { StoreReader, SweepRecord } from '../store/index.js';
import { EXPORT_FORMATS, type ExportFormat } from '../export/table-writers.js';
import { latestSweepNote, pickSweep } from '../store/pick-sweep.js';
import { withReaderAsync } from '../store/read-access.js';
import { unwritableFile } from './output-file.js';
import { parseTargetFlags, withTargetOptions, type TargetFlags } from './target-flags.js';

export interface ExportFlags extends TargetFlags {
  readonly format: string;
  readonly out?: string;
}

const HELP = `
Examples:
  disksweep export corvid.sqlite --format csv --out corvid.csv
  disksweep export corvid.sqlite --format ecsv --out corvid.ecsv     then in Python:
      from astropy.table import Table; t = Table.read('corvid.ecsv')   # columns with units
  disksweep export corvid.sqlite --format jsonl | head -n 3
  disksweep export corvid.sqlite --format csv --target solar-split --where 'alpha_active >= 1e-3'

Columns: point_id, point_index, status, status_reason, every model parameter (list parameters as JSON
text), every scalar output, then every checkpoint output at each checkpoint time, named like
m_star_msun@1myr. Units are in the names (and, in ECSV, in the header). Points without a result yet are
left out; failed models are rows with their status and empty outputs. With --target, a last column pass
says whether the point passes every target (empty for points without an ok result); with --where, only the
points the filter selects are written. Targets and filters are those of \`disksweep query\`.`;

export function parseFormat(text: string): ExportFormat {
  if (!(EXPORT_FORMATS as readonly string[]).includes(text)) {
    throw new DisksweepError('input/invalid-flag', `--format: expected one of ${EXPORT_FORMATS.join(', ')} (got "${text}")`);
  }
  return text as ExportFormat;
}

/** Open --out for writing (exit 2 naming the path when it cannot be), or stdout. */
async function openOut(path: string | undefined): Promise<{ out: Writable; finish(): Promise<void> }> {
  if (path === undefined) return { out: process.stdout, finish: async () => undefined };
  const out = createWriteStream(path);
  try {
    await once(out, 'open');
  } catch (error) {
    throw unwritableFile('--out', path, error);
  }
  return {
    out,
    finish: async () => {
      out.end();
      await once(out, 'finish');
    },
  };
}

/**
 * Write one sweep as `format` to `path` (or stdout), with the pass column and row selection of an evaluation
 * (null: every row, no pass column). Returns the rows written.
 */
export async function exportSweep(reader: StoreReader, sweep: SweepRecord, format: ExportFormat, ev: Evaluation | null, path: string | undefined): Promise<number> {
  const { out, finish } = await openOut(path);
  const report = (n: number) => process.stderr.write(`exported ${n} rows\n`);
  const n = await exportTable(reader.connection, sweep, out, { format, ...(ev === null ? {} : targetColumnOptions(ev)), onProgress: path === undefined ? undefined : report });
  await finish();
  if (path !== undefined) process.stderr.write(`wrote ${n} rows to ${path}\n`);
  return n;
}

async function runExport(dbFile: string, flags: ExportFlags): Promise<number> {
  const format = parseFormat(flags.format);
  return withReaderAsync(dbFile, async (reader) => {
    const sweep = pickSweep(reader, flags.sweep, 'latest');
    const latest = latestSweepNote(reader, flags.sweep, sweep);
    if (latest !== null) process.stderr.write(`${latest}\n`);
    // A bad --target or --where exits 2 here, before anything is written.
    const targets = parseTargetFlags(flags, false);
    const ev = targets.length === 0 && flags.where === undefined ? null : evaluateTargets(reader, { sweep: sweep.sweepId, targets, where: flags.where });
    // The caveats query and map print (re-evaluated split thresholds, runs ending before t_max) hold for the pass column too.
    for (const note of ev?.notes ?? []) process.stderr.write(`note: ${note}\n`);
    return exportSweep(reader, sweep, format, ev, flags.out);
  });
}

/** `disksweep export ... | head` closes the pipe early: that is the reader's choice, not a failure. */
export function ignoreClosedPipe(error: unknown): void {
  if ((error as NodeJS.ErrnoException).code === 'EPIPE') return;
  throw error;
}

export function exportCommand(): Command {
  return withTargetOptions(
    new Command('export')
      .description('write one row per point (parameters and outputs, with units) as CSV, JSON lines or ECSV')
      .argument('<db>', 'the SQLite database of results')
      .addOption(new Option('--format <format>', 'csv, jsonl or ecsv (astropy, with units)').choices([...EXPORT_FORMATS]).makeOptionMandatory()),
    { targetRequired: false },
  )
    .option('--out <file>', 'write here instead of stdout')
    .addHelpText('after', HELP)
    .action(async (db: string, flags: ExportFlags) => {
      await runExport(db, flags).catch(ignoreClosedPipe);
    })
    .exitOverride();
}
