/**
 * `disksweep show DB POINT_ID` as a process: a unique prefix finds the point, an ambiguous or unknown one is
 * an input error naming the candidates; the terminal output has the parameters, the checkpoint table and the
 * plots; --json is the stored run with its series as arrays; --svg and --png write the plots.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../../orchestrator/store/index.js';
import { runCli } from '../../support/cli.js';
import { buildQueryDb, deadZoneGridSpec, type QueryDb } from '../../support/query-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';
import { allElements, parseXml, textOf } from '../../support/xml-tree.js';

let dir: string;
let db: string;
let made: QueryDb;

beforeAll(() => {
  dir = makeTempDir();
  db = `${dir}/wren.sqlite`;
  made = buildQueryDb(dir, deadZoneGridSpec('wren-hollow', 4, 4), 'wren.sqlite', { limit: 15 }); // index 15 is stored below as a failure
});

afterAll(() => removeTempDir(dir));

/** The shortest prefix of `id` no other id shares. */
function prefixes(ids: readonly string[], id: string) {
  let n = 1;
  while (ids.filter((o) => o.startsWith(id.slice(0, n))).length > 1) n++;
  return id.slice(0, n);
}

describe('disksweep show', () => {
  it('finds a point by a unique prefix and prints parameters, checkpoints and plots', () => {
    const id = made.pointIds[4];
    const r = runCli(['show', db, prefixes(made.pointIds, id)]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`point ${id} (index 4) of sweep wren-hollow`);
    const p = made.outcomes[4].params;
    expect(r.stdout).toContain(`m_disk_msun=${JSON.stringify(p.m_disk_msun)}`);
    expect(r.stdout).toContain(`alpha_active=${JSON.stringify(p.alpha_active)}`);
    expect(r.stdout).toMatch(/t \[Myr\] +M_\* \[Msun\]/);
    for (const title of ['accretion rate onto the star', 'solar-like split', 'where the angular momentum is', 'dead zone']) expect(r.stdout).toContain(title);
  });

  it('refuses an ambiguous prefix, listing the candidates, and an unknown or malformed one (exit 2)', () => {
    // Point ids are hashes of the parameters and the model version. With 15 ids, two share a first digit (pigeonhole
    // fails only if all 15 first digits differ: odds 16!/16^15 ≈ 1e-5), and at least one hex digit starts none.
    const first = made.pointIds.map((id) => id[0]);
    const shared = first.find((c, k) => first.indexOf(c) !== k);
    expect(shared).toBeDefined();
    const ambiguous = runCli(['show', db, shared!]);
    expect(ambiguous.status).toBe(2);
    expect(ambiguous.stderr).toContain('give more digits');
    for (const id of made.pointIds.filter((i) => i.startsWith(shared!))) expect(ambiguous.stderr).toContain(id);
    const absent = '0123456789abcdef'.split('').find((c) => !first.includes(c))!;
    const unknown = runCli(['show', db, absent]);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toContain(`no point id starting with "${absent}"`);
    const bad = runCli(['show', db, 'xyz!']);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('hex digits');
    const noDb = runCli(['show', `${dir}/absent.sqlite`, 'ab']);
    expect(noDb.status).toBe(2);
  });

  it('--json prints the stored run with the series as arrays', () => {
    const id = made.pointIds[0];
    const r = runCli(['show', db, id, '--json']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout) as { point_id: string; status: string; params: Record<string, unknown>; series: Record<string, number[]>; checkpoints: unknown[] };
    expect(out.point_id).toBe(id);
    expect(out.status).toBe('ok');
    expect(out.params).toEqual(made.outcomes[0].params);
    const result = made.outcomes[0].outcome.kind === 'model' ? made.outcomes[0].outcome.result : undefined;
    expect(out.checkpoints).toEqual(result?.checkpoints);
    expect(out.series.t_myr).toHaveLength(result?.series.n_samples ?? -1);
    expect(Object.keys(out.series).sort()).toEqual(['m_disk_msun', 'm_star_msun', 'mdot_star_msun_yr', 'spin_j_share', 'star_mass_share', 't_myr']);
  });

  it('says so for a point whose run failed outside the model, and has nothing to plot', () => {
    const store = openStore(db, { mode: 'write' });
    const failedId = 'e'.repeat(32);
    store.writeResults([{ ...made.outcomes[0], pointId: failedId, pointIndex: 15, outcome: { kind: 'infrastructure', reason: 'worker thread exited (code 1)' } }]);
    store.close();
    const r = runCli(['show', db, failedId]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('no model result: the run failed outside the model (worker thread exited (code 1))');
    const j = JSON.parse(runCli(['show', db, failedId, '--json']).stdout) as { status: string; status_reason: string };
    expect(j).toMatchObject({ status: 'infrastructure_error', status_reason: 'worker thread exited (code 1)' });
    const svg = runCli(['show', db, failedId, '--svg', `${dir}/f.svg`]);
    expect(svg.status).toBe(2);
    expect(svg.stderr).toContain('no model result to plot');
  });

  it('--svg writes five panels as one well-formed SVG; --png a PNG', () => {
    const id = made.pointIds[7];
    const r = runCli(['show', db, id, '--svg', `${dir}/p.svg`, '--png', `${dir}/p.png`]);
    expect(r.status).toBe(0);
    const root = parseXml(readFileSync(`${dir}/p.svg`, 'utf8'));
    expect(allElements(root).filter((e) => e.attrs.class === 'panel')).toHaveLength(5);
    const titles = allElements(root).filter((e) => e.attrs.class === 'plot-title').map(textOf);
    expect(titles).toContain('accretion rate onto the star');
    expect(allElements(root).filter((e) => e.name === 'polyline').length).toBeGreaterThanOrEqual(6);
    expect(readFileSync(`${dir}/p.png`).subarray(1, 4).toString('latin1')).toBe('PNG');
    const noDir = runCli(['show', db, id, '--svg', `${dir}/no/such/dir/p.svg`]);
    expect(noDir.status).toBe(2);
    expect(noDir.stderr).toContain('--svg');
  });
});
