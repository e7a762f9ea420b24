/**
 * The dead-zone target on a real small sweep with layered accretion (fixed active columns, test/support/
 * query-db.ts): present/absent and edge/width bounds at a checkpoint, each checked against the stored
 * checkpoint rows read with plain SQL.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { evaluateTargets, parseTarget } from '../../../orchestrator/query/index.js';
import { openStore, type StoreReader } from '../../../orchestrator/store/index.js';
import { buildQueryDb, deadZoneGridSpec } from '../../support/query-db.js';
import { queryRows } from '../../support/sweep-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';

interface Row {
  point_index: number;
  n_dead_bands: number;
  r_dead_in_au: number | null;
  r_dead_out_au: number | null;
}

let dir = '';
let store: StoreReader;
let rows: Row[] = [];

beforeAll(() => {
  dir = makeTempDir('disksweep-dead-zone-');
  const { path } = buildQueryDb(dir, deadZoneGridSpec('wren-hollow', 3, 3));
  store = openStore(path, { mode: 'read' });
  rows = queryRows<Row>(
    path,
    `SELECT p.point_index, c.n_dead_bands, c.r_dead_in_au, c.r_dead_out_au FROM results r JOIN points p USING (point_key)
     JOIN checkpoint_rows c ON c.point_key = r.point_key AND abs(c.t_myr - 1) < 1e-9 WHERE r.status = 'ok' ORDER BY p.point_index`,
  );
}, 120_000);

afterAll(() => {
  store?.close();
  removeTempDir(dir);
});

const passing = (text: string) => {
  const ev = evaluateTargets(store, { targets: [parseTarget(text)] });
  return [...ev.pointIndex].filter((_, i) => ev.pass[i] === 1);
};

describe('dead-zone target', () => {
  it('present and absent split the points exactly as the stored band counts do', () => {
    const withZone = rows.filter((r) => r.n_dead_bands > 0).map((r) => r.point_index);
    expect(withZone.length).toBeGreaterThan(0);
    expect(passing('dead-zone(at_myr=1)')).toEqual(withZone);
    expect(passing('dead-zone(at_myr=1,present=no)')).toEqual(rows.filter((r) => r.n_dead_bands === 0).map((r) => r.point_index));
  });

  it('edge and width bounds', () => {
    const zones = rows.filter((r) => r.n_dead_bands > 0 && r.r_dead_in_au !== null && r.r_dead_out_au !== null);
    const outer = zones.map((r) => r.r_dead_out_au as number).sort((a, b) => a - b);
    const cut = outer[Math.floor(outer.length / 2)];
    expect(passing(`dead-zone(at_myr=1,r_out_min_au=${cut})`)).toEqual(zones.filter((r) => (r.r_dead_out_au as number) >= cut).map((r) => r.point_index));
    const widths = zones.map((r) => (r.r_dead_out_au as number) - (r.r_dead_in_au as number));
    const w = Math.max(...widths) / 2;
    expect(passing(`dead-zone(at_myr=1,width_max_au=${w})`)).toEqual(zones.filter((r) => (r.r_dead_out_au as number) - (r.r_dead_in_au as number) <= w).map((r) => r.point_index));
  });
});
