/**
 * A sweep that varies a split threshold (f_j_disk_max): solar-split then decides per point whether the
 * recorded first passage applies (the point ran with the asked thresholds) or the stored series must be
 * re-evaluated, in one SQL statement. Checked against the stored rows and the series read in the test.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { countTargets, evaluateTargets, parseTarget } from '../../../orchestrator/query/index.js';
import { firstSplitFromSeries } from '../../../orchestrator/query/series-split.js';
import { openStore, type StoreReader } from '../../../orchestrator/store/index.js';
import { buildQueryDb, splitGridSpec } from '../../support/query-db.js';
import { queryRows } from '../../support/sweep-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

interface Row {
  point_index: number;
  f_j_disk_max: number;
  t_solar_split_myr: number | null;
  t_infall_end_myr: number | null;
  columns: string;
  n_samples: number;
  data: Buffer;
}

let dir = '';
let store: StoreReader;
let rows: Row[] = [];

beforeAll(() => {
  dir = makeTempDir('disksweep-split-thresholds-');
  const spec = { ...splitGridSpec('heron-reach-thresholds'), vary: { m_disk_msun: { log: [0.01, 0.05], count: 3 }, f_j_disk_max: { values: [0.02, 0.01] } } };
  const { path } = buildQueryDb(dir, spec);
  store = openStore(path, { mode: 'read' });
  rows = queryRows<Row>(
    path,
    `SELECT p.point_index, p.f_j_disk_max, r.t_solar_split_myr, r.t_infall_end_myr, s.columns, s.n_samples, s.data
     FROM results r JOIN points p USING (point_key) JOIN series_rows s ON s.point_key = r.point_key WHERE r.status = 'ok' ORDER BY p.point_index`,
  );
}, 120_000);

afterAll(() => {
  store?.close();
  removeTempDir(dir);
});

describe('solar-split on a sweep that varies f_j_disk_max', () => {
  it('uses the recorded time where the point ran with the asked thresholds, the series elsewhere', () => {
    const tMax = 0.5;
    const expected = rows
      .filter((r) => {
        const t = r.f_j_disk_max === 0.02 ? r.t_solar_split_myr : firstSplitFromSeries(r.columns, r.n_samples, r.data, 0.99, 0.02, r.t_infall_end_myr);
        return t !== null && t <= tMax;
      })
      .map((r) => r.point_index);
    expect(expected.length).toBeGreaterThan(0);
    const request = { targets: [parseTarget(`solar-split(t_max_myr=${tMax})`)] };
    const ev = evaluateTargets(store, request);
    expect([...ev.pointIndex].filter((_, i) => ev.pass[i] === 1)).toEqual(expected);
    expect(ev.notes.join('\n')).toMatch(/thresholds differ from those some of the models ran with/);
    expect(countTargets(store, request).counts).toEqual(ev.counts);
    // The points run with f_j = 0.01 that reach it: a stricter threshold, so the series must say they pass at 0.02 too.
    const strictPass = rows.filter((r) => r.f_j_disk_max === 0.01 && r.t_solar_split_myr !== null && r.t_solar_split_myr <= tMax - 1 / 29);
    for (const r of strictPass) expect(expected).toContain(r.point_index);
  });
});
