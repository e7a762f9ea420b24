/**
 * Bad input to the sweep commands, as real processes: malformed specs, bad flags, files that are not (or not
 * yet, or no longer) our databases. Each row exits 2 with a message naming what is wrong, prints nothing on
 * stdout, and leaves the directory as it was: every file byte for byte, and no database created.
 *
 * A few rows open a genuine store read-only to find out what is wrong with the request (which sweep, which
 * model version); SQLite then leaves its -wal/-shm side files next to the database (see the note in the
 * table). The database itself must still be unchanged.
 */
import Database from 'better-sqlite3';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { parseSpecText, MAX_SPEC_BYTES } from '../../orchestrator/spec/load-spec.js';
import { openStore } from '../../orchestrator/store/index.js';
import { planSweep, storedSpecJson } from '../../orchestrator/sweep/sweep-plan.js';
import { contentHash } from '../../shared/hashing.js';
import { runCliAsync } from '../support/cli.js';
import { treeSnapshot } from '../support/file-snapshot.js';
import { gridSpec, writeSpec, type SpecObject } from '../support/sweep-specs.js';
import { makeTempDir, removeTempDir } from '../support/temp-dir.js';

interface BadInput {
  readonly what: string;
  /** Make the files the row needs in `dir` (the command's working directory); returns the arguments. */
  readonly setup: (dir: string) => string[];
  /** Fragments stderr must contain. */
  readonly expect: string[];
  /**
   * A database the command opens read-only (it is a genuine store): SQLite may leave `<db>-wal` (empty) and
   * `<db>-shm` beside it. Any other change fails the row.
   */
  readonly readsStore?: string;
}

const GOOD = gridSpec('heron-good', 2, 2, 2);

/** A spec file from YAML lines (spec rows run without --db: the default database must not appear either). */
const yamlSpec = (dir: string, lines: string[], name = 'spec.yaml'): string => {
  writeFileSync(join(dir, name), lines.join('\n') + '\n');
  return name;
};
const BASE = ['name: heron-bad', 'model: { n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] }', 'fixed: { initial_state: disk }'];
const runSpec = (lines: string[]) => (dir: string) => ['run', yamlSpec(dir, [...BASE, ...lines])];

/** A store with the given sweeps registered (no results), as a write connection leaves it after closing. */
function storeWith(file: string, specs: SpecObject[], modelVersion = MODEL_VERSION): void {
  const store = openStore(file, { mode: 'write' });
  for (const spec of specs) {
    const plan = planSweep(parseSpecText(JSON.stringify(spec), 'fixture', 'json'));
    store.registerSweep({
      sweepId: plan.sweepId, name: plan.spec.name, specJson: storedSpecJson(plan.spec), specHash: contentHash(plan.spec),
      modelVersion, nPoints: plan.source.size, chunkSize: 2,
    });
  }
  store.close();
}

/** One of our stores, stamped with a schema version from the future. */
function newerStore(file: string): void {
  storeWith(file, [GOOD]);
  const db = new Database(file);
  db.pragma('user_version = 99');
  db.close();
}

/** Another program's SQLite database. */
function foreignSqlite(file: string): void {
  const db = new Database(file);
  db.exec("CREATE TABLE observations (star TEXT, flux REAL); INSERT INTO observations VALUES ('TERN-17', 1.5)");
  db.close();
}

