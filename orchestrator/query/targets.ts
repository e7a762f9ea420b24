/**
 * Targets: named, parameterised predicates over recorded outputs. Each is a descriptor (name, meaning, source,
 * arguments with unit, default and range) whose `build` returns a filter tree (parser.ts), so a target compiles
 * through the same whitelist and bound-parameter path as a typed --where filter. Several targets combine with
 * `and`.
 *
 * On the command line: `name` or `name(arg=value, ...)`, e.g. `solar-split`, `solar-split(f_m=0.995,t_max_myr=2)`,
 * `accretion-window(at_myr=1,min=1e-9,max=1e-7)`, `dead-zone(present=no)`.
 */
import { DisksweepError } from '../../shared/errors.js';
import type { ScalarOutputName } from '../../shared/model-outputs.js';
import { suggestionFor } from '../../shared/model-params.js';
import type { CompareOp, Expr } from './parser.js';

export interface TargetArg {
  readonly name: string;
  /** Unit of a number (`Myr`, `M_sun/yr`, `AU`, `1`), or `yes/no`. */
  readonly unit: string;
  readonly kind: 'number' | 'yesno';
  /** null: optional, no bound. */
  readonly default: number | boolean | null;
  /** Allowed interval of a number (inclusive unless `minExclusive`). */
  readonly min?: number;
  readonly max?: number;
  readonly minExclusive?: boolean;
  readonly description: string;
}

export type TargetArgs = Readonly<Record<string, number | boolean | null>>;

export interface TargetDescriptor {
  readonly name: string;
  readonly description: string;
  /** Where the default window comes from (a paper, or "common practice"). */
  readonly source: string;
  readonly args: readonly TargetArg[];
  /** The condition for these (complete, validated) arguments. */
  build(args: TargetArgs): Expr;
}

/** One target as asked for: its descriptor, every argument (defaults filled in), and how it was written. */
export interface TargetInvocation {
  readonly descriptor: TargetDescriptor;
  readonly args: TargetArgs;
  /** Canonical text with every argument, e.g. `solar-split(f_m=0.99,f_j=0.02,t_max_myr=3)`. */
  readonly text: string;
}

const C = 1; // column of target-built nodes: errors about them name the target, not a column
const num = (value: number): Expr => ({ kind: 'number', value, column: C });
const at = (name: string, t: number): Expr => ({ kind: 'ref', name, atMyr: t, column: C });
const cmp = (a: Expr, op: CompareOp, b: Expr): Expr => ({ kind: 'compare', ops: [op], operands: [a, b], column: C });
const within = (lo: number | null, x: Expr, hi: number | null): Expr[] => [
  ...(lo === null ? [] : [cmp(num(lo), '<=', x)]),
  ...(hi === null ? [] : [cmp(x, '<=', num(hi))]),
];
const allOf = (parts: readonly Expr[]): Expr =>
  parts.length === 0 ? { kind: 'bool', value: true, column: C } : parts.reduce((a, b) => ({ kind: 'and', left: a, right: b, column: C }));

const atMyr: TargetArg = { name: 'at_myr', unit: 'Myr', kind: 'number', default: 1, min: 0, minExclusive: true, description: 'checkpoint time (one the sweep records)' };
const n = (a: TargetArgs, k: string): number | null => (typeof a[k] === 'number' ? (a[k] as number) : null);

/** The recorded dispersal time (null while a disk is still there when its run ends). */
const LIFETIME_OUTPUT: ScalarOutputName = 'disk_lifetime_myr';

