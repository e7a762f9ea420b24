#!/usr/bin/env node
/**
 * The `disksweep` command. Each subcommand parses and validates its flags, does its work, and exits with a
 * code scripts can rely on (see EXIT CODES in --help).
 */
import { Command, CommanderError } from 'commander';
import { DisksweepError, EXIT_BAD_INPUT, EXIT_FAILURE, EXIT_OK, describeError, exitCodeFor } from '../../shared/errors.js';
import { parseModelParams } from '../../shared/model-params.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { runValidatedModel } from '../../worker/model.js';
import { formatModelReport, formatParamList } from './model-report.js';
import { paramsFromFlags } from './param-flags.js';
import { probeCommand } from './probe-command.js';
import { showCommand } from './show-command.js';
import { exportCommand } from './export-command.js';
import { queryCommand } from './query-command.js';
import { mapCommand } from './map-command.js';
import { reportCommand } from './report-command.js';
import { sweepCommands } from './sweep-commands.js';
import { cancelCommand } from './redis-commands.js';
import { workCommand } from './work-command.js';

/** Exit code of `disksweep model` when the model ran but ended with a numerical status other than ok. */
const EXIT_MODEL_NOT_OK = 3;

const EXIT_CODES_HELP = `
Exit codes:
  0  success
  1  failure while running (a bug, or an unreadable file)
  2  bad input: an unknown parameter, a wrong type or a value outside its range; nothing was run
  3  (model) the model ran but ended with status step_limit, step_collapse, non_finite or budget_error
  130 (run, resume) interrupted by Ctrl-C after committing what had finished; resume goes on from there`;

const MODEL_HELP = `
Runs one 1-D viscous accretion-disk model: a seed star inside a collapsing cloud core (the default) or a
ready-made disk, evolved to t_end_myr, and prints checkpoints, the solar-like split, budgets and a plot.
Transport is MRI turbulence where the gas is ionized enough, with dead zones elsewhere (active_layer).

Examples:
  disksweep model                                   the default infall model, 5 Myr
  disksweep model --set active_layer=uniform        no dead zones (whole column active; ~7x fewer steps)
  disksweep model --set alpha_active=1e-3 --set t_end_myr=3
  disksweep model --set initial_state=disk --set m_disk_msun=0.1 --set r1_au=20
  disksweep model --set active_layer=fixed_column --set alpha_dead=1e-5 --json > run.json
  disksweep model --list                            every parameter with unit, default and range

Validity limits: thin, Keplerian, axisymmetric disk around a point-mass star (self-gravity only through the
Toomre-Q transport term; M_disk/M_* > 0.3 is flagged); vertically averaged, one-zone thermal structure;
the Shu/Cassen-Moosman infall is the slowly rotating isothermal-sphere solution. The ionization chemistry
is grain-free: dust would lower x_e and shrink the active layers a lot, so read them as upper bounds. The
thermal MRI switch reads the dead column's (quiescent) temperature: self-sustained MRI outbursts are not
followed (activity_temperature=midplane follows them, slowly).`;

function modelCommand(): Command {
  return new Command('model')
    .description('run one disk model and print a summary (or --json)')
    .option('-s, --set <name=value>', 'set a parameter (repeatable); see --list', (v: string, acc: string[]) => [...acc, v], [] as string[])
    .option('--json', 'print exactly one ModelResult JSON object on stdout')
    .option('--list', 'list every parameter with unit, default, range and meaning, then exit')
    .addHelpText('after', MODEL_HELP + '\n' + EXIT_CODES_HELP)
    .action((opts: { set: string[]; json?: boolean; list?: boolean }) => {
      if (opts.list === true) {
        process.stdout.write(formatParamList() + '\n');
        return;
      }
      const params = parseModelParams(paramsFromFlags(opts.set));
      const result = runValidatedModel(params);
      process.stdout.write((opts.json === true ? JSON.stringify(result) : formatModelReport(params, result)) + '\n');
      if (result.status !== 'ok') process.exitCode = EXIT_MODEL_NOT_OK;
    });
}

function buildProgram(): Command {
  const program = new Command('disksweep')
    .description('Parameter sweeps of 1-D protostellar accretion-disk evolution')
    .version(MODEL_VERSION, '-V, --version', 'print the model version')
    .addHelpText('after', EXIT_CODES_HELP)
    .showHelpAfterError('(run with --help for usage)')
    .exitOverride()
    .addCommand(modelCommand().exitOverride())
    .addCommand(probeCommand())
    .addCommand(queryCommand())
    .addCommand(workCommand().exitOverride())
    .addCommand(cancelCommand().exitOverride());
  for (const c of sweepCommands()) program.addCommand(c.exitOverride());
  program.addCommand(showCommand());
  program.addCommand(exportCommand());
  program.addCommand(mapCommand());
  program.addCommand(reportCommand());
  return program;
}

async function main(argv: readonly string[]): Promise<number> {
  try {
    await buildProgram().parseAsync([...argv], { from: 'user' });
    return typeof process.exitCode === 'number' ? process.exitCode : EXIT_OK;
  } catch (error) {
    if (error instanceof CommanderError) {
      // --help and --version end here with exit code 0; flag mistakes with commander's own message (already printed).
      return error.exitCode === 0 ? EXIT_OK : EXIT_BAD_INPUT;
    }
    process.stderr.write(describeError(error) + '\n');
    return exitCodeFor(error);
  }
}

// `disksweep export ... | head`: the reader closing the pipe is its choice, not our failure. Node ignores SIGPIPE and
// reports EPIPE as an error on stdout, which would otherwise surface as an unhandled exception with a stack.
process.stdout.on('error', (error: NodeJS.ErrnoException) => {
  if (error.code === 'EPIPE') process.exit(EXIT_OK);
  throw error;
});

// Whatever escapes (a library's late error, an unhandled rejection) is printed through the one redactor, never
// as Node's raw stack trace, which may hold a Redis URL with its password.
const crash = (error: unknown): void => {
  process.stderr.write(describeError(error) + '\n');
  process.exit(EXIT_FAILURE);
};
process.on('uncaughtException', crash);
process.on('unhandledRejection', crash);

// Every command ends by settling main()'s promise. Should a bug ever leave it pending with nothing left for the
// event loop to wait for, Node would end the process with its own exit code 13 ("unsettled top-level await")
// and no word of explanation: say what happened and exit 1 instead. Committed results are kept either way.
let settled = false;
process.on('beforeExit', () => {
  if (settled) return;
  crash(new DisksweepError('internal/unexpected', 'the command stopped before it finished: nothing was left to wait for (a bug; please report it)', {
    details: ['results committed so far are kept: `disksweep resume --db FILE` goes on with a sweep'],
  }));
});

const code = await main(process.argv.slice(2));
settled = true;
// A failed command exits now: a Redis client still retrying (or a library rejecting late while it shuts down)
// must neither keep the process alive nor change its exit code. Output is written synchronously to pipes
// and files on Linux and macOS, so nothing printed is lost.
if (code !== EXIT_OK) process.exit(code);
process.exitCode = code;
