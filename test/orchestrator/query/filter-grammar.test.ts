/**
 * The filter grammar: a table of valid expressions with the SQL shape they compile to (every typed value a
 * bound parameter), a table of invalid ones with the column the error points at, and injection attempts that
 * must be refused or treated as data on a writable connection whose tables must survive.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DisksweepError } from '../../../shared/errors.js';
import { SqlAssembler, type CompileContext } from '../../../orchestrator/query/compile-sql.js';
import { evaluateTargets } from '../../../orchestrator/query/index.js';
import { MAX_FILTER_CHARS, MAX_FILTER_DEPTH, parseFilter } from '../../../orchestrator/query/parser.js';
import { CHECKPOINT_COLUMNS, PARAM_COLUMNS, SCALAR_COLUMNS } from '../../../orchestrator/store/registry-columns.js';
import { openStore, type SweepStore } from '../../../orchestrator/store/index.js';
import { buildQueryDb, splitGridSpec } from '../../support/query-db.js';
import { openReadOnly } from '../../support/sweep-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

const ctx: CompileContext = {
  pointColumns: new Set(PARAM_COLUMNS.map((c) => c.name)),
  resultColumns: new Set(SCALAR_COLUMNS.map((c) => c.name)),
  checkpointColumns: new Set(CHECKPOINT_COLUMNS.map((c) => c.name)),
  checkpointTimes: [0.1, 0.5, 1, 3],
  splitThresholds: null,
};

function compile(text: string) {
  const asm = new SqlAssembler(ctx);
  const cond = asm.condition(parseFilter(text), { text, source: '--where', caret: true });
  return { ...cond, joins: asm.joinClause() };
}

function errorOf(text: string): DisksweepError {
  try {
    compile(text);
  } catch (e) {
    if (e instanceof DisksweepError) return e;
    throw e;
  }
  throw new Error(`"${text}" was accepted`);
}

describe('valid filters', () => {
  const valid: [string, readonly unknown[], RegExp][] = [
    ['alpha_active > 1e-3', [1e-3], /^COALESCE\(p\."alpha_active" > \?, 0\)$/],
    ['1e-3 <= alpha_active < 1e-2', [1e-3, 1e-2], /p\."alpha_active" AND p\."alpha_active" < \?/],
    ['0.5 > m_core_msun >= .25', [0.5, 0.25], /\? > p\."m_core_msun" AND p\."m_core_msun" >= \?/],
    ['ALPHA_ACTIVE >= 2.5E+7 or not (t_end_myr = 3)', [2.5e7, 3], /OR \(NOT COALESCE\(p\."t_end_myr" = \?, 0\)\)/],
    ['m_star_msun@1myr > 0.8 and mdot_star_msun_yr@0.5myr < 1e-7', [0.8, 1e-7], /c0\."m_star_msun" > \?.*c1\."mdot_star_msun_yr" < \?/],
    ['m_disk_msun@1myr / m_star_msun@1myr < 0.1', [0.1], /\(\(c0\."m_disk_msun"\) \* 1\.0 \/ c0\."m_star_msun"\) < \?/],
    ['-r50_au@3myr + 2 * 3 < -1', [2, 3, -1], /\(\(- c0\."r50_au"\) \+ \(\? \* \?\)\) < \?/],
    ["active_layer = 'ionization'", ['ionization'], /p\."active_layer" = \?/],
    ['active_layer != "uniform"', ['uniform'], /p\."active_layer" <> \?/],
    ['flag_massive_disk', [], /^COALESCE\(r\."flag_massive_disk" = 1, 0\)$/],
    ['not flag_fragmentation and t_solar_split_myr <= 3', [3], /NOT COALESCE\(r\."flag_fragmentation" = 1, 0\)/],
    ['flag_massive_disk = false', [], /= 0/],
    ['((((alpha_active < 1))))', [1], /p\."alpha_active" < \?/],
    ['m_disk_msun < 0.02', [0.02], /p\."m_disk_msun"/], // bare: the parameter (initial disk mass)
  ];
  it.each(valid)('%s', (text, binds, shape) => {
    const c = compile(text);
    expect(c.sql).toMatch(shape);
    expect(c.binds).toEqual(binds);
    // Nothing typed appears in the SQL text: numbers and strings are all placeholders.
    for (const b of binds) if (typeof b === 'string') expect(c.sql).not.toContain(b);
  });

  it('one join per checkpoint time, shared by every reference to it', () => {
    const c = compile('m_star_msun@1myr > 0.5 and m_disk_msun@1myr < 0.1 and q_min@3myr > 1');
    expect(c.joins.sql.match(/LEFT JOIN checkpoint_rows/g)).toHaveLength(2);
    expect(c.joins.binds).toHaveLength(4);
  });
});

describe('invalid filters', () => {
  const invalid: [string, number, RegExp][] = [
    ['alpha_activ > 1e-3', 1, /unknown name "alpha_activ" \(did you mean alpha_active\?\)/],
    ['alpha_active > 1e-', 17, /exponent needs digits/],
    ['alpha_active >', 15, /ends too early/],
    ['alpha_active > 1 and', 21, /ends too early/],
    ['(alpha_active > 1', 18, /expected \) to close the \( at column 1/],
    ['alpha_active > 1)', 17, /has no matching \(/],
    ['alpha_active > 1 alpha_active', 18, /cannot be followed by a name/],
    ['alpha_active > 1 (t_end_myr > 1)', 18, /expected and, or, or the end/],
    ['1 < alpha_active < 2 < 3', 22, /at most two comparisons/],
    ['1 < alpha_active > 0', 5, /same direction/],
    ['mdot_star_msun_yr > 1', 1, /recorded at checkpoints: write mdot_star_msun_yr@<t>myr, with t one of 0.1, 0.5, 1, 3/],
    ['m_star_msun@2myr > 1', 1, /no checkpoint at 2 Myr; it records 0\.1, 0\.5, 1, 3 Myr \(nearest: 1\)/],
    ['m_star_msun@1 > 1', 15, /needs its unit: m_star_msun@1myr/],
    ['alpha_active@1myr > 1', 1, /is a parameter: it takes no @<t>myr/],
    ['t_solar_split_myr@1myr > 1', 1, /recorded once per run/],
    ["active_layer = 'ionisation'", 16, /one of 'uniform', .*got 'ionisation'/],
    ["active_layer < 'uniform'", 16, /only be compared with = or !=/],
    ["alpha_active = 'x'", 16, /cannot compare alpha_active \(a number\) with a text value/],
    ['alpha_active', 1, /not a condition/],
    ['alpha_active and 1 < 2', 1, /and joins conditions/],
    ['flag_massive_disk + 1 > 0', 1, /needs numbers/],
    ['alpha_active > 1 # comment', 18, /unexpected character "#"/],
    ['2alpha > 1', 2, /cannot be followed by a name/],
    ['"never closed', 1, /never closed/],
    ['', 1, /empty/],
    ['checkpoints_myr > 1', 1, /unknown name/], // a list parameter is not comparable
  ];
  it.each(invalid)('%s', (text, column, message) => {
    const e = errorOf(text);
    expect(e.code).toBe('input/invalid-filter');
    expect(e.message).toMatch(new RegExp(`^--where: column ${column}: `));
    expect(e.message).toMatch(message);
    // The caret line points at the column.
    expect(e.details[1].indexOf('^')).toBe(column - 1);
  });

  it('limits length and nesting depth', () => {
    expect(errorOf('alpha_active > 1 or '.repeat(120) + 'alpha_active > 1').message).toMatch(`longer than ${MAX_FILTER_CHARS} characters`);
    const deep = '('.repeat(MAX_FILTER_DEPTH + 1) + 'alpha_active > 1' + ')'.repeat(MAX_FILTER_DEPTH + 1);
    expect(errorOf(deep).message).toMatch(`nested more than ${MAX_FILTER_DEPTH} deep`);
    expect(errorOf('not '.repeat(MAX_FILTER_DEPTH + 1) + 'flag_massive_disk').message).toMatch(/nested/);
    expect(errorOf('-'.repeat(MAX_FILTER_DEPTH + 1) + '1 < alpha_active').message).toMatch(/nested/);
    const ok = '('.repeat(MAX_FILTER_DEPTH - 1) + 'alpha_active > 1' + ')'.repeat(MAX_FILTER_DEPTH - 1);
    expect(compile(ok).binds).toEqual([1]);
  });

  it('at most 8 checkpoint joins', () => {
    const wide: CompileContext = { ...ctx, checkpointTimes: [1, 2, 3, 4, 5, 6, 7, 8, 9] };
    const text = wide.checkpointTimes.map((t) => `m_star_msun@${t}myr > 0`).join(' and ');
    const asm = new SqlAssembler(wide);
    expect(() => asm.condition(parseFilter(text), { text, source: '--where', caret: true })).toThrow(/at most 8 different checkpoint times/);
  });
});

describe('injection attempts on a writable connection', () => {
  let dir = '';
  let store: SweepStore;
  let path = '';
  beforeAll(() => {
    dir = makeTempDir('disksweep-inject-');
    path = buildQueryDb(dir, { ...splitGridSpec(), vary: { alpha_active: { log: [3e-3, 0.1], count: 2 } } }).path;
    store = openStore(path, { mode: 'write' });
  }, 120_000);
  afterAll(() => {
    store?.close();
    removeTempDir(dir);
  });

  const attempts = [
    "alpha_active > 0; DROP TABLE results",
    "alpha_active > 0 -- ' or 1=1",
    "active_layer = 'uniform'; DROP TABLE points; --'",
    "active_layer = 'x' or 1=1 --'",
    "alpha_active > 0) OR (1=1",
    'alpha_active > 0 union select * from sweeps',
    "results.status = 'ok'",
    'drop table results',
    "alpha_active > 0 and sqlite_master",
    "active_layer = \"'); DROP TABLE results; --\"",
    "active_layer = 'uniform'' OR ''1''=''1'",
  ];
  it.each(attempts)('%s', (text) => {
    let outcome: string;
    try {
      const ev = evaluateTargets(store, { targets: [], where: text });
      // Accepted only as data: a quoted string compared with a choice, which matches nothing.
      outcome = `selected ${ev.counts.selected}`;
      expect(ev.counts.selected).toBe(0);
    } catch (e) {
      expect(e).toBeInstanceOf(DisksweepError);
      expect((e as DisksweepError).code).toBe('input/invalid-filter');
      outcome = 'refused';
    }
    expect(outcome).toMatch(/refused|selected 0/);
    const db = openReadOnly(path);
    try {
      const tables = db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table' ORDER BY name").pluck().all();
      expect(tables).toEqual(expect.arrayContaining(['checkpoint_rows', 'locks', 'points', 'results', 'series_rows', 'sweeps']));
      expect(db.prepare('SELECT count(*) FROM results').pluck().get()).toBe(2);
    } finally {
      db.close();
    }
  });

  it('a string that looks like SQL is compared as data', () => {
    // A valid choice compare whose literal is SQL: refused by the choice check, never run.
    expect(() => evaluateTargets(store, { targets: [], where: "active_layer = 'uniform; DROP TABLE results'" })).toThrow(/one of 'uniform'/);
    // With != the value is a plain bound string: every point differs from it.
    // (The stored points hold the default, 'ionization'.)
    const ev = evaluateTargets(store, { targets: [], where: "active_layer != 'ionization'" });
    expect(ev.counts.selected).toBe(0);
    expect(evaluateTargets(store, { targets: [], where: "active_layer = 'ionization'" }).counts.selected).toBe(2);
    expect(evaluateTargets(store, { targets: [], where: "active_layer = 'uniform'" }).counts.selected).toBe(0);
  });
});