const ROWS: BadInput[] = [
  // Specs: wrong types, unknown names, empty and decreasing ranges, plan mismatches.
  { what: 'values given as a string', setup: runSpec(['vary: { alpha_active: { values: "0.01" } }']), expect: ['[input/invalid-spec]', 'vary.alpha_active: expected one of { values: [...] }'] },
  { what: 'an unknown parameter', setup: runSpec(['vary: { alpah_active: { values: [0.01] } }']), expect: ['vary.alpah_active: unknown parameter (did you mean alpha_active?)'] },
  { what: 'a log range reaching 0', setup: runSpec(['vary: { alpha_active: { log: [0.001, 0], count: 3 } }']), expect: ['vary.alpha_active.log[1]: must be > 0 (got 0)'] },
  { what: 'a decreasing range', setup: runSpec(['vary: { m_disk_msun: { linear: [0.1, 0.01], count: 3 } }']), expect: ['vary.m_disk_msun.linear: must be an increasing range [min, max] (got [0.1, 0.01])'] },
  { what: 'an empty values list', setup: runSpec(['vary: { alpha_active: { values: [] } }']), expect: ['vary.alpha_active.values: must list at least one value'] },
  { what: 'a count on a Latin hypercube', setup: runSpec(['vary: { alpha_active: { log: [0.001, 0.1], count: 4 } }', 'sampling: { plan: latin_hypercube, points: 8, seed: 1 }']), expect: ['vary.alpha_active.count: is only for grids; latin_hypercube takes sampling.points'] },
  { what: 'a corner of the box breaking a cross-parameter rule', setup: runSpec(['vary: { alpha_active: { log: [0.00001, 0.1], count: 3 } }']), expect: ['alpha_dead: must not exceed alpha_active = 0.00001', '[at the corner alpha_active=0.00001]'] },
  { what: 'a YAML syntax error', setup: runSpec(['vary: { alpha_active: { values: [0.01 } }']), expect: ['cannot parse YAML:'] },
  { what: 'a custom YAML tag', setup: runSpec(['vary: { alpha_active: { values: [0.01] } }', 'description: !include notes.txt']), expect: ['cannot parse YAML: Unresolved tag: !include'] },
  {
    what: 'an alias bomb',
    setup: (dir) => {
      const rows = ['a: &a [x, x, x, x, x, x, x, x, x]'];
      for (const [prev, next] of [['a', 'b'], ['b', 'c'], ['c', 'd'], ['d', 'e'], ['e', 'f'], ['f', 'g']]) rows.push(`${next}: &${next} [${Array(9).fill(`*${prev}`).join(', ')}]`);
      return ['run', yamlSpec(dir, [...rows, ...BASE, 'vary: { alpha_active: { values: [0.01] } }'])];
    },
    expect: ['cannot parse YAML: Excessive alias count'],
  },
  {
    what: 'a spec file over the size limit',
    setup: (dir) => ['run', yamlSpec(dir, [...BASE, 'vary: { alpha_active: { values: [0.01] } }', `# ${'x'.repeat(MAX_SPEC_BYTES)}`])],
    expect: [`a spec may be at most ${MAX_SPEC_BYTES}`],
  },
  { what: 'a JSON syntax error', setup: (dir) => (writeFileSync(join(dir, 'spec.json'), '{"name": "heron", "vary": {'), ['run', 'spec.json']), expect: ['cannot parse JSON:'] },
  { what: 'a spec file that does not exist', setup: () => ['run', 'absent.yaml'], expect: ['[input/unreadable-file]', 'cannot read spec file absent.yaml (ENOENT)'] },
  { what: 'a path through a file', setup: (dir) => (writeFileSync(join(dir, 'plain.yaml'), 'name: x\n'), ['run', 'plain.yaml/spec.yaml']), expect: ['cannot read spec file plain.yaml/spec.yaml (ENOTDIR)'] },
  { what: 'a directory as spec', setup: (dir) => (mkdirSync(join(dir, 'specs')), ['run', 'specs']), expect: ['cannot read spec file specs (EISDIR)'] },
  { what: 'validate on a bad spec', setup: (dir) => ['validate', yamlSpec(dir, [...BASE, 'vary: { alpha_active: { log: [0.001, 0.1] } }'])], expect: ['vary.alpha_active.count: a grid needs a count for each range'] },

  // Flags.
  { what: '--workers 0', setup: (dir) => ['run', writeSpec(dir, 'good.yaml', GOOD), '--workers', '0'], expect: ['--workers: expected a whole number from 1 to 1024 (got "0")'] },
  { what: '--workers abc', setup: (dir) => ['run', writeSpec(dir, 'good.yaml', GOOD), '--workers', 'abc'], expect: ['--workers: expected a whole number from 1 to 1024 (got "abc")'] },
  { what: 'run without a spec', setup: () => ['run'], expect: ["missing required argument 'spec'"] },
  { what: 'resume without --db', setup: () => ['resume'], expect: ["required option '--db <file>' not specified"] },
  { what: 'an unknown flag', setup: (dir) => ['run', writeSpec(dir, 'good.yaml', GOOD), '--frobnicate'], expect: ["unknown option '--frobnicate'"] },

  // Databases that are not ours, or not usable for the command.
  { what: 'a text file as database', setup: (dir) => (writeFileSync(join(dir, 'notes.txt'), 'TERN field notes, night 3\n'), ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'notes.txt']), expect: ['[input/not-our-database]', 'notes.txt is not a disksweep database: it is a text file'] },
  { what: 'a foreign SQLite file (run)', setup: (dir) => (foreignSqlite(join(dir, 'survey.sqlite')), ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'survey.sqlite']), expect: ['an SQLite database of another program'] },
  { what: 'a directory as database', setup: (dir) => (mkdirSync(join(dir, 'results')), ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'results']), expect: ['results is not a disksweep database: it is a directory'] },
  { what: 'a newer schema (run)', setup: (dir) => (newerStore(join(dir, 'future.sqlite')), ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'future.sqlite']), expect: ['[input/newer-schema]', 'store schema version 99, newer than'] },
  { what: 'a newer schema (status)', setup: (dir) => (newerStore(join(dir, 'future.sqlite')), ['status', '--db', 'future.sqlite']), expect: ['store schema version 99, newer than'] },
  { what: 'a database in a missing directory', setup: (dir) => ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'nowhere/heron.sqlite'], expect: ['directory nowhere does not exist'] },
  { what: 'status on a missing database', setup: () => ['status', '--db', 'typo.sqlite'], expect: ['typo.sqlite does not exist'] },
  { what: 'resume on a missing database', setup: () => ['resume', '--db', 'typo.sqlite'], expect: ['typo.sqlite does not exist'] },
  { what: 'status on an empty file', setup: (dir) => (writeFileSync(join(dir, 'empty.sqlite'), ''), ['status', '--db', 'empty.sqlite']), expect: ['it is an empty file'] },
  { what: 'resume on a database with no sweep', setup: (dir) => (storeWith(join(dir, 'none.sqlite'), []), ['resume', '--db', 'none.sqlite']), expect: ['none.sqlite holds no sweep yet'], readsStore: 'none.sqlite' },
  {
    what: 'resume on several sweeps without --sweep',
    setup: (dir) => (storeWith(join(dir, 'two.sqlite'), [GOOD, gridSpec('heron-other', 3, 2, 2)]), ['resume', '--db', 'two.sqlite']),
    expect: ['two.sqlite holds 2 sweeps: choose one with --sweep', 'heron-good', 'heron-other'],
    readsStore: 'two.sqlite',
  },
  {
    what: 'status on several sweeps without --sweep',
    setup: (dir) => (storeWith(join(dir, 'two.sqlite'), [GOOD, gridSpec('heron-other', 3, 2, 2)]), ['status', '--db', 'two.sqlite']),
    expect: ['holds 2 sweeps: choose one with --sweep'],
    readsStore: 'two.sqlite',
  },
  { what: 'resume --sweep naming no sweep', setup: (dir) => (storeWith(join(dir, 'one.sqlite'), [GOOD]), ['resume', '--db', 'one.sqlite', '--sweep', 'heron-missing']), expect: ['--sweep heron-missing: no such sweep in one.sqlite'], readsStore: 'one.sqlite' },
  {
    what: 'resume of a sweep of another model version',
    setup: (dir) => (storeWith(join(dir, 'old.sqlite'), [GOOD], '0.0.1-old'), ['resume', '--db', 'old.sqlite']),
    expect: ['[input/model-version]', 'model version 0.0.1-old', `this disksweep runs model version ${MODEL_VERSION}`],
    readsStore: 'old.sqlite',
  },
  {
    what: 'run of a spec whose sweep the database holds for another model version',
    setup: (dir) => (storeWith(join(dir, 'old.sqlite'), [GOOD], '0.0.1-old'), ['run', writeSpec(dir, 'good.yaml', GOOD), '--db', 'old.sqlite']),
    expect: ['model version 0.0.1-old', `this disksweep runs model version ${MODEL_VERSION}`],
    readsStore: 'old.sqlite',
  },
];

