/**
 * evaluateTargets on a real small sweep (test/support/query-db.ts): every pass flag is checked against the
 * stored rows read with plain SQL, and the solar-split re-evaluated from the stored series against the first
 * passage each model recorded while it ran.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DisksweepError } from '../../../shared/errors.js';
import { countTargets, evaluateTargets, parseTarget } from '../../../orchestrator/query/index.js';
import { firstSplitFromSeries } from '../../../orchestrator/query/series-split.js';
import { openStore, type StoreReader } from '../../../orchestrator/store/index.js';
import { buildQueryDb, splitGridSpec } from '../../support/query-db.js';
import { queryRows } from '../../support/sweep-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

let dir = '';
let path = '';
let store: StoreReader;

interface Row {
  point_index: number;
  m_disk_msun: number;
  alpha_active: number;
  t_solar_split_myr: number | null;
  t_infall_end_myr: number | null;
  lifetime: number | null;
  mdot: number | null;
  m_disk_1: number;
  m_star_1: number;
  columns: string;
  n_samples: number;
  data: Buffer;
}
let rows: Row[] = [];

beforeAll(() => {
  dir = makeTempDir('disksweep-query-');
  path = buildQueryDb(dir, splitGridSpec()).path;
  store = openStore(path, { mode: 'read' });
  rows = queryRows<Row>(
    path,
    `SELECT p.point_index, p.m_disk_msun, p.alpha_active, r.t_solar_split_myr, r.t_infall_end_myr, r.disk_lifetime_myr AS lifetime, c.mdot_star_msun_yr AS mdot,
            c.m_disk_msun AS m_disk_1, c.m_star_msun AS m_star_1, s.columns, s.n_samples, s.data
     FROM results r JOIN points p USING (point_key) JOIN checkpoint_rows c ON c.point_key = r.point_key AND abs(c.t_myr - 1) < 1e-9
     JOIN series_rows s ON s.point_key = r.point_key WHERE r.status = 'ok' ORDER BY p.point_index`,
  );
}, 120_000);

afterAll(() => {
  store?.close();
  removeTempDir(dir);
});

const passSet = (pointIndex: Uint32Array, pass: Uint8Array) => [...pointIndex].filter((_, i) => pass[i] === 1);

describe('evaluateTargets', () => {
  it('returns every ok point with its varied parameters, scales and ranges from the spec', () => {
    expect(rows.length).toBe(9);
    const ev = evaluateTargets(store, { targets: [parseTarget('solar-split')] });
    expect(ev.parameters.map((p) => [p.name, p.scale, p.min, p.max, p.logSpace])).toEqual([
      ['m_disk_msun', 'log', 0.01, 0.05, true],
      ['alpha_active', 'log', 3e-3, 0.1, true],
    ]);
    expect(ev.counts).toMatchObject({ points: 9, ok: 9, selected: 9 });
    expect([...ev.pointIndex]).toEqual(rows.map((r) => r.point_index));
    expect([...ev.values[0]]).toEqual(rows.map((r) => r.m_disk_msun));
    expect([...ev.values[1]]).toEqual(rows.map((r) => r.alpha_active));
  });

  it('solar-split with the recorded thresholds is t_solar_split_myr <= t_max', () => {
    const passing = rows.filter((r) => r.t_solar_split_myr !== null && r.t_solar_split_myr <= 0.5).map((r) => r.point_index);
    // The grid is built so that both outcomes occur; otherwise this check could not fail.
    expect(passing.length).toBeGreaterThan(0);
    expect(passing.length).toBeLessThan(9);
    const ev = evaluateTargets(store, { targets: [parseTarget('solar-split(t_max_myr=0.5)')] });
    expect(passSet(ev.pointIndex, ev.pass)).toEqual(passing);
    expect(ev.counts.passed).toBe(passing.length);
  });

  it('re-evaluating the split from the series with the default thresholds agrees with the recorded first passage within one sample interval', () => {
    const reached = rows.filter((r) => r.t_solar_split_myr !== null);
    expect(reached.length).toBeGreaterThan(1);
    for (const r of rows) {
      const fromSeries = firstSplitFromSeries(r.columns, r.n_samples, r.data, 0.99, 0.02, r.t_infall_end_myr);
      const dt = 1 / (r.n_samples - 1); // n_series samples evenly spaced up to t_end_myr = 1
      if (r.t_solar_split_myr === null) {
        expect(fromSeries, `point ${r.point_index}`).toBeNull();
      } else {
        expect(fromSeries, `point ${r.point_index}`).not.toBeNull();
        const lag = (fromSeries as number) - r.t_solar_split_myr;
        expect(lag, `point ${r.point_index}`).toBeGreaterThanOrEqual(-1e-6); // float32 storage of t
        expect(lag, `point ${r.point_index}`).toBeLessThanOrEqual(dt * (1 + 1e-6));
      }
    }
  });

  it('thresholds other than the recorded ones go through the series (in SQL) and say so', () => {
    const fj = 0.015;
    const expected = rows
      .filter((r) => {
        const t = firstSplitFromSeries(r.columns, r.n_samples, r.data, 0.99, fj, r.t_infall_end_myr);
        return t !== null && t <= 0.6;
      })
      .map((r) => r.point_index);
    const ev = evaluateTargets(store, { targets: [parseTarget(`solar-split(f_j=${fj},t_max_myr=0.6)`)] });
    expect(passSet(ev.pointIndex, ev.pass)).toEqual(expected);
    expect(ev.notes.join('\n')).toMatch(/re-evaluated from the stored time series/);
    // A stricter spin share can only remove passes.
    const recorded = rows.filter((r) => r.t_solar_split_myr !== null && r.t_solar_split_myr <= 0.6).map((r) => r.point_index);
    expect(expected.every((i) => recorded.includes(i))).toBe(true);
  });

  it('accretion-window and disk-fraction read the 1 Myr checkpoint', () => {
    const [lo, hi] = [1e-9, 1e-8];
    const acc = evaluateTargets(store, { targets: [parseTarget(`accretion-window(at_myr=1,min=${lo},max=${hi})`)] });
    expect(passSet(acc.pointIndex, acc.pass)).toEqual(rows.filter((r) => r.mdot !== null && r.mdot >= lo && r.mdot <= hi).map((r) => r.point_index));
    const frac = evaluateTargets(store, { targets: [parseTarget('disk-fraction(at_myr=1,max=0.005)')] });
    const expected = rows.filter((r) => r.m_disk_1 / r.m_star_1 <= 0.005).map((r) => r.point_index);
    expect(expected.length).toBeGreaterThan(0);
    expect(expected.length).toBeLessThan(9);
    expect(passSet(frac.pointIndex, frac.pass)).toEqual(expected);
  });

  it('targets combine with and; --where selects points', () => {
    const a = evaluateTargets(store, { targets: [parseTarget('solar-split(t_max_myr=1)'), parseTarget('disk-fraction(max=0.005)')] });
    const split = new Set(rows.filter((r) => r.t_solar_split_myr !== null && r.t_solar_split_myr <= 1).map((r) => r.point_index));
    const frac = new Set(rows.filter((r) => r.m_disk_1 / r.m_star_1 <= 0.005).map((r) => r.point_index));
    expect(passSet(a.pointIndex, a.pass)).toEqual(rows.map((r) => r.point_index).filter((i) => split.has(i) && frac.has(i)));
    const w = evaluateTargets(store, { targets: [parseTarget('solar-split')], where: 'm_disk_msun < 0.02' });
    expect([...w.pointIndex]).toEqual(rows.filter((r) => r.m_disk_msun < 0.02).map((r) => r.point_index));
    expect(w.counts.selected).toBe(3);
    // The same name with a time is the checkpoint output (disk mass at 1 Myr), not the parameter.
    const atOne = evaluateTargets(store, { targets: [], where: 'm_disk_msun@1myr < m_disk_msun / 4' });
    expect(atOne.counts.selected).toBeGreaterThan(0);
    expect(atOne.counts.selected).toBeLessThan(9);
    expect([...atOne.pointIndex]).toEqual(rows.filter((r) => r.m_disk_1 < r.m_disk_msun / 4).map((r) => r.point_index));
  });

  it('countTargets gives the same counts without collecting the points', () => {
    for (const [targets, where] of [
      [['solar-split(t_max_myr=0.5)'], undefined],
      [['solar-split(f_j=0.015,t_max_myr=0.6)', 'disk-fraction(max=0.005)'], undefined],
      [['accretion-window(min=1e-10,max=1e-8)'], 'm_disk_msun < 0.03'],
    ] as const) {
      const request = { targets: targets.map(parseTarget), where };
      const full = evaluateTargets(store, request);
      expect(countTargets(store, request).counts).toEqual(full.counts);
    }
  });

  it('point ids on request', () => {
    const ev = evaluateTargets(store, { targets: [], withPointIds: true });
    expect(ev.pointIds).toHaveLength(9);
    expect(ev.pointIds?.every((id) => /^[0-9a-f]{32}$/.test(id))).toBe(true);
    expect(ev.counts.passed).toBe(9); // no target: every selected point passes
  });

  it('the lifetime target passes exactly the points whose recorded lifetime lies in its window', () => {
    // Windows chosen from the stored lifetimes themselves, so each one splits this sweep (a window that passed
    // every point or none could not tell a right answer from a wrong one).
    const ended = rows.filter((r) => r.lifetime !== null).map((r) => r.lifetime as number).sort((a, b) => a - b);
    expect(ended.length).toBeGreaterThan(0);
    expect(ended.length).toBeLessThan(rows.length); // some disks are still there at t_end: they must fail
    const windows: Array<[number, number]> = [[0, 100], [0, ended[0]], [ended[0] * 1.0001, 100]];
    for (const [lo, hi] of windows) {
      const ev = evaluateTargets(store, { targets: [parseTarget(`lifetime(min_myr=${lo},max_myr=${hi})`)] });
      const expected = rows.filter((r) => r.lifetime !== null && r.lifetime >= lo && r.lifetime <= hi).map((r) => r.point_index);
      expect(passSet(ev.pointIndex, ev.pass), `lifetime in [${lo}, ${hi}]`).toEqual(expected);
    }
  });

  it('an unknown --sweep is bad input naming the sweeps', () => {
    expect(() => evaluateTargets(store, { sweep: 'no-such-sweep', targets: [] })).toThrow(/no such sweep/);
  });
});
