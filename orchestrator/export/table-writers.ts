/**
 * Row formats of an export: CSV (RFC 4180), JSON lines, and ECSV 1.0 (astropy's Enhanced Character-Separated
 * Values: `# %ECSV 1.0`, `# ---`, a YAML header of `# `-prefixed lines declaring every column's name, unit,
 * datatype and description, then the rows as CSV with a header line). Numbers are written in the shortest
 * form that reads back as the same double; a missing value is an empty field (ECSV: masked) or null (JSON).
 */
import { stringify } from 'yaml';
import { astropyUnit } from './astropy-units.js';
import type { ExportColumn } from './export-columns.js';

export type ExportFormat = 'csv' | 'jsonl' | 'ecsv';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['csv', 'jsonl', 'ecsv'];

export type Cell = string | number | boolean | number[] | null;

/** A stored value (raw SQLite) as a cell of this column. */
export function toCell(column: ExportColumn, raw: unknown): Cell {
  if (raw === null || raw === undefined) return null;
  if (column.source === 'flag') return raw === 1 || raw === true;
  if (column.source === 'json-list' && typeof raw === 'string') {
    try {
      const v: unknown = JSON.parse(raw);
      if (Array.isArray(v) && v.every((x) => typeof x === 'number')) return v as number[];
    } catch {
      // left as text below
    }
    return raw;
  }
  return typeof raw === 'number' || typeof raw === 'string' ? raw : String(raw);
}

/** RFC 4180 quoting: fields with the delimiter, a quote, a line break or edge spaces are quoted, quotes doubled. */
function csvField(text: string): string {
  return /[",\r\n]|^\s|\s$/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function csvCell(c: Cell, bools: 'lower' | 'python'): string {
  if (c === null) return '';
  if (typeof c === 'boolean') return bools === 'python' ? (c ? 'True' : 'False') : c ? 'true' : 'false';
  if (typeof c === 'number') return String(c);
  if (Array.isArray(c)) return csvField(JSON.stringify(c));
  return csvField(c);
}

export interface TableWriter {
  header(): string;
  row(cells: readonly Cell[]): string;
}

/** Table-level metadata written into the ECSV header (`meta:`). */
export type TableMeta = Readonly<Record<string, string | number>>;

export function tableWriter(format: ExportFormat, columns: readonly ExportColumn[], meta: TableMeta): TableWriter {
  const names = columns.map((c) => c.name);
  switch (format) {
    case 'jsonl':
      return {
        header: () => '',
        row: (cells) => {
          const o: Record<string, Cell> = {};
          names.forEach((n, k) => (o[n] = cells[k]));
          return JSON.stringify(o) + '\n';
        },
      };
    case 'csv':
      return { header: () => names.map(csvField).join(',') + '\n', row: (cells) => cells.map((c) => csvCell(c, 'lower')).join(',') + '\n' };
    case 'ecsv':
      return { header: () => ecsvHeader(columns, meta) + names.map(csvField).join(',') + '\n', row: (cells) => cells.map((c) => csvCell(c, 'python')).join(',') + '\n' };
  }
}

/** The ECSV 1.0 header: every column with its unit (astropy spelling), datatype and description. */
export function ecsvHeader(columns: readonly ExportColumn[], meta: TableMeta): string {
  const datatype = columns.map((c) => {
    const unit = c.unit === null ? null : astropyUnit(c.unit);
    return { name: c.name, ...(unit === null ? {} : { unit }), datatype: c.type, description: c.description };
  });
  const yaml = stringify({ delimiter: ',', datatype, meta, schema: 'astropy-2.0' }, { lineWidth: 0 });
  const lines = yaml.trimEnd().split('\n').map((l) => `# ${l}`);
  return ['# %ECSV 1.0', '# ---', ...lines].join('\n') + '\n';
}
