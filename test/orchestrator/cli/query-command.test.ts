/**
 * `disksweep query` as a process, on a real small sweep database (test/support/query-db.ts): the pass count
 * agrees with the stored rows, --json carries every part of the answer, bad input exits 2 naming what is
 * wrong, and an injection attempt through the flags leaves every table in place.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { buildQueryDb, splitGridSpec } from '../../support/query-db.js';
import { openReadOnly, queryRows } from '../../support/sweep-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

let dir = '';
let db = '';
let splitBy05 = 0;

beforeAll(() => {
  dir = makeTempDir('disksweep-query-cli-');
  db = buildQueryDb(dir, splitGridSpec()).path;
  const conn = openReadOnly(db);
  splitBy05 = conn.prepare("SELECT count(*) FROM results WHERE status = 'ok' AND t_solar_split_myr <= 0.5").pluck().get() as number;
  conn.close();
}, 120_000);

afterAll(() => removeTempDir(dir));

describe('disksweep query', () => {
  it('answers with the pass count, marginals, PRIM boxes and a constraint summary', () => {
    const r = runCli(['query', db, '--target', 'solar-split(t_max_myr=0.5)']);
    expect(r.status, r.stderr).toBe(0);
    expect(splitBy05).toBeGreaterThan(0);
    expect(r.stdout).toContain(`PASS: ${splitBy05} of 9`);
    expect(r.stdout).toMatch(/m_disk_msun \[M_sun\] \(log, 0\.0100 to 0\.0500\)/);
    expect(r.stdout).toMatch(/\|█+/); // the bar chart
    expect(r.stdout).toContain('PRIM boxes (Friedman & Fisher 1999');
    expect(r.stdout).toContain('Constraint summary (paste into a paper):');
  });

  it('--json holds the whole answer', () => {
    const r = runCli(['query', db, '--target', 'solar-split(t_max_myr=0.5)', '--target', 'disk-fraction(max=0.05)', '--json']);
    expect(r.status, r.stderr).toBe(0);
    const a = JSON.parse(r.stdout) as {
      targets: { target: string }[];
      pass: { pass: number; n: number; low: number; high: number };
      marginals: { parameter: string; binning: string; bins: { n: number }[] }[];
      prim: { boxes: { ranges: { parameter: string }[]; trajectory: unknown[] }[] };
      constraints: { lines: string[] };
      parameters: { name: string; scale: string; log_space: boolean }[];
    };
    expect(a.targets.map((t) => t.target)).toEqual(['solar-split(f_m=0.99,f_j=0.02,t_max_myr=0.5)', 'disk-fraction(at_myr=1,min=0,max=0.05)']);
    expect(a.pass.n).toBe(9);
    expect(a.pass.low).toBeLessThanOrEqual(a.pass.pass / 9);
    expect(a.parameters.map((p) => [p.name, p.scale, p.log_space])).toEqual([['m_disk_msun', 'log', true], ['alpha_active', 'log', true]]);
    // A 3-level grid: one bin per level, every point in one of them.
    expect(a.marginals.map((m) => [m.parameter, m.binning, m.bins.reduce((s, b) => s + b.n, 0)])).toEqual([['m_disk_msun', 'levels', 9], ['alpha_active', 'levels', 9]]);
    expect(a.prim.boxes.length).toBeGreaterThan(0);
    expect(a.prim.boxes[0].ranges.map((x) => x.parameter)).toEqual(['m_disk_msun', 'alpha_active']);
    expect(a.constraints.lines[0]).toMatch(/^Best PRIM box|^No PRIM box/);
  });

  it.each([
    [['--target', 'solar-splt'], 'input/invalid-target', 'did you mean solar-split'],
    [['--target', 'solar-split', '--where', 'alpha_activ > 1'], 'input/invalid-filter', 'did you mean alpha_active'],
    [['--target', 'solar-split', '--where', 'alpha_active > > 1'], 'input/invalid-filter', '--where: column 16'],
    [['--target', 'accretion-window(at_myr=2)'], 'input/invalid-target', 'no checkpoint at 2 Myr'],
    [['--target', 'solar-split', '--where', 'alpha_active > 10'], 'input/no-data', 'selects none of the 9 points'],
    [['--target', 'solar-split', '--sweep', 'nope'], 'input/invalid-flag', '--sweep nope: no such sweep'],
    [['--where', 'alpha_active > 0'], 'input/invalid-flag', 'give at least one --target'],
    [['--target', 'solar-split', '--bins', '1'], 'input/invalid-flag', '--bins'],
    [['--target', 'solar-split', '--alpha', '0.7'], 'input/invalid-flag', '--alpha'],
  ])('%j exits 2', (args, code, fragment) => {
    const r = runCli(['query', db, ...args]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(code);
    expect(r.stderr).toContain(fragment);
  });

  it('lifetime passes the points whose disk dispersed inside the window, counted from the stored rows', () => {
    const lifetimes = queryRows<{ t: number | null }>(db, "SELECT disk_lifetime_myr AS t FROM results WHERE status = 'ok'").map((x) => x.t);
    const ended = lifetimes.filter((t): t is number => t !== null);
    const r = runCli(['query', db, '--target', 'lifetime(min_myr=0,max_myr=100)', '--json']);
    expect(r.status, r.stderr).toBe(0);
    const a = JSON.parse(r.stdout) as { pass: { pass: number; n: number } };
    expect(a.pass.n).toBe(lifetimes.length);
    expect(a.pass.pass).toBe(ended.length);
  });

  it('a missing database exits 2', () => {
    expect(runCli(['query', `${dir}/absent.sqlite`, '--target', 'solar-split']).status).toBe(2);
  });

  it("injection through --where is refused and the tables stay", () => {
    for (const where of ["alpha_active > 0; DROP TABLE results", "active_layer = 'uniform'; DROP TABLE points; --'"]) {
      const r = runCli(['query', db, '--target', 'solar-split', '--where', where]);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain('input/invalid-filter');
    }
    const conn = openReadOnly(db);
    try {
      expect(conn.prepare('SELECT count(*) FROM results').pluck().get()).toBe(9);
      expect(conn.prepare('SELECT count(*) FROM points').pluck().get()).toBe(9);
    } finally {
      conn.close();
    }
  });

  it('--help teaches by example and lists targets and names', () => {
    const r = runCli(['query', '--help']);
    expect(r.status).toBe(0);
    for (const f of ["--target 'solar-split(f_m=0.995,t_max_myr=2)'", 'accretion-window', 'Hartmann et al. 1998', 'm_star_msun@<t>myr', 'Wilson (1927)', 'Friedman &']) {
      expect(r.stdout).toContain(f);
    }
  });
});
