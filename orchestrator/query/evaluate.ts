/**
 * THE entry point of the query layer: which points of a sweep pass a set of targets, with their varied
 * parameter values, as columns of typed arrays (10^6 points are a few tens of MB, not 10^6 objects).
 *
 * ```ts
 * const store = openStore('corvid-rift-cores.sqlite', { mode: 'read' });
 * const ev = evaluateTargets(store, { targets: [parseTarget('solar-split')], where: 'alpha_active > 1e-3' });
 * ev.parameters[0].name;          // 'm_core_msun', with its scale ('log'), range, unit
 * ev.values[0][i], ev.pass[i];    // point i of the selection: its m_core_msun, and 1 if it passes
 * ev.counts.passed / ev.counts.selected;
 * store.close();
 * ```
 *
 * One SQL statement does the work: results (ok only) joined with points and the checkpoints the conditions
 * read, filtered by the compiled --where, with the compiled targets as the pass flag; a custom aggregate
 * writes each row straight into the typed arrays (no row objects; about 0.6 µs of CPU per point, see the
 * `query` section of `npm run bench`).
 */
import type Database from 'better-sqlite3';
import { DisksweepError } from '../../shared/errors.js';
import type { SqlValue } from '../store/bulk-insert.js';
import { latestSweepNote, pickSweep } from '../store/pick-sweep.js';
import { SweepKeys, sweepKeyRange } from '../store/point-keys.js';
import { ident, tableColumns } from '../store/registry-columns.js';
import type { StoreReader } from '../store/sweep-store.js';
import type { SweepRecord } from '../store/store-types.js';
import { SqlAssembler, type CompileContext, type SqlFragment } from './compile-sql.js';
import { parseFilter } from './parser.js';
import { registerSplitFunction } from './series-split.js';
import { sweepSpace, type SweepSpace, type VariedParameter } from './sweep-space.js';
import type { TargetInvocation } from './targets.js';

export type { VariedParameter, ParameterScale } from './sweep-space.js';

export interface EvaluateRequest {
  /**
   * Which sweep: an id prefix or the exact name. Default: the only sweep of the database, or the most
   * recently registered one when it holds several (a note says so).
   */
  readonly sweep?: string;
  /** Targets that must all hold (`and`); none: every selected point passes. From `parseTarget`. */
  readonly targets: readonly TargetInvocation[];
  /** A filter in the query grammar (parser.ts): only points it accepts are selected. */
  readonly where?: string;
  /** Also collect each selected point's 32-hex point id (default false: ids cost memory at 10^6 points). */
  readonly withPointIds?: boolean;
}

/** Which points of a sweep pass, as columns: entry i of every array describes the same selected point. */
export interface Evaluation {
  readonly sweep: SweepRecord;
  /** The varied parameters, in spec order (their scale, range and unit). */
  readonly parameters: readonly VariedParameter[];
  /** The sweep's checkpoint times and fixed values (what names and targets resolved against). */
  readonly space: SweepSpace;
  readonly targets: readonly TargetInvocation[];
  readonly where: string | null;
  readonly counts: {
    /** Points the sweep expands to. */
    readonly points: number;
    /** Points with an ok result. */
    readonly ok: number;
    /** Points with an ok result that --where accepts: the length of every array below. */
    readonly selected: number;
    /** Selected points that pass every target. */
    readonly passed: number;
  };
  /** Index of each selected point in the sweep's expansion order, ascending. */
  readonly pointIndex: Uint32Array;
  /**
   * One array per varied parameter (same order as `parameters`): the value of each selected point, or, for a
   * choice parameter, the index of its value in `parameters[k].values`.
   */
  readonly values: readonly Float64Array[];
  /** 1 where the point passes every target, else 0. */
  readonly pass: Uint8Array;
  /** Point ids (only with `withPointIds`), else null. */
  readonly pointIds: readonly string[] | null;
  /** Things a reader should know: which sweep was taken, re-evaluation from series, runs shorter than t_max. */
  readonly notes: readonly string[];
}

const COLLECT = 'disksweep_query_collect';

/** Where the aggregate writes; set for the duration of one statement (better-sqlite3 is synchronous). */
interface Sink {
  n: number;
  index: Uint32Array;
  pass: Uint8Array;
  values: Float64Array[];
  /** Per parameter: choice value -> index (null for numbers). */
  choices: (Map<string, number> | null)[];
  ids: string[] | null;
}
let sink: Sink | null = null;
const registered = new WeakSet<Database.Database>();

