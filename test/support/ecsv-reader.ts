/**
 * Reading our exports back in tests: an RFC 4180 CSV parser (quoted fields, doubled quotes, line breaks in
 * quotes) and an ECSV 1.0 reader that checks the two fixed header lines and parses the YAML header with the
 * `yaml` package, the way astropy does with its own YAML loader.
 */
import { parse } from 'yaml';

export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"' && field === '') quoted = true;
    else if (c === ',') {
      row.push(field);
      field = '';
    } else if (c === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
    } else if (c !== '\r') field += c;
  }
  if (quoted) throw new Error('CSV ends inside a quoted field');
  if (field !== '' || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}

export interface EcsvColumn {
  readonly name: string;
  readonly unit?: string;
  readonly datatype: string;
  readonly description?: string;
}

export interface EcsvTable {
  readonly header: { delimiter?: string; datatype: EcsvColumn[]; meta?: Record<string, unknown>; schema?: string };
  readonly names: string[];
  readonly rows: string[][];
}

export function readEcsv(text: string): EcsvTable {
  const lines = text.split('\n');
  if (lines[0] !== '# %ECSV 1.0') throw new Error(`first line is ${JSON.stringify(lines[0])}, not "# %ECSV 1.0"`);
  if (lines[1] !== '# ---') throw new Error(`second line is ${JSON.stringify(lines[1])}, not "# ---"`);
  let k = 2;
  const yamlLines: string[] = [];
  for (; k < lines.length && lines[k].startsWith('#'); k++) {
    if (lines[k] !== '#' && !lines[k].startsWith('# ')) throw new Error(`header line ${k + 1} does not start with "# "`);
    yamlLines.push(lines[k].slice(2));
  }
  const header = parse(yamlLines.join('\n')) as EcsvTable['header'];
  const [names, ...rows] = parseCsv(lines.slice(k).join('\n'));
  return { header, names, rows };
}
