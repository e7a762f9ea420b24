/**
 * From a filter tree to an SQL expression over the aliases of the query statement (evaluate.ts):
 * `p` = points, `r` = results, `c0`, `c1`, ... = checkpoint_rows at one checkpoint time each, `s` = series_rows
 * inside a sub-select. Every value typed by a person becomes a bound parameter (`?`); names become columns only
 * through the whitelist (names.ts) and `ident`. Operators come from the grammar's fixed set.
 *
 * Logic is two-valued: a comparison with a missing value (NULL: a radius of an empty disk, a split never
 * reached, a checkpoint after the run ended) is false, and `not` of it is true. (SQL alone would make both
 * unknown, and `not (r50_au@1myr > 10)` would silently drop every empty disk.)
 */
import { DisksweepError } from '../../shared/errors.js';
import type { SqlValue } from '../store/bulk-insert.js';
import { ident } from '../store/registry-columns.js';
import { filterError } from './filter-error.js';
import { BARE_NAMES, CHECKPOINT_NAMES, nearestName, type FilterName } from './names.js';
import type { CompareOp, Expr } from './parser.js';

/** SQL function evaluating the solar-like split from a stored series (series-split.ts registers it). */
export const SPLIT_FUNCTION = 'disksweep_split_myr';

/** Most distinct checkpoint times one query may join (each is one more index look-up per point). */
export const MAX_CHECKPOINT_JOINS = 8;
/** Relative tolerance for matching a checkpoint time (stored times went through a Myr -> s -> Myr round trip). */
const CHECKPOINT_TIME_TOLERANCE = 1e-9;

export interface SqlFragment {
  readonly sql: string;
  readonly binds: readonly SqlValue[];
}

/** What the database and the sweep hold: the columns each table really has, the checkpoint times recorded. */
export interface CompileContext {
  readonly pointColumns: ReadonlySet<string>;
  readonly resultColumns: ReadonlySet<string>;
  readonly checkpointColumns: ReadonlySet<string>;
  /** Checkpoint times of the sweep, Myr, ascending. */
  readonly checkpointTimes: readonly number[];
  /**
   * The solar-like split thresholds every point of the sweep ran with, or null when the sweep varies them
   * (then each point's own are compared, in SQL).
   */
  readonly splitThresholds: { readonly fMass: number; readonly fJ: number } | null;
}

/** How errors about one input are reported: with a caret into its text, or as a message about a target. */
export interface ErrorSite {
  readonly text: string;
  /** `--where`, or `--target accretion-window(...)`. */
  readonly source: string;
  /** True for typed filters (point at the column); false for conditions a target built. */
  readonly caret: boolean;
}

type Typed = { readonly sql: string; readonly binds: SqlValue[]; readonly type: 'number' | 'text' | 'bool'; readonly name?: FilterName };

const SQL_COMPARE: Readonly<Record<CompareOp, string>> = { '<': '<', '<=': '<=', '>': '>', '>=': '>=', '=': '=', '!=': '<>' };

/**
 * Compiles conditions for one statement. Checkpoint joins are shared by every condition compiled with the same
 * assembler, so a target and a filter that both read `@1myr` use one join.
 */
export class SqlAssembler {
  private readonly joins = new Map<number, string>();
  private pointsRead = false;

  constructor(private readonly ctx: CompileContext) {}

  /** A boolean condition as an SQL expression that is 0 or 1 (never NULL). */
  condition(expr: Expr, site: ErrorSite): SqlFragment {
    const t = this.expr(expr, site);
    if (t.type !== 'bool') {
      this.fail(site, expr.column, `this is a ${t.type === 'text' ? 'text value' : 'number'}, not a condition: compare it (e.g. ${t.name?.name ?? 'x'} > 0)`);
    }
    return { sql: t.sql, binds: t.binds };
  }

  /** True once a compiled condition reads a column of points (`p`): the statement must join it. */
  get readsPoints(): boolean {
    return this.pointsRead;
  }

  /** `LEFT JOIN checkpoint_rows cK ...` for every checkpoint time the compiled conditions read. */
  joinClause(): SqlFragment {
    const parts: string[] = [];
    const binds: SqlValue[] = [];
    for (const [t, alias] of this.joins) {
      parts.push(`LEFT JOIN checkpoint_rows ${alias} ON ${alias}.point_key = r.point_key AND ${alias}.t_myr BETWEEN ? AND ?`);
      const tol = Math.max(Math.abs(t) * CHECKPOINT_TIME_TOLERANCE, 1e-12);
      binds.push(t - tol, t + tol);
    }
    return { sql: parts.join(' '), binds };
  }

