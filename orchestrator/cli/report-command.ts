/**
 * `disksweep report DB --target ... --out DIR`: a static HTML page (index.html; inline SVG and CSS, no
 * network, no script) with the summary, the constraints, the marginal plots, the PRIM trajectory and maps of
 * the most constraining pairs, plus the exports it links to (CSV, ECSV with units, the query answer as JSON).
 */
import { join } from 'node:path';
import { Command } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { answerQuery } from '../query/answer.js';
import { evaluateTargets } from '../query/index.js';
import { constrainingPairs, mapFigure, marginalFigure, trajectoryFigure } from '../report/report-figures.js';
import { prepareOutDir, safeFileStem } from '../report/report-files.js';
import { reportPage } from '../report/report-page.js';
import { withReaderAsync } from '../store/read-access.js';
import { exportSweep } from './export-command.js';
import { isGridSweep, parseBins } from './map-command.js';
import { writeOutputFile } from './output-file.js';
import { queryAnswerJson } from './query-report.js';
import { parseTargetFlags, withTargetOptions, type TargetFlags } from './target-flags.js';

interface ReportFlags extends TargetFlags {
  readonly out: string;
  readonly force?: boolean;
  readonly bins: string;
}

const HELP = `
Examples:
  disksweep report corvid-rift-cores.sqlite --target solar-split --out report/
  disksweep report corvid.sqlite --target solar-split --target 'accretion-window(at_myr=1)' \\
      --where 'm_core_msun >= 1' --out reports/corvid-1msun --force

Writes into DIR: index.html (open it in any browser; it loads nothing from anywhere), <sweep>.csv and
<sweep>.ecsv (one row per point with a pass column), and <sweep>-answer.json (what \`disksweep query --json\`
prints). DIR must be empty or new; --force writes over the report's files in it and leaves others alone.
Maps are drawn for the pairs among the three parameters that constrain the targets most (by the share of
their range the best PRIM box cuts away, then by the spread of their marginal pass fraction).`;

async function reportAction(dbFile: string, flags: ReportFlags): Promise<void> {
  const bins = parseBins(flags.bins);
  const targets = parseTargetFlags(flags, true);
  await withReaderAsync(dbFile, async (reader) => {
    const ev = evaluateTargets(reader, { sweep: flags.sweep, targets, where: flags.where });
    if (ev.counts.selected === 0) {
      throw new DisksweepError('input/no-data', ev.counts.ok === 0 ? `sweep ${ev.sweep.name} in ${dbFile} has no ok result yet: nothing to report` : `--where ${flags.where ?? ''} selects none of the ${ev.counts.ok} points with an ok result`);
    }
    prepareOutDir(flags.out, flags.force === true);
    process.stderr.write(`${ev.counts.selected} points; finding PRIM boxes...\n`);
    const answer = answerQuery(ev, { bins });
    const gridPlan = isGridSweep(ev);
    const names = ev.parameters.map((p) => p.name);
    const maps = constrainingPairs(answer).map(([x, y]) => {
      const m = mapFigure(ev, x, y, bins, gridPlan, `${ev.sweep.name}: ${names[x]} and ${names[y]}`);
      return { figure: m.figure, caption: `Pass fraction of ${ev.targets.map((t) => t.text).join(' and ')} over ${names[x]} and ${names[y]}, all other parameters marginalised; dashed: the 50 % contour.` };
    });
    const stem = safeFileStem(ev.sweep.name);
    const files = { csv: `${stem}.csv`, ecsv: `${stem}.ecsv`, json: `${stem}-answer.json` };
    await exportSweep(reader, ev.sweep, 'csv', ev, join(flags.out, files.csv));
    await exportSweep(reader, ev.sweep, 'ecsv', ev, join(flags.out, files.ecsv));
    writeOutputFile('--out', join(flags.out, files.json), JSON.stringify(queryAnswerJson(answer), null, 1) + '\n');
    const html = reportPage({
      answer,
      marginals: answer.marginals.map((m) => marginalFigure(m, answer.pass.fraction)),
      trajectory: trajectoryFigure(answer),
      maps,
      links: [
        { href: files.csv, label: `${files.csv}: one row per point (parameters, outputs with units in the names, pass)` },
        { href: files.ecsv, label: `${files.ecsv}: the same as ECSV, with units and descriptions for astropy` },
        { href: files.json, label: `${files.json}: the whole query answer (marginals, PRIM boxes and trajectories)` },
      ],
      generatedAt: new Date().toISOString(),
    });
    const index = join(flags.out, 'index.html');
    writeOutputFile('--out', index, html);
    process.stdout.write(`wrote ${index} (${answer.pass.k} of ${answer.pass.n} pass; ${maps.length} map${maps.length === 1 ? '' : 's'}) and ${files.csv}, ${files.ecsv}, ${files.json}\n`);
  });
}

export function reportCommand(): Command {
  return withTargetOptions(
    new Command('report')
      .description('a self-contained HTML report (summary, constraints, marginals, maps) plus CSV/ECSV exports, in a directory')
      .argument('<db>', 'the SQLite database of results')
      .requiredOption('--out <dir>', 'directory to write (new or empty, unless --force)'),
    { targetRequired: true },
  )
    .option('--force', 'write into a directory that is not empty (the report files are replaced, others left alone)')
    .option('--bins <n>', 'bins per parameter for marginals and maps of parameters not sampled on a grid or list', '10')
    .addHelpText('after', HELP)
    .action((db: string, flags: ReportFlags) => reportAction(db, flags))
    .exitOverride();
}
