/**
 * `disksweep query DB --target ... [--where ...] [--sweep ...] [--json]`: which parameter regions of a stored
 * sweep pass the targets. Reads the database only (safe while a sweep writes it). Bad flags, filters and
 * targets exit 2 naming what is wrong.
 */
import { Command } from 'commander';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { answerQuery } from '../query/answer.js';
import { evaluateTargets } from '../query/evaluate.js';
import { filterNameLines } from '../query/names.js';
import { targetHelpLines } from '../query/targets.js';
import { openStore } from '../store/index.js';
import { formatQueryReport, queryAnswerJson } from './query-report.js';
import { parseTargetFlags, withTargetOptions } from './target-flags.js';

const QUERY_HELP = `
Targets (--target, repeatable: all must hold). Write a target as name or name(arg=value,...):
${targetHelpLines().join('\n')}

Filters (--where) select the points to look at, in a small grammar:
  comparisons  < <= > >= = !=      ranges  1e-3 <= alpha_active < 1e-2
  and, or, not, parentheses        arithmetic  + - * /   numbers like 2.5e-7
  parameters and per-run outputs by name (alpha_active, t_solar_split_myr); checkpoint outputs with their
  time: m_star_msun@1myr (the times the sweep records); choices in quotes: active_layer = 'ionization';
  flags alone: not flag_massive_disk. A comparison with a missing value (e.g. r50_au of an empty disk) is false.

Examples:
  disksweep query corvid-rift-cores.sqlite --target solar-split
  disksweep query corvid-rift-cores.sqlite --target 'solar-split(f_m=0.995,t_max_myr=2)' --target accretion-window
  disksweep query corvid-rift-cores.sqlite --target 'accretion-window(at_myr=1,min=1e-9,max=1e-7)' \\
      --where 'm_core_msun >= 1 and not flag_massive_disk' --json > answer.json
  disksweep query survey.sqlite --sweep tern-2 --target 'dead-zone(at_myr=1,r_out_min_au=5)' --bins 6

The answer: the pass count and fraction with a Wilson (1927) 95% interval; per varied parameter the pass
fraction in bins (log bins for log-sampled parameters) with intervals and a bar chart; PRIM boxes (Friedman &
Fisher 1999: peeling, pasting, covering; boxes in log space for log-sampled parameters) with their
coverage/density trajectory; and a constraint summary of the best box to paste into a paper. The box kept from a
trajectory is the largest whose pass rate cannot be told from the best one's at 95%.

Names a filter may use (name, where it lives, unit):
${filterNameLines().map((l) => `  ${l}`).join('\n')}

Exit codes: 0 answered; 2 bad input (unknown target, argument, name or sweep; a filter that does not parse,
with the column; an output this database was written without; no point selected).`;

const optionsSchema = z.object({
  target: z.array(z.string()),
  where: z.string().optional(),
  sweep: z.string().optional(),
  json: z.boolean().optional(),
  bins: z.coerce.number().int().min(2).max(100),
  alpha: z.coerce.number().gt(0).lt(0.5),
  minSupport: z.coerce.number().gt(0).lt(1),
  boxes: z.coerce.number().int().min(1).max(10),
});

const FLAG_NAMES: Readonly<Record<string, string>> = { minSupport: '--min-support', bins: '--bins', alpha: '--alpha', boxes: '--boxes' };

function queryAction(db: string, raw: unknown): void {
  const parsed = optionsSchema.safeParse(raw);
  if (!parsed.success) {
    const details = parsed.error.issues.map((i) => `${FLAG_NAMES[String(i.path[0])] ?? String(i.path[0])}: ${i.message}`);
    throw new DisksweepError('input/invalid-flag', 'query: invalid flags', { details });
  }
  const opts = parsed.data;
  const targets = parseTargetFlags(opts, true);
  const store = openStore(db, { mode: 'read' });
  try {
    process.stderr.write('evaluating the targets...\n');
    const ev = evaluateTargets(store, { sweep: opts.sweep, targets, where: opts.where });
    if (ev.counts.selected === 0) {
      throw new DisksweepError('input/no-data', ev.counts.ok === 0
        ? `sweep ${ev.sweep.name} in ${db} has no ok result yet: nothing to ask`
        : `--where ${opts.where ?? ''} selects none of the ${ev.counts.ok} points with an ok result`);
    }
    process.stderr.write(`${ev.counts.selected} points; finding PRIM boxes...\n`);
    const answer = answerQuery(ev, { bins: opts.bins, alpha: opts.alpha, minSupport: opts.minSupport, maxBoxes: opts.boxes });
    process.stdout.write((opts.json === true ? JSON.stringify(queryAnswerJson(answer)) : formatQueryReport(answer)) + '\n');
  } finally {
    store.close();
  }
}

export function queryCommand(): Command {
  const cmd = new Command('query')
    .description('which parameter regions of a stored sweep pass the targets: counts, marginals, PRIM boxes, constraints')
    .argument('<db>', 'the SQLite database of results');
  return withTargetOptions(cmd, { targetRequired: true })
    .option('--bins <n>', 'bins per parameter for the marginals (lists, choices and small grids: one per value)', '10')
    .option('--alpha <fraction>', 'PRIM peeling fraction', '0.05')
    .option('--min-support <fraction>', 'PRIM minimum support: smallest share of the points a box may hold', '0.05')
    .option('--boxes <n>', 'PRIM boxes to find (covering)', '3')
    .option('--json', 'print one JSON object with the whole answer')
    .addHelpText('after', QUERY_HELP)
    .exitOverride()
    .action((db: string, opts: unknown) => queryAction(db, opts));
}
