/**
 * The --target / --where / --sweep flags of the commands that evaluate targets on a stored sweep (map,
 * report, export --target), defined once so they read and fail alike. Targets and filters are parsed by the
 * query layer (orchestrator/query); this only collects the flag text.
 */
import { Option, type Command } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { parseTarget, type TargetInvocation } from '../query/index.js';

export interface TargetFlags {
  readonly target: readonly string[];
  readonly where?: string;
  readonly sweep?: string;
}

export function withTargetOptions(cmd: Command, options: { targetRequired: boolean }): Command {
  return cmd
    .addOption(
      new Option('-t, --target <target>', `a target, e.g. solar-split or 'accretion-window(at_myr=1)' (repeatable: all must hold${options.targetRequired ? '' : '; optional'})`)
        .argParser((v: string, acc: string[]) => [...acc, v])
        .default([] as string[], 'none'),
    )
    .option('-w, --where <filter>', "only the points this filter accepts, e.g. 'alpha_active >= 1e-3 and m_star_msun@1myr > 0.5'")
    .option('--sweep <id-or-name>', 'which sweep (id prefix or name); default: the only or the latest one');
}

/** The targets of the flags; with `required`, at least one (exit 2 otherwise). */
export function parseTargetFlags(flags: TargetFlags, required: boolean): TargetInvocation[] {
  if (required && flags.target.length === 0) {
    throw new DisksweepError('input/invalid-flag', 'give at least one --target, e.g. --target solar-split (`disksweep query --help` lists them)');
  }
  return flags.target.map(parseTarget);
}
