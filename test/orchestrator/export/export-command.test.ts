/**
 * `disksweep export`: ECSV read back with a YAML parser declares every column with its unit (astropy
 * spelling) and datatype, and every value reads back as the stored double; CSV quotes what needs quoting;
 * JSON lines carry the same values; bad flags exit 2.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PARAMS, PARAM_NAMES } from '../../../shared/model-params.js';
import { CHECKPOINT_OUTPUTS, OUTPUTS, SCALAR_OUTPUTS } from '../../../shared/model-outputs.js';
import { astropyUnit } from '../../../orchestrator/export/astropy-units.js';
import { checkpointColumnName } from '../../../orchestrator/export/export-columns.js';
import { openStore, type StoredOutcome } from '../../../orchestrator/store/index.js';
import { runCli } from '../../support/cli.js';
import { parseCsv, readEcsv } from '../../support/ecsv-reader.js';
import { buildQueryDb, deadZoneGridSpec, type QueryDb } from '../../support/query-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

let dir: string;
let db: string;
let made: QueryDb;
const REASON = 'worker "kite-3" lost, retried; then, gave up';

beforeAll(() => {
  dir = makeTempDir();
  db = `${dir}/wren.sqlite`;
  made = buildQueryDb(dir, deadZoneGridSpec('wren-hollow', 3, 3), 'wren.sqlite', { limit: 8 });
  // The ninth point failed outside the model, with a reason full of CSV's special characters.
  const last = made.outcomes[7];
  const store = openStore(db, { mode: 'write' });
  store.writeResults([{ ...last, pointId: 'f'.repeat(32), pointIndex: 8, outcome: { kind: 'infrastructure', reason: REASON } }]);
  store.close();
});

afterAll(() => removeTempDir(dir));

const TIMES = [0.1, 0.3, 1, 2, 3];

/** What each column must hold for an outcome, as the number or text the export must read back to. */
function expected(o: StoredOutcome): Record<string, unknown> {
  const e: Record<string, unknown> = { point_id: o.pointId, point_index: o.pointIndex };
  for (const n of PARAM_NAMES) e[n] = o.params[n];
  if (o.outcome.kind === 'model') {
    const r = o.outcome.result;
    e.status = r.status;
    for (const d of SCALAR_OUTPUTS) e[d.name] = r.scalars[d.name];
    for (const c of r.checkpoints) for (const d of CHECKPOINT_OUTPUTS) e[checkpointColumnName(d.name, Number(c.t_myr))] = c[d.name];
  } else {
    e.status = 'infrastructure_error';
    e.status_reason = o.outcome.reason;
  }
  return e;
}

function fromText(datatype: string, text: string): unknown {
  if (text === '') return null;
  if (datatype === 'float64' || datatype === 'int64') return Number(text);
  if (datatype === 'bool') return text === 'True' ? true : text === 'False' ? false : `bad bool ${text}`;
  return text;
}

describe('ECSV export', () => {
  it('declares every column with unit, datatype and description, and the values round-trip', () => {
    const r = runCli(['export', db, '--format', 'ecsv', '--out', `${dir}/t.ecsv`]);
    expect(r.status).toBe(0);
    expect(r.stderr).toContain('wrote 9 rows');
    const t = readEcsv(readFileSync(`${dir}/t.ecsv`, 'utf8'));
    expect(t.header.delimiter).toBe(',');
    expect(t.header.meta).toMatchObject({ sweep_name: 'wren-hollow', sweep_id: made.sweepId });
    const cols = t.header.datatype;
    expect(cols.map((c) => c.name)).toEqual(t.names);
    const wantNames = [
      'point_id', 'point_index', 'status', 'status_reason', ...PARAM_NAMES, ...SCALAR_OUTPUTS.map((d) => d.name),
      ...TIMES.flatMap((tm) => CHECKPOINT_OUTPUTS.map((d) => checkpointColumnName(d.name, tm))),
    ];
    expect(t.names).toEqual(wantNames);
    // Every column has a description; units where the registry has one, in astropy's spelling.
    const unitOf = new Map<string, string>();
    for (const n of PARAM_NAMES) if (PARAMS[n].kind !== 'choice') unitOf.set(n, (PARAMS[n] as { unit: string }).unit);
    for (const d of OUTPUTS) unitOf.set(d.name, d.unit);
    for (const c of cols) {
      expect(c.description?.length ?? 0).toBeGreaterThan(0);
      expect(['string', 'float64', 'int64', 'bool']).toContain(c.datatype);
      const ours = unitOf.get(c.name.split('@')[0]);
      if (ours === undefined || ours === '1') expect(c.unit).toBeUndefined();
      else expect(c.unit).toBe(astropyUnit(ours));
    }
    const unit = (name: string) => cols.find((c) => c.name === name)?.unit;
    expect(unit('m_star_msun@1myr')).toBe('solMass');
    expect(unit('mdot_star_msun_yr@1myr')).toBe('solMass / yr');
    expect(unit('j_disk_g_cm2_s@3myr')).toBe('g cm2 / s');
    expect(unit('r50_au@0.1myr')).toBe('AU');
    expect(unit('t_solar_split_myr')).toBe('Myr');
    expect(unit('lx_erg_s')).toBe('erg / s');
    expect(unit('t_core_k')).toBe('K');
    expect(unit('omega_core_s')).toBe('1 / s');
    expect(unit('sigma_active_face_g_cm2')).toBe('g / cm2');

    expect(t.rows).toHaveLength(9);
    const all = [...made.outcomes.slice(0, 8), { ...made.outcomes[7], pointId: 'f'.repeat(32), pointIndex: 8, outcome: { kind: 'infrastructure' as const, reason: REASON } }];
    t.rows.forEach((row, k) => {
      const want = expected(all[k]);
      row.forEach((text, c) => {
        const name = t.names[c];
        const got = fromText(cols[c].datatype, text);
        if (name === 'checkpoints_myr') expect(JSON.parse(text)).toEqual(want[name]);
        else expect(got, `${name} of row ${k}`).toEqual(name in want ? want[name] : null);
      });
    });
  });
});

