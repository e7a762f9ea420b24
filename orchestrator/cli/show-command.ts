/**
 * `disksweep show DB POINT_ID`: one stored run in full — which sweep and point, the varied parameters, the
 * model summary (checkpoint table, solar-like split, budgets, flags), and plots against time in the terminal,
 * as SVG (--svg) or PNG (--png); or all of it as JSON (--json).
 */
import { Command } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { parseModelParams } from '../../shared/model-params.js';
import { decodeSeries, type ModelResult } from '../../shared/model-result.js';
import { svgToPng } from '../plots/png.js';
import { svgDocument } from '../plots/svg.js';
import { pointFigure, pointPanels, terminalPanels } from '../show/point-figures.js';
import { findPoint } from '../show/point-lookup.js';
import { pickSweep } from '../store/pick-sweep.js';
import { withReader } from '../store/read-access.js';
import type { StoredRecord } from '../store/index.js';
import { sweepSpace } from '../query/sweep-space.js';
import { formatModelReport } from './model-report.js';
import { writeOutputFile } from './output-file.js';

interface ShowFlags {
  readonly sweep?: string;
  readonly svg?: string;
  readonly png?: string;
  readonly json?: boolean;
}

const HELP = `
Examples:
  disksweep show corvid.sqlite 3fa9c2          a unique prefix of the point id is enough
  disksweep show corvid.sqlite 3fa9c2 --svg run.svg --png run.png
  disksweep show corvid.sqlite 3fa9c2 --json > run.json

Point ids come from \`disksweep export\` (the point_id column) or a report. M_*, M_disk, Mdot_* and the
shares are plotted from the stored time series; the angular-momentum budget and the dead zone from the
checkpoints (the series does not carry them).`;

function jsonOf(record: StoredRecord, sweepName: string, alsoIn: readonly string[]): unknown {
  const base = { sweep_id: record.sweepId, sweep_name: sweepName, also_in_sweeps: alsoIn, point_id: record.pointId, point_index: record.pointIndex, params: record.params };
  if (record.outcome.kind === 'infrastructure') return { ...base, status: 'infrastructure_error', status_reason: record.outcome.reason };
  const { series, ...rest } = record.outcome.result;
  const columns = Object.fromEntries(Object.entries(decodeSeries(series)).map(([k, v]) => [k, Array.from(v)]));
  return { ...base, ...rest, series: columns };
}

function showAction(dbFile: string, pointText: string, flags: ShowFlags): void {
  withReader(dbFile, (reader) => {
    const sweeps = flags.sweep === undefined ? reader.listSweeps() : [pickSweep(reader, flags.sweep)];
    if (sweeps.length === 0) throw new DisksweepError('input/invalid-flag', `${dbFile} holds no sweep yet`);
    const found = findPoint(reader, pointText, sweeps);
    const record = reader.readResult(found.sweep.sweepId, found.pointId);
    if (record === undefined) {
      throw new DisksweepError('input/invalid-flag', `point ${found.pointId} of sweep ${found.sweep.name} has no result yet`, {
        details: [`run \`disksweep resume --db ${dbFile}\` to compute the points still missing`],
      });
    }
    if (flags.json === true) {
      process.stdout.write(JSON.stringify(jsonOf(record, found.sweep.name, found.alsoIn.map((s) => s.sweepId))) + '\n');
    }
    const header = `point ${found.pointId} (index ${record.pointIndex}) of sweep ${found.sweep.name} (${found.sweep.sweepId.slice(0, 12)})` +
      (found.alsoIn.length > 0 ? `; also in ${found.alsoIn.map((s) => s.name).join(', ')}` : '');
    if (record.outcome.kind === 'infrastructure') {
      if (flags.json !== true) process.stdout.write(`${header}\nno model result: the run failed outside the model (${record.outcome.reason})\n`);
      if (flags.svg !== undefined || flags.png !== undefined) throw new DisksweepError('input/invalid-flag', `point ${found.pointId} has no model result to plot`);
      return;
    }
    const result: ModelResult = record.outcome.result;
    const params = parseModelParams(record.params);
    const panels = pointPanels(params, result);
    if (flags.svg !== undefined || flags.png !== undefined) {
      const svg = svgDocument(pointFigure(`${found.sweep.name}: point ${found.pointId}`, panels));
      if (flags.svg !== undefined) writeOutputFile('--svg', flags.svg, svg);
      if (flags.png !== undefined) writeOutputFile('--png', flags.png, svgToPng(svg));
    }
    if (flags.json === true) return;
    const varied = sweepSpace(found.sweep).parameters.map((v) => `${v.name}=${JSON.stringify(record.params[v.name])}`);
    process.stdout.write([
      header,
      `varied in this sweep: ${varied.join(' ')}`,
      '',
      formatModelReport(params, result),
      '',
      terminalPanels(panels),
      ...(flags.svg !== undefined ? [`\nwrote ${flags.svg}`] : []),
      ...(flags.png !== undefined ? [`wrote ${flags.png}`] : []),
    ].join('\n') + '\n');
  });
}

export function showCommand(): Command {
  return new Command('show')
    .description('one stored run: parameters, checkpoints, plots against time (terminal, --svg, --png, --json)')
    .argument('<db>', 'the SQLite database of results')
    .argument('<point-id>', 'a point id, or a unique prefix of one')
    .option('--sweep <id-or-name>', 'look only in this sweep (id prefix or name)')
    .option('--svg <file>', 'write the plots as one SVG file')
    .option('--png <file>', 'write the plots as a PNG file')
    .option('--json', 'print the stored run as one JSON object (series as arrays)')
    .addHelpText('after', HELP)
    .action((db: string, point: string, flags: ShowFlags) => showAction(db, point, flags))
    .exitOverride();
}
