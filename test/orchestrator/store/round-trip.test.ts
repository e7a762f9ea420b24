/**
 * Outcomes of real model runs go into a store and come back bit for bit: typed parameter columns, flags,
 * nullable outputs, checkpoints and the raw float32 series bytes.
 */
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { PARAMS } from '../../../shared/model-params.js';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS } from '../../../shared/model-outputs.js';
import { decodeSeries } from '../../../shared/model-result.js';
import { APPLICATION_ID, SCHEMA_VERSION } from '../../../orchestrator/store/schema.js';
import { openStore } from '../../../orchestrator/store/sweep-store.js';
import { parseStoredOutcomes } from '../../../orchestrator/store/store-types.js';
import { infrastructureOutcome, modelOutcome, modelRun, sweepFixture } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();

const infall = () => modelRun({});
const massiveDisk = () => modelRun({ initial_state: 'disk', m_disk_msun: 0.5 });
const stepLimited = () => modelRun({ max_steps: 10 });

describe('store round trip', () => {
  it('creates a new store with our application id, the current schema and WAL', () => {
    const file = tmp.file('new.sqlite');
    const store = openStore(file, { mode: 'write' });
    expect(store.created).toBe(true);
    store.close();
    const raw = new Database(file, { readonly: true });
    expect(raw.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
    expect(raw.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    expect(raw.pragma('journal_mode', { simple: true })).toBe('wal');
    raw.close();
    const again = openStore(file, { mode: 'write' });
    expect(again.created).toBe(false);
    expect(again.addedColumns).toEqual([]);
    again.close();
  });

  it('reads back model results and infrastructure failures exactly as written', () => {
    const file = tmp.file('rt.sqlite');
    const store = openStore(file, { mode: 'write' });
    const sweep = sweepFixture();
    expect(store.registerSweep(sweep).kind).toBe('created');
    const batch = [
      modelOutcome(sweep.sweepId, 0, infall()),
      modelOutcome(sweep.sweepId, 1, massiveDisk()),
      modelOutcome(sweep.sweepId, 2, stepLimited()),
      infrastructureOutcome(sweep.sweepId, 3, modelRun({ alpha_active: 0.02 }), 'worker thread exited with code 1'),
    ];
    // What a queue would deliver: JSON, validated at the boundary.
    const delivered = parseStoredOutcomes(JSON.parse(JSON.stringify(batch)));
    expect(store.writeResults(delivered)).toEqual({ written: 4, skippedOk: 0 });

    for (const item of batch) {
      // Everything, timing included (wall_ms is a REAL: float64, exact), comes back equal.
      expect(store.readResult(sweep.sweepId, item.pointId)).toEqual(item);
    }
    // The cases the batch was built to cover really occur.
    const results = batch.flatMap((b) => (b.outcome.kind === 'model' ? [b.outcome.result] : []));
    expect(results.map((r) => r.status)).toEqual(['ok', 'ok', 'step_limit']);
    expect(results.some((r) => r.scalars.flag_massive_disk === true)).toBe(true);
    expect(results.some((r) => r.scalars.flag_massive_disk === false)).toBe(true);
    expect(results.some((r) => r.scalars.t_infall_end_myr === null)).toBe(true);
    expect(results.some((r) => r.scalars.t_infall_end_myr !== null)).toBe(true);
    expect(results.some((r) => r.series.n_samples === 0)).toBe(true);
    store.close();

    // The same from a read-only store, in another connection.
    const reader = openStore(file, { mode: 'read' });
    const back = reader.readResult(sweep.sweepId, batch[1].pointId);
    expect(back).toEqual(batch[1]);
    const written = batch[1].outcome.kind === 'model' ? batch[1].outcome.result : undefined;
    const read = back?.outcome.kind === 'model' ? back.outcome.result : undefined;
    expect(read !== undefined && written !== undefined).toBe(true);
    if (read !== undefined && written !== undefined) {
      const a = decodeSeries(written.series);
      const b = decodeSeries(read.series);
      for (const [name, col] of Object.entries(a)) expect(Buffer.from(b[name].buffer)).toEqual(Buffer.from(col.buffer));
    }
    reader.close();
  });

  it('stores typed columns: REAL numbers, TEXT choices, JSON lists, INTEGER flags, raw float32 blobs', () => {
    const file = tmp.file('types.sqlite');
    const store = openStore(file, { mode: 'write' });
    const sweep = sweepFixture();
    store.registerSweep(sweep);
    const item = modelOutcome(sweep.sweepId, 0, massiveDisk());
    store.writeResults([item]);
    store.close();

    const raw = new Database(file, { readonly: true });
    const point = raw
      .prepare('SELECT typeof(alpha_active) AS a, typeof(initial_state) AS c, checkpoints_myr AS l, typeof(n_cells) AS n FROM points')
      .get() as { a: string; c: string; l: string; n: string };
    expect(point).toEqual({ a: 'real', c: 'text', l: JSON.stringify(item.params.checkpoints_myr), n: 'real' });
    const result = raw
      .prepare('SELECT typeof(flag_massive_disk) AS f, flag_massive_disk AS fv, t_infall_end_myr AS t, typeof(m_star_end_msun) AS m FROM results')
      .get() as { f: string; fv: number; t: number | null; m: string };
    expect(result).toEqual({ f: 'integer', fv: 1, t: null, m: 'real' });
    const series = raw.prepare('SELECT columns, n_samples, data FROM series').get() as { columns: string; n_samples: number; data: Buffer };
    const r = item.outcome.kind === 'model' ? item.outcome.result : undefined;
    expect(series.columns).toBe(JSON.stringify(r?.series.columns));
    expect(series.n_samples).toBe(r?.series.n_samples);
    expect(series.data.equals(Buffer.from(r?.series.f32le_base64 ?? '', 'base64'))).toBe(true);
    expect(series.data.length).toBe((r?.series.n_samples ?? 0) * (r?.series.columns.length ?? 0) * 4);
    const cps = raw.prepare('SELECT count(*) FROM checkpoints').pluck().get();
    expect(cps).toBe(r?.checkpoints.length);

    // One column per registry entry, none hard-coded away.
    const cols = (table: string) => (raw.pragma(`table_info(${table})`) as { name: string }[]).map((c) => c.name);
    expect(cols('points')).toEqual(expect.arrayContaining(Object.keys(PARAMS)));
    expect(cols('results')).toEqual(expect.arrayContaining(SCALAR_OUTPUTS.map((d) => d.name)));
    expect(cols('checkpoints')).toEqual(expect.arrayContaining(CHECKPOINT_OUTPUTS.map((d) => d.name)));
    raw.close();
  });

  it('adds a registry column the table lacks when a writer opens it', () => {
    const file = tmp.file('cols.sqlite');
    openStore(file, { mode: 'write' }).close();
    const raw = new Database(file);
    raw.exec('ALTER TABLE results DROP COLUMN q_min_run');
    raw.close();
    const store = openStore(file, { mode: 'write' });
    expect(store.addedColumns).toEqual(['results.q_min_run']);
    const sweep = sweepFixture();
    store.registerSweep(sweep);
    const item = modelOutcome(sweep.sweepId, 0, infall());
    store.writeResults([item]);
    expect(store.readResult(sweep.sweepId, item.pointId)).toEqual(item);
    store.close();
  });

  it('refuses a registry column whose declared type changed', () => {
    const file = tmp.file('coltype.sqlite');
    openStore(file, { mode: 'write' }).close();
    const raw = new Database(file);
    raw.exec('ALTER TABLE points DROP COLUMN alpha_active');
    raw.exec('ALTER TABLE points ADD COLUMN alpha_active TEXT');
    raw.close();
    expect(() => openStore(file, { mode: 'write' })).toThrow(
      expect.objectContaining({ code: 'store/schema-mismatch', details: [expect.stringContaining('points.alpha_active: declared TEXT')] }),
    );
  });

  it('rejects a batch with a bad item as a whole', () => {
    const store = openStore(tmp.file('atomic.sqlite'), { mode: 'write' });
    const sweep = sweepFixture();
    store.registerSweep(sweep);
    const good = modelOutcome(sweep.sweepId, 0, infall());
    const { n_cells: _dropped, ...incomplete } = massiveDisk().params;
    const bad = { ...modelOutcome(sweep.sweepId, 1, massiveDisk()), params: incomplete };
    expect(() => store.writeResults([good, bad])).toThrow(expect.objectContaining({ code: 'store/invalid-outcome', message: expect.stringContaining('n_cells') }));
    expect(store.readResult(sweep.sweepId, good.pointId)).toBeUndefined();
    expect(() => store.writeResults([{ ...good, params: { ...good.params, alpha_activ: 0.1 } }])).toThrow(/unknown parameter alpha_activ/);
    expect(() => store.writeResults([{ ...good, pointIndex: sweep.nPoints }])).toThrow(/outside sweep/);
    expect(() => store.writeResults([{ ...good, sweepId: 'f'.repeat(64) }])).toThrow(expect.objectContaining({ code: 'store/unknown-sweep' }));
    expect(() => parseStoredOutcomes([{ ...good, outcome: { kind: 'model', result: { status: 'ok' } } }])).toThrow(
      expect.objectContaining({ code: 'store/invalid-outcome' }),
    );
    expect(store.statusCounts(sweep.sweepId).withResult).toBe(0);
    store.close();
  });
});