  private fail(site: ErrorSite, column: number, message: string): never {
    if (site.caret) throw filterError(site.text, column, message, site.source);
    throw new DisksweepError('input/invalid-target', `${site.source}: ${message}`);
  }

  private expr(e: Expr, site: ErrorSite): Typed {
    switch (e.kind) {
      case 'number':
        return { sql: '?', binds: [e.value], type: 'number' };
      case 'string':
        return { sql: '?', binds: [e.value], type: 'text' };
      case 'bool':
        return { sql: e.value ? '1' : '0', binds: [], type: 'bool' };
      case 'ref':
        return this.ref(e, site);
      case 'neg': {
        const x = this.numeric(e.operand, site, 'minus');
        return { sql: `(- ${x.sql})`, binds: x.binds, type: 'number' };
      }
      case 'arith': {
        const a = this.numeric(e.left, site, e.op);
        const b = this.numeric(e.right, site, e.op);
        // `* 1.0` keeps SQLite from integer division should both sides ever be integers.
        const sql = e.op === '/' ? `((${a.sql}) * 1.0 / ${b.sql})` : `(${a.sql} ${e.op} ${b.sql})`;
        return { sql, binds: [...a.binds, ...b.binds], type: 'number' };
      }
      case 'compare':
        return this.compare(e, site);
      case 'and':
      case 'or': {
        const a = this.boolean(e.left, site, e.kind);
        const b = this.boolean(e.right, site, e.kind);
        return { sql: `(${a.sql} ${e.kind.toUpperCase()} ${b.sql})`, binds: [...a.binds, ...b.binds], type: 'bool' };
      }
      case 'not': {
        const a = this.boolean(e.operand, site, 'not');
        return { sql: `(NOT ${a.sql})`, binds: a.binds, type: 'bool' };
      }
      case 'split-time':
        return this.splitTime(e.fMass, e.fJ, site);
    }
  }

  private numeric(e: Expr, site: ErrorSite, what: string): Typed {
    const t = this.expr(e, site);
    if (t.type !== 'number') this.fail(site, e.column, `${what} needs numbers on both sides; this is ${t.type === 'bool' ? 'a condition' : 'a text value'}`);
    return t;
  }

  private boolean(e: Expr, site: ErrorSite, what: string): Typed {
    const t = this.expr(e, site);
    if (t.type !== 'bool') {
      this.fail(site, e.column, `${what} joins conditions; this is a ${t.type === 'text' ? 'text value' : 'number'} (compare it, e.g. ${t.name?.name ?? 'x'} > 0)`);
    }
    return t;
  }

  private ref(e: Extract<Expr, { kind: 'ref' }>, site: ErrorSite): Typed {
    const ctx = this.ctx;
    const bare = BARE_NAMES.get(e.name);
    const atCheckpoint = CHECKPOINT_NAMES.get(e.name);
    if (bare === undefined && atCheckpoint === undefined) {
      this.fail(site, e.column, `unknown name "${e.name}"${nearestName(e.name)}; \`disksweep query --help\` lists every name`);
    }
    let n: FilterName;
    let column: string;
    if (e.atMyr !== null) {
      if (atCheckpoint === undefined) {
        this.fail(site, e.column, `${e.name} is ${bare?.source === 'parameter' ? 'a parameter' : 'recorded once per run'}: it takes no @<t>myr`);
      }
      n = atCheckpoint;
      this.requireColumn(ctx.checkpointColumns, n, site);
      column = `${this.checkpointAlias(e.atMyr, e.column, site)}.${ident(n.name)}`;
    } else {
      if (bare === undefined) {
        this.fail(site, e.column, `${e.name} is recorded at checkpoints: write ${e.name}@<t>myr, with t one of ${ctx.checkpointTimes.join(', ')}`);
      }
      n = bare;
      this.requireColumn(n.source === 'parameter' ? ctx.pointColumns : ctx.resultColumns, n, site);
      column = `${n.source === 'parameter' ? 'p' : 'r'}.${ident(n.name)}`;
      if (n.source === 'parameter') this.pointsRead = true;
    }
    if (n.type === 'flag') return { sql: `COALESCE(${column} = 1, 0)`, binds: [], type: 'bool', name: n };
    return { sql: column, binds: [], type: n.type === 'text' ? 'text' : 'number', name: n };
  }

  private requireColumn(have: ReadonlySet<string>, n: FilterName, site: ErrorSite): void {
    if (!have.has(n.name)) {
      throw new DisksweepError('input/no-data', `${site.source}: this database has no ${n.name} (it was written before that ${n.source === 'parameter' ? 'parameter' : 'output'} existed)`);
    }
  }

