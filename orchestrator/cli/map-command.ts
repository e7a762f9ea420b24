/**
 * `disksweep map DB --x P1 --y P2 --target ...`: the pass fraction of the targets on a grid of two varied
 * parameters, marginalised over the rest, in the terminal (block characters), as SVG and PNG (heat map with
 * the 50 % contour), or as JSON.
 */
import { Command } from 'commander';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { DEFAULT_BINS, MAX_BINS, gridHeatMap, gridTerminalMap, passGrid, type MapAxis, type PassGrid } from '../map/pass-grid.js';
import { svgDocument } from '../plots/svg.js';
import { svgToPng } from '../plots/png.js';
import { renderTerminalMap } from '../plots/terminal-map.js';
import { evaluateTargets, type Evaluation } from '../query/index.js';
import { parseSpecText } from '../spec/load-spec.js';
import { withReader } from '../store/read-access.js';
import { writeOutputFile } from './output-file.js';
import { parseTargetFlags, withTargetOptions, type TargetFlags } from './target-flags.js';

interface MapFlags extends TargetFlags {
  readonly x: string;
  readonly y: string;
  readonly bins: string;
  readonly svg?: string;
  readonly png?: string;
  readonly json?: boolean;
}

const HELP = `
Examples:
  disksweep map corvid-rift-cores.sqlite --x alpha_active --y m_core_msun --target solar-split
  disksweep map corvid.sqlite --x alpha_active --y omega_core_s --target solar-split \\
      --target 'accretion-window(at_myr=1)' --where 'm_core_msun >= 1' --svg map.svg --png map.png
  disksweep map survey.sqlite --x alpha_active --y lx_erg_s --target 'dead-zone(at_myr=1)' --bins 20 --json

Each cell holds the points whose two values fall in it, whatever their other parameters (marginalised), and
shows the share that pass. Bins: one per grid value or listed value, or --bins equal bins over the range for
Latin-hypercube, Sobol and random sweeps; log bins for log-sampled parameters. The dashed line in the SVG is
the 50 % contour (marching squares through the cell centres); in the terminal it is the edge between ▒ and ▓.
Targets and filters are those of \`disksweep query\` (see its --help).`;

const binsSchema = z.coerce.number().int().min(2).max(MAX_BINS);

export function parseBins(text: string): number {
  const r = binsSchema.safeParse(text);
  if (!r.success) throw new DisksweepError('input/invalid-flag', `--bins: expected a whole number from 2 to ${MAX_BINS} (got "${text}")`);
  return r.data;
}

/** True when the sweep's points lie on a grid (so a range parameter has `count` exact levels). */
export function isGridSweep(ev: Evaluation): boolean {
  return parseSpecText(ev.sweep.specJson, `sweep ${ev.sweep.name}`, 'json').spec.sampling.plan === 'grid';
}

const targetText = (ev: Evaluation): string => ev.targets.map((t) => t.text).join(' and ');

export function mapTitle(ev: Evaluation): string {
  return `${ev.sweep.name}: ${targetText(ev)}${ev.where === null ? '' : ` where ${ev.where}`}`;
}


const axisJson = (a: MapAxis) => ({ name: a.parameter.name, unit: a.parameter.unit, scale: a.axis, edges: a.edges, categories: a.categories, label: a.label });

function mapJson(ev: Evaluation, grid: PassGrid): unknown {
  return {
    sweep_id: ev.sweep.sweepId, sweep_name: ev.sweep.name, targets: ev.targets.map((t) => t.text), where: ev.where,
    counts: ev.counts, x: axisJson(grid.x), y: axisJson(grid.y),
    cells: { order: 'row by row: cell (i, j) at j * nx + i, j along y', count: Array.from(grid.counts), pass: Array.from(grid.passes), fraction: Array.from(grid.fractions, (f) => (Number.isNaN(f) ? null : f)) },
    notes: ev.notes,
  };
}

function mapAction(dbFile: string, flags: MapFlags): void {
  const bins = parseBins(flags.bins);
  const targets = parseTargetFlags(flags, true);
  withReader(dbFile, (reader) => {
    const ev = evaluateTargets(reader, { sweep: flags.sweep, targets, where: flags.where });
    if (ev.counts.selected === 0) {
      throw new DisksweepError('input/no-data', ev.counts.ok === 0 ? `sweep ${ev.sweep.name} in ${dbFile} has no ok result yet: nothing to map` : `--where ${flags.where ?? ''} selects none of the ${ev.counts.ok} points with an ok result`);
    }
    const grid = passGrid(ev, flags.x, flags.y, { bins, gridPlan: isGridSweep(ev) });
    if (flags.svg !== undefined || flags.png !== undefined) {
      const svg = svgDocument(gridHeatMap(grid, mapTitle(ev)));
      if (flags.svg !== undefined) writeOutputFile('--svg', flags.svg, svg);
      if (flags.png !== undefined) writeOutputFile('--png', flags.png, svgToPng(svg));
    }
    if (flags.json === true) {
      process.stdout.write(JSON.stringify(mapJson(ev, grid)) + '\n');
      return;
    }
    const c = ev.counts;
    process.stdout.write([
      mapTitle(ev),
      `${c.passed} of ${c.selected} selected points pass (${((100 * c.passed) / c.selected).toFixed(1)} %); ${c.ok} of ${c.points} points have an ok result`,
      ...ev.notes.map((n) => `note: ${n}`),
      '',
      renderTerminalMap(gridTerminalMap(grid)),
      ...(flags.svg !== undefined ? [`wrote ${flags.svg}`] : []),
      ...(flags.png !== undefined ? [`wrote ${flags.png}`] : []),
    ].join('\n') + '\n');
  });
}

export function mapCommand(): Command {
  return withTargetOptions(
    new Command('map')
      .description('pass fraction on a grid of two varied parameters (terminal, --svg, --png, --json), with the 50 % contour')
      .argument('<db>', 'the SQLite database of results')
      .requiredOption('--x <parameter>', 'varied parameter along x')
      .requiredOption('--y <parameter>', 'varied parameter along y'),
    { targetRequired: true },
  )
    .option('--bins <n>', `bins per axis for parameters not sampled on a grid or list (2-${MAX_BINS})`, String(DEFAULT_BINS))
    .option('--svg <file>', 'write the map as SVG')
    .option('--png <file>', 'write the map as PNG')
    .option('--json', 'print the grid (edges, counts, passes, fractions) as one JSON object')
    .addHelpText('after', HELP)
    .action((db: string, flags: MapFlags) => mapAction(db, flags))
    .exitOverride();
}
