/**
 * The whitelist of names a filter may use, built from the parameter table (shared/model-params.ts) and the
 * output registry (shared/model-outputs.ts) through the store's registry columns. A name outside it is an
 * error with the nearest valid name; a name inside it maps to exactly one typed column of one table. Column
 * names reach SQL only from here (and through `ident`, which checks them again), never from what was typed.
 */
import { suggestionFor } from '../../shared/model-params.js';
import { CHECKPOINT_COLUMNS, PARAM_COLUMNS, SCALAR_COLUMNS } from '../store/registry-columns.js';

/** Where a name's values live: a parameter (points), a scalar output (results), a checkpoint output. */
export type NameSource = 'parameter' | 'scalar' | 'checkpoint';

export interface FilterName {
  readonly name: string;
  readonly source: NameSource;
  /** `text` for choice parameters (compared with 'quoted' values), `flag` for boolean outputs. */
  readonly type: 'number' | 'text' | 'flag';
  readonly unit: string;
  readonly description: string;
  /** The allowed values of a choice parameter. */
  readonly choices: readonly string[] | null;
}

function buildNames(): { bare: ReadonlyMap<string, FilterName>; checkpoint: ReadonlyMap<string, FilterName> } {
  const bare = new Map<string, FilterName>();
  const checkpoint = new Map<string, FilterName>();
  for (const col of PARAM_COLUMNS) {
    const d = col.descriptor;
    if (d.kind === 'list') continue; // a list (checkpoints_myr) is not a value a filter can compare
    bare.set(col.name, {
      name: col.name,
      source: 'parameter',
      type: d.kind === 'choice' ? 'text' : 'number',
      unit: d.kind === 'choice' ? '' : d.unit,
      description: d.description,
      choices: d.kind === 'choice' ? d.choices : null,
    });
  }
  for (const [source, cols, into] of [['scalar', SCALAR_COLUMNS, bare], ['checkpoint', CHECKPOINT_COLUMNS, checkpoint]] as const) {
    for (const col of cols) {
      const d = col.descriptor;
      // A parameter and a scalar output never share a name in practice; if they did, the parameter would win.
      if (into.has(col.name)) continue;
      into.set(col.name, { name: col.name, source, type: d.type === 'flag' ? 'flag' : 'number', unit: d.unit, description: d.description, choices: null });
    }
  }
  return { bare, checkpoint };
}

const NAMES = buildNames();

/**
 * Names written without a time: parameters (the model input, e.g. `m_disk_msun`, the initial disk mass) and
 * outputs recorded once per run (`t_solar_split_myr`).
 */
export const BARE_NAMES: ReadonlyMap<string, FilterName> = NAMES.bare;
/** Outputs recorded at checkpoints, written `name@<t>myr` (`m_disk_msun@1myr`, the disk mass at 1 Myr). */
export const CHECKPOINT_NAMES: ReadonlyMap<string, FilterName> = NAMES.checkpoint;

/** Every whitelisted name (bare and checkpoint). */
export const ALL_FILTER_NAMES: readonly string[] = [...new Set([...BARE_NAMES.keys(), ...CHECKPOINT_NAMES.keys()])];

/** ` (did you mean x?)` for the nearest whitelisted name, or ''. */
export function nearestName(name: string): string {
  return suggestionFor(name, ALL_FILTER_NAMES);
}

/** The whitelist as lines for `--help` and errors: name, where it lives, unit. */
export function filterNameLines(): string[] {
  return [...BARE_NAMES.values(), ...CHECKPOINT_NAMES.values()].map((n) => {
    const what = n.source === 'checkpoint' ? `${n.name}@<t>myr` : n.name;
    const unit = n.type === 'text' ? `one of ${(n.choices ?? []).map((c) => `'${c}'`).join(', ')}` : n.type === 'flag' ? 'true/false' : n.unit;
    return `${what.padEnd(34)} ${n.source.padEnd(10)} ${unit}`;
  });
}