export const TARGETS: readonly TargetDescriptor[] = [
  {
    name: 'solar-split',
    description:
      'the solar-like split is reached by t_max: M_*/(M_* + M_disk) >= f_m and J_spin/(J_spin + J_disk) <= f_j, first holding ' +
      'after infall ends. Thresholds other than those the models ran with are re-evaluated from the stored series.',
    source: 'the Sun holds about 99.86 % of the solar-system mass and about 0.6 % of its angular momentum (from memory)',
    args: [
      { name: 'f_m', unit: '1', kind: 'number', default: 0.99, min: 0, max: 1, minExclusive: true, description: 'least star share of the mass' },
      { name: 'f_j', unit: '1', kind: 'number', default: 0.02, min: 0, max: 1, minExclusive: true, description: 'largest spin share of the angular momentum' },
      { name: 't_max_myr', unit: 'Myr', kind: 'number', default: 3, min: 0, minExclusive: true, description: 'latest time the split may first hold' },
    ],
    build: (a) => cmp({ kind: 'split-time', fMass: n(a, 'f_m') ?? 0.99, fJ: n(a, 'f_j') ?? 0.02, column: C }, '<=', num(n(a, 't_max_myr') ?? 3)),
  },
  {
    name: 'accretion-window',
    description: 'the accretion rate onto the star at a checkpoint lies in [min, max]',
    source: 'Hartmann et al. 1998 (ApJ 495, 385): T Tauri accretion rates of about 1e-9 to 1e-7 M_sun/yr near 1 Myr',
    args: [
      atMyr,
      { name: 'min', unit: 'M_sun/yr', kind: 'number', default: 1e-9, min: 0, description: 'lowest rate' },
      { name: 'max', unit: 'M_sun/yr', kind: 'number', default: 1e-7, min: 0, description: 'highest rate' },
      { name: 'averaged', unit: 'yes/no', kind: 'yesno', default: false, description: 'use the rate averaged over the preceding 1e4 yr instead of the current one' },
    ],
    build: (a) => allOf(within(n(a, 'min'), at(a.averaged === true ? 'mdot_star_avg_msun_yr' : 'mdot_star_msun_yr', n(a, 'at_myr') ?? 1), n(a, 'max'))),
  },
  {
    name: 'dead-zone',
    description:
      'a dead zone is present (or, with present=no, absent) at a checkpoint; with present=yes its outermost dead band may be ' +
      'bounded: inner edge in [r_in_min_au, r_in_max_au], outer edge in [r_out_min_au, r_out_max_au], width in [width_min_au, width_max_au]',
    source: 'layered accretion with a dead zone (Gammie 1996); no observed window is implied',
    args: [
      atMyr,
      { name: 'present', unit: 'yes/no', kind: 'yesno', default: true, description: 'yes: a dead zone must exist; no: none may' },
      ...([
        ['r_in_min_au', 'lowest inner edge'], ['r_in_max_au', 'highest inner edge'],
        ['r_out_min_au', 'lowest outer edge'], ['r_out_max_au', 'highest outer edge'],
        ['width_min_au', 'least width (outer minus inner edge)'], ['width_max_au', 'largest width'],
      ] as const).map(([name, what]): TargetArg => ({ name, unit: 'AU', kind: 'number', default: null, min: 0, description: `${what} of the outermost dead band` })),
    ],
    build: (a) => {
      const t = n(a, 'at_myr') ?? 1;
      if (a.present === false) return cmp(at('n_dead_bands', t), '=', num(0));
      const width: Expr = { kind: 'arith', op: '-', left: at('r_dead_out_au', t), right: at('r_dead_in_au', t), column: C };
      return allOf([
        cmp(at('n_dead_bands', t), '>', num(0)),
        ...within(n(a, 'r_in_min_au'), at('r_dead_in_au', t), n(a, 'r_in_max_au')),
        ...within(n(a, 'r_out_min_au'), at('r_dead_out_au', t), n(a, 'r_out_max_au')),
        ...within(n(a, 'width_min_au'), width, n(a, 'width_max_au')),
      ]);
    },
  },
  {
    name: 'disk-fraction',
    description: 'the disk-to-star mass ratio M_disk/M_* at a checkpoint lies in [min, max]',
    source: 'common practice, no source: 0.1 bounds the thin, gravitationally stable disks this model describes',
    args: [
      atMyr,
      { name: 'min', unit: '1', kind: 'number', default: 0, min: 0, description: 'lowest ratio' },
      { name: 'max', unit: '1', kind: 'number', default: 0.1, min: 0, description: 'highest ratio' },
    ],
    build: (a) => {
      const t = n(a, 'at_myr') ?? 1;
      return allOf(within(n(a, 'min'), { kind: 'arith', op: '/', left: at('m_disk_msun', t), right: at('m_star_msun', t), column: C }, n(a, 'max')));
    },
  },
  {
    name: 'lifetime',
    description: 'the disk lifetime (the recorded dispersal time) lies in [min_myr, max_myr]; a disk still there when its run ends fails',
    source: 'common practice, no source: disks around young stars disperse within about 1-10 Myr',
    args: [
      { name: 'min_myr', unit: 'Myr', kind: 'number', default: 1, min: 0, description: 'shortest lifetime' },
      { name: 'max_myr', unit: 'Myr', kind: 'number', default: 10, min: 0, description: 'longest lifetime' },
    ],
    build: (a) => allOf(within(n(a, 'min_myr'), { kind: 'ref', name: LIFETIME_OUTPUT, atMyr: null, column: C }, n(a, 'max_myr'))),
  },
];

const TARGET_NAMES = TARGETS.map((t) => t.name);

function targetError(text: string, message: string, details: readonly string[] = []): DisksweepError {
  return new DisksweepError('input/invalid-target', `--target ${text}: ${message}`, { details });
}