function registerCollector(db: Database.Database): void {
  if (registered.has(db)) return;
  db.aggregate(COLLECT, {
    start: 0,
    varargs: true,
    step: (count: number, ...args: unknown[]) => {
      const s = sink;
      if (s === null) return count;
      const k = s.n++;
      s.index[k] = Number(args[0]);
      s.pass[k] = args[1] === 1 ? 1 : 0;
      const d = s.values.length;
      for (let j = 0; j < d; j++) {
        const v = args[2 + j];
        const map = s.choices[j];
        s.values[j][k] = map === null ? (typeof v === 'number' ? v : Number.NaN) : (map.get(String(v)) ?? Number.NaN);
      }
      if (s.ids !== null) s.ids.push(String(args[2 + d]));
      return count + 1;
    },
  });
  registered.add(db);
}

function compileContext(db: Database.Database, space: SweepSpace): CompileContext {
  const names = (t: 'points' | 'results' | 'checkpoint_rows') => new Set(tableColumns(db, t).keys());
  return {
    pointColumns: names('points'), resultColumns: names('results'), checkpointColumns: names('checkpoint_rows'),
    checkpointTimes: space.checkpointTimes, splitThresholds: space.splitThresholds,
  };
}

function solarSplitNotes(targets: readonly TargetInvocation[], space: SweepSpace): string[] {
  const notes: string[] = [];
  for (const t of targets) {
    if (t.descriptor.name !== 'solar-split') continue;
    const same = space.splitThresholds;
    if (same === null || same.fMass !== t.args.f_m || same.fJ !== t.args.f_j) {
      const samples = Number(space.fixedValue('n_series'));
      const dt = Number.isFinite(samples) && samples > 1 ? ` (samples every ${(space.tEndMyr.max / (samples - 1)).toPrecision(2)} Myr or less)` : '';
      notes.push(`${t.text}: thresholds differ from those ${same === null ? 'some of ' : ''}the models ran with, so the first passage is re-evaluated from the stored time series${dt}`);
    }
    const tMax = t.args.t_max_myr;
    if (typeof tMax === 'number' && tMax > space.tEndMyr.min) {
      notes.push(`${t.text}: some runs end at ${space.tEndMyr.min} Myr, before t_max_myr = ${tMax}; a run that had not reached the split by its end fails`);
    }
  }
  return notes;
}

/** The compiled parts of one query: pass flag, filter, joins, whether points must be joined. */
interface Compiled {
  readonly pass: SqlFragment;
  readonly where: SqlFragment | null;
  readonly joins: SqlFragment;
  readonly readsPoints: boolean;
}

function compile(db: Database.Database, space: SweepSpace, request: Pick<EvaluateRequest, 'targets' | 'where'>): Compiled {
  const asm = new SqlAssembler(compileContext(db, space));
  const conditions: SqlFragment[] = request.targets.map((t) =>
    asm.condition(t.descriptor.build(t.args), { text: t.text, source: `--target ${t.text}`, caret: false }),
  );
  const pass: SqlFragment = conditions.length === 0
    ? { sql: '1', binds: [] }
    : { sql: conditions.map((c) => c.sql).join(' AND '), binds: conditions.flatMap((c) => c.binds) };
  const where = request.where === undefined ? null : asm.condition(parseFilter(request.where), { text: request.where, source: '--where', caret: true });
  return { pass, where, joins: asm.joinClause(), readsPoints: asm.readsPoints };
}

/** `SELECT <what> FROM results r [JOIN points p] <joins> WHERE <this sweep, ok> [AND <where>]`, with its binds. */
function statement(c: Compiled, sweepKey: number, what: SqlFragment, joinPoints: boolean): { sql: string; binds: readonly SqlValue[] } {
  const { from, to } = sweepKeyRange(sweepKey);
  const sql =
    `SELECT ${what.sql} FROM results r ${joinPoints ? 'JOIN points p ON p.point_key = r.point_key ' : ''}${c.joins.sql} ` +
    `WHERE r.point_key >= ? AND r.point_key < ? AND r.status = ?${c.where === null ? '' : ` AND ${c.where.sql}`}`;
  return { sql, binds: [...what.binds, ...c.joins.binds, from, to, 'ok', ...(c.where?.binds ?? [])] };
}