/** Paths added, removed or changed between two snapshots. */
function changes(before: Record<string, string>, after: Record<string, string>): string[] {
  const paths = new Set([...Object.keys(before), ...Object.keys(after)]);
  return [...paths].filter((p) => before[p] !== after[p]).sort();
}

describe('bad input exits 2, says what is wrong and changes no file', () => {
  it('the table has at least 20 rows', () => {
    expect(ROWS.length).toBeGreaterThanOrEqual(20);
  });

  // Rows are independent (each has its own directory), so they run a few at a time: most of a row is the
  // start-up of a node process.
  it.concurrent.each(ROWS)('$what', async ({ setup, expect: fragments, readsStore }) => {
    const dir = makeTempDir('disksweep-bad-input-');
    try {
      const args = setup(dir);
      const before = treeSnapshot(dir);
      const r = await runCliAsync(args, { cwd: dir, timeoutMs: 60_000 });
      expect(r.status, `stderr:\n${r.stderr}`).toBe(2);
      expect(r.stdout).toBe('');
      for (const f of fragments) expect(r.stderr).toContain(f);
      const changed = changes(before, treeSnapshot(dir));
      if (readsStore === undefined) {
        expect(changed).toEqual([]);
      } else {
        // Only SQLite's side files of a read-only open may appear; the database itself is unchanged.
        expect(changed.filter((p) => p !== `${readsStore}-wal` && p !== `${readsStore}-shm`)).toEqual([]);
      }
    } finally {
      removeTempDir(dir);
    }
  });
});