  private checkpointAlias(t: number, column: number, site: ErrorSite): string {
    const times = this.ctx.checkpointTimes;
    const known = times.find((c) => Math.abs(c - t) <= Math.max(Math.abs(t) * CHECKPOINT_TIME_TOLERANCE, 1e-12));
    if (known === undefined) {
      const nearest = times.reduce((best, c) => (Math.abs(c - t) < Math.abs(best - t) ? c : best), times[0] ?? Number.NaN);
      this.fail(site, column, `this sweep records no checkpoint at ${t} Myr; it records ${times.join(', ')} Myr${Number.isNaN(nearest) ? '' : ` (nearest: ${nearest})`}`);
    }
    const hit = this.joins.get(known);
    if (hit !== undefined) return hit;
    if (this.joins.size >= MAX_CHECKPOINT_JOINS) this.fail(site, column, `at most ${MAX_CHECKPOINT_JOINS} different checkpoint times in one query`);
    const alias = `c${this.joins.size}`;
    this.joins.set(known, alias);
    return alias;
  }

  private compare(e: Extract<Expr, { kind: 'compare' }>, site: ErrorSite): Typed {
    const operands = e.operands.map((o) => this.expr(o, site));
    const parts: string[] = [];
    const binds: SqlValue[] = [];
    e.ops.forEach((op, i) => {
      const [a, b] = [operands[i], operands[i + 1]];
      this.checkComparable(op, a, b, e.operands[i], e.operands[i + 1], site);
      parts.push(`${a.sql} ${SQL_COMPARE[op]} ${b.sql}`);
      binds.push(...a.binds, ...b.binds);
    });
    // The middle operand of a range appears twice: its binds (none for a column) are pushed twice, in order.
    return { sql: `COALESCE(${parts.join(' AND ')}, 0)`, binds, type: 'bool' };
  }

  private checkComparable(op: CompareOp, a: Typed, b: Typed, ea: Expr, eb: Expr, site: ErrorSite): void {
    if (a.type !== b.type) {
      this.fail(site, eb.column, `cannot compare ${typeWord(a)} with ${typeWord(b)}`);
    }
    if (a.type === 'number') return;
    if (op !== '=' && op !== '!=') this.fail(site, eb.column, `${typeWord(a)} can only be compared with = or !=`);
    if (a.type === 'text') {
      const named = a.name ?? b.name;
      const literal = ea.kind === 'string' ? ea : eb.kind === 'string' ? eb : undefined;
      if (named?.choices != null && literal !== undefined && !named.choices.includes(literal.value)) {
        this.fail(site, literal.column, `${named.name} is one of ${named.choices.map((c) => `'${c}'`).join(', ')} (got '${literal.value}')`);
      }
    }
  }

  private splitTime(fMass: number, fJ: number, site: ErrorSite): Typed {
    const need: [ReadonlySet<string>, string][] = [
      [this.ctx.pointColumns, 'f_mass_star'], [this.ctx.pointColumns, 'f_j_disk_max'],
      [this.ctx.resultColumns, 't_solar_split_myr'], [this.ctx.resultColumns, 't_infall_end_myr'],
    ];
    for (const [have, name] of need) {
      const n = BARE_NAMES.get(name);
      if (n !== undefined) this.requireColumn(have, n, site);
    }
    const recorded = `r.${ident('t_solar_split_myr')}`;
    const fromSeries =
      `(SELECT ${SPLIT_FUNCTION}(s.columns, s.n_samples, s.data, ?, ?, r.${ident('t_infall_end_myr')}) FROM series_rows s WHERE s.point_key = r.point_key)`;
    const same = this.ctx.splitThresholds;
    if (same !== null) {
      // One pair of thresholds for the whole sweep: the recorded time, or the series for every point.
      return same.fMass === fMass && same.fJ === fJ
        ? { sql: recorded, binds: [], type: 'number' }
        : { sql: fromSeries, binds: [fMass, fJ], type: 'number' };
    }
    // Points run with these thresholds recorded their split time; the others are re-evaluated from the series
    // (the sub-select runs only for them: CASE evaluates its branches lazily).
    this.pointsRead = true;
    const sql = `(CASE WHEN p.${ident('f_mass_star')} = ? AND p.${ident('f_j_disk_max')} = ? THEN ${recorded} ELSE ${fromSeries} END)`;
    return { sql, binds: [fMass, fJ, fMass, fJ], type: 'number' };
  }
}

function typeWord(t: Typed): string {
  const what = t.type === 'bool' ? 'a condition' : t.type === 'text' ? 'a text value' : 'a number';
  return t.name === undefined ? what : `${t.name.name} (${what})`;
}