function argValue(text: string, arg: TargetArg, raw: string): number | boolean {
  if (arg.kind === 'yesno') {
    if (/^(yes|true)$/i.test(raw)) return true;
    if (/^(no|false)$/i.test(raw)) return false;
    throw targetError(text, `${arg.name} takes yes or no (got "${raw}")`);
  }
  const v = /^[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?$/.test(raw) ? Number(raw) : Number.NaN;
  const lowOk = arg.min === undefined || (arg.minExclusive === true ? v > arg.min : v >= arg.min);
  const highOk = arg.max === undefined || v <= arg.max;
  if (!Number.isFinite(v) || !lowOk || !highOk) {
    const range = `${arg.min === undefined ? '' : `${arg.minExclusive === true ? '>' : '>='} ${arg.min}`}${arg.min !== undefined && arg.max !== undefined ? ' and ' : ''}${arg.max === undefined ? '' : `<= ${arg.max}`}`;
    throw targetError(text, `${arg.name} must be a number${range === '' ? '' : ` ${range}`} (${arg.unit}) (got "${raw}")`);
  }
  return v;
}

/** Canonical text of a target with every argument that has a value. */
function canonical(d: TargetDescriptor, args: TargetArgs): string {
  const parts = d.args.flatMap((a) => (args[a.name] === null ? [] : [`${a.name}=${typeof args[a.name] === 'boolean' ? (args[a.name] ? 'yes' : 'no') : String(args[a.name])}`]));
  return parts.length === 0 ? d.name : `${d.name}(${parts.join(',')})`;
}

const TARGET_TEXT = /^\s*([a-z][a-z0-9-]*)\s*(?:\((.*)\))?\s*$/s;
/** Longest --target text accepted. */
const MAX_TARGET_CHARS = 500;

/** Parse one --target value: `name` or `name(arg=value, ...)`. Throws `input/invalid-target` (exit 2). */
export function parseTarget(text: string): TargetInvocation {
  if (text.length > MAX_TARGET_CHARS) throw targetError(text.slice(0, 40) + '...', `longer than ${MAX_TARGET_CHARS} characters`);
  const m = TARGET_TEXT.exec(text);
  if (m === null) throw targetError(text, 'write a target as name or name(arg=value, ...), e.g. solar-split(f_m=0.995,t_max_myr=2)', TARGETS.map((t) => t.name));
  const d = TARGETS.find((t) => t.name === m[1]);
  if (d === undefined) throw targetError(text, `unknown target "${m[1]}"${suggestionFor(m[1], TARGET_NAMES)}`, TARGETS.map((t) => `${t.name}: ${t.description}`));
  const args: Record<string, number | boolean | null> = Object.fromEntries(d.args.map((a) => [a.name, a.default]));
  const given = new Set<string>();
  for (const part of (m[2] ?? '').split(',').map((s) => s.trim()).filter((s) => s !== '')) {
    const eq = /^([a-z_][a-z0-9_]*)\s*=\s*(\S+)$/i.exec(part);
    if (eq === null) throw targetError(text, `expected arg=value, got "${part}"`);
    const arg = d.args.find((a) => a.name === eq[1]);
    if (arg === undefined) {
      throw targetError(text, `${d.name} has no argument "${eq[1]}"${suggestionFor(eq[1], d.args.map((a) => a.name))}`, d.args.map((a) => `${a.name} (${a.unit}): ${a.description}`));
    }
    if (given.has(arg.name)) throw targetError(text, `${arg.name} is given twice`);
    given.add(arg.name);
    args[arg.name] = argValue(text, arg, eq[2]);
  }
  for (const [lo, hi] of [['min', 'max'], ['min_myr', 'max_myr'], ['r_in_min_au', 'r_in_max_au'], ['r_out_min_au', 'r_out_max_au'], ['width_min_au', 'width_max_au']]) {
    const a = args[lo];
    const b = args[hi];
    if (typeof a === 'number' && typeof b === 'number' && a > b) throw targetError(text, `${lo} (${a}) is above ${hi} (${b})`);
  }
  if (d.name === 'dead-zone' && args.present === false && d.args.some((a) => a.kind === 'number' && a.name !== 'at_myr' && args[a.name] !== null)) {
    throw targetError(text, 'present=no takes no edge or width bounds');
  }
  return { descriptor: d, args, text: canonical(d, args) };
}

/** The targets with their arguments, for `--help`. */
export function targetHelpLines(): string[] {
  return TARGETS.flatMap((t) => [
    `  ${t.name}: ${t.description}`,
    `      source: ${t.source}`,
    ...t.args.map((a) => `      ${a.name}=${a.default === null ? '(none)' : typeof a.default === 'boolean' ? (a.default ? 'yes' : 'no') : String(a.default)}  ${a.unit === 'yes/no' ? 'yes/no' : `[${a.unit}]`}  ${a.description}`),
  ]);
}