describe('CSV and JSON lines', () => {
  it('CSV has the same columns and quotes fields with commas and quotes', () => {
    const r = runCli(['export', db, '--format', 'csv']);
    expect(r.status).toBe(0);
    const rows = parseCsv(r.stdout);
    expect(rows[0][0]).toBe('point_id');
    expect(rows).toHaveLength(10);
    const reason = rows[0].indexOf('status_reason');
    expect(rows[9][reason]).toBe(REASON);
    expect(r.stdout).toContain('"worker ""kite-3"" lost, retried; then, gave up"');
    const flag = rows[0].indexOf('flag_massive_disk');
    expect(['true', 'false']).toContain(rows[1][flag]);
  });

  it('JSON lines hold the same values, lists as arrays and null for missing', () => {
    const r = runCli(['export', db, '--format', 'jsonl']);
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(lines).toHaveLength(9);
    const want = expected(made.outcomes[3]);
    for (const [k, v] of Object.entries(want)) expect(lines[3][k], k).toEqual(v);
    expect(lines[8].status_reason).toBe(REASON);
    expect(lines[8].m_star_end_msun).toBeNull();
  });

  it('refuses a bad format, a missing database and an unwritable --out (exit 2)', () => {
    expect(runCli(['export', db, '--format', 'xlsx']).status).toBe(2);
    expect(runCli(['export', db]).status).toBe(2);
    expect(runCli(['export', `${dir}/none.sqlite`, '--format', 'csv']).status).toBe(2);
    const r = runCli(['export', db, '--format', 'csv', '--out', `${dir}/no/dir/x.csv`]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--out');
    expect(r.stderr).toContain(`--out ${dir}/no/dir/x.csv: cannot write the file (ENOENT)`);
  });
});

describe('export with targets', () => {
  it('--target adds a pass column: the recorded split by 3 Myr for ok points, empty for the failed one', () => {
    const r = runCli(['export', db, '--format', 'jsonl', '--target', 'solar-split']);
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(lines).toHaveLength(9);
    for (const l of lines.slice(0, 8)) {
      const t = l.t_solar_split_myr;
      expect(l.pass, String(l.point_id)).toBe(typeof t === 'number' && t <= 3);
    }
    expect(lines[8].pass).toBeNull();
    expect(new Set(lines.slice(0, 8).map((l) => l.pass)).size).toBe(2); // both outcomes occur
  });

  it('--where keeps only the selected points; the ECSV header describes the pass column', () => {
    const r = runCli(['export', db, '--format', 'ecsv', '--target', 'solar-split', '--where', 'alpha_active >= 0.01']);
    expect(r.status).toBe(0);
    const t = readEcsv(r.stdout);
    const alpha = t.names.indexOf('alpha_active');
    expect(t.rows.length).toBeGreaterThan(0);
    expect(t.rows.length).toBeLessThan(8);
    for (const row of t.rows) expect(Number(row[alpha])).toBeGreaterThanOrEqual(0.01);
    const pass = t.header.datatype.at(-1)!;
    expect(pass).toMatchObject({ name: 'pass', datatype: 'bool' });
    expect(pass.description).toContain('solar-split');
    expect(runCli(['export', db, '--format', 'csv', '--target', 'nope']).status).toBe(2);
  });

  it('prints the notes of its targets, as query does: other split thresholds are re-evaluated from the series', () => {
    const r = runCli(['export', db, '--format', 'csv', '--target', 'solar-split(f_m=0.995)']);
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/note: solar-split\(f_m=0\.995.*: thresholds differ from those .*the models ran with/);
    expect(r.stdout.split('\n')[0]).toMatch(/^point_id,/);
  });
});

describe('units', () => {
  it('every unit of the parameter table and the output registry has an astropy spelling', () => {
    const units = new Set<string>([...OUTPUTS.map((d) => d.unit), ...PARAM_NAMES.flatMap((n) => (PARAMS[n].kind === 'choice' ? [] : [(PARAMS[n] as { unit: string }).unit]))]);
    for (const u of units) expect(() => astropyUnit(u), u).not.toThrow();
    expect(() => astropyUnit('furlong')).toThrow(/astropy-units.ts/);
  });
});