/** The sweep a request means, its space, its key and the notes about both. */
function resolve(store: StoreReader, request: Pick<EvaluateRequest, 'sweep' | 'targets'>): { sweep: SweepRecord; space: SweepSpace; sweepKey: number; notes: string[] } {
  const sweep = pickSweep(store, request.sweep, 'latest');
  const notes: string[] = [];
  const latest = latestSweepNote(store, request.sweep, sweep);
  if (latest !== null) notes.push(latest);
  const space = sweepSpace(sweep);
  notes.push(...solarSplitNotes(request.targets, space));
  const { sweepKey } = new SweepKeys(store.connection).require(sweep.sweepId);
  registerSplitFunction(store.connection);
  return { sweep, space, sweepKey, notes };
}

function run<T>(db: Database.Database, sql: string, binds: readonly SqlValue[], get: (st: Database.Statement) => T): T {
  try {
    return get(db.prepare(sql));
  } catch (error) {
    throw new DisksweepError('internal/unexpected', `the query statement failed: ${error instanceof Error ? error.message : String(error)}`, { cause: error });
  }
}

/** Just the counts of a request (no per-point columns): one scan of the results, joining points only if asked. */
export interface TargetCounts {
  readonly sweep: SweepRecord;
  readonly counts: Evaluation['counts'];
  readonly notes: readonly string[];
}

/**
 * How many points of a sweep pass the targets, without collecting them: the quick answer (pass count and
 * fraction). Reads the points table only when a condition needs a parameter. Same errors as evaluateTargets.
 */
export function countTargets(store: StoreReader, request: Omit<EvaluateRequest, 'withPointIds'>): TargetCounts {
  const db = store.connection;
  const { sweep, space, sweepKey, notes } = resolve(store, request);
  const c = compile(db, space, request);
  const q = statement(c, sweepKey, { sql: `count(*), total(${c.pass.sql})`, binds: c.pass.binds }, c.readsPoints);
  const [selected, passed] = run(db, q.sql, q.binds, (st) => st.raw(true).get(...q.binds) as [number, number]);
  return { sweep, counts: { points: sweep.nPoints, ok: okCount(store, sweep, request, selected), selected, passed }, notes };
}

/**
 * Points with an ok result: without --where every ok point is selected; with one, the ok rows are counted apart
 * (a scan of the small status index, not of the result rows).
 */
function okCount(store: StoreReader, sweep: SweepRecord, request: { where?: string }, selected: number): number {
  return request.where === undefined ? selected : Math.max(selected, store.statusCounts(sweep.sweepId).byStatus.ok ?? 0);
}

/**
 * Evaluate targets (and an optional --where filter) on every point of one sweep that has an ok result.
 * Errors: `input/invalid-filter`, `input/invalid-target`, `input/no-data` (an output this database or this
 * disksweep does not record), `input/invalid-flag` (an unknown --sweep) — all exit 2.
 * @param store an open store (read mode is enough; it may be written by a running sweep meanwhile)
 */
export function evaluateTargets(store: StoreReader, request: EvaluateRequest): Evaluation {
  const db = store.connection;
  const { sweep, space, sweepKey, notes } = resolve(store, request);
  const c = compile(db, space, request);
  const args = ['p.point_index', `(${c.pass.sql})`, ...space.parameters.map((p) => `p.${ident(p.name)}`), ...(request.withPointIds === true ? ['r.point_id'] : [])];
  const q = statement(c, sweepKey, { sql: `${COLLECT}(${args.join(', ')})`, binds: c.pass.binds }, true);
  registerCollector(db);
  // Sized for every point of the sweep; rows that arrive while we read (a running sweep) stay within it.
  const s: Sink = {
    n: 0,
    index: new Uint32Array(sweep.nPoints),
    pass: new Uint8Array(sweep.nPoints),
    values: space.parameters.map(() => new Float64Array(sweep.nPoints)),
    choices: space.parameters.map((p) => (p.kind === 'choice' ? new Map((p.values ?? []).map((v, i) => [String(v), i])) : null)),
    ids: request.withPointIds === true ? [] : null,
  };
  sink = s;
  try {
    run(db, q.sql, q.binds, (st) => st.pluck().get(...q.binds));
  } finally {
    sink = null;
  }
  const n = s.n;
  let passed = 0;
  for (let i = 0; i < n; i++) passed += s.pass[i];
  return {
    sweep,
    parameters: space.parameters,
    space,
    targets: request.targets,
    where: request.where ?? null,
    counts: { points: sweep.nPoints, ok: okCount(store, sweep, request, n), selected: n, passed },
    pointIndex: s.index.subarray(0, n),
    values: s.values.map((v) => v.subarray(0, n)),
    pass: s.pass.subarray(0, n),
    pointIds: s.ids,
    notes,
  };
}
