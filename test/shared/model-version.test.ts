/**
 * MODEL_VERSION is part of every point id, so a sweep database never mixes results of different physics. A
 * change of the parameter table, the output registry or of what a model computes without a version bump would
 * let `resume` and result reuse accept stale rows as current (seen once: dispersal landed while the version
 * stayed put, and a resumed sweep recomputed nothing). This test pins the version to fingerprints of all
 * three; when it fails, bump MODEL_VERSION and then copy the fingerprints the failure prints.
 *
 * The model fingerprints cover one short disk-start run and one short infall run with the default physics
 * (ionization dead zone, GI, winds, accretion luminosity; the timing part excluded), so a physics change that
 * moves their outputs by one bit is caught; a change confined to paths neither takes (another provider, a
 * switched-off wind) is caught only by the table fingerprint, if at all. Common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { contentHash } from '../../shared/hashing.js';
import { DEFAULT_PARAMS } from '../../shared/model-params.js';
import { OUTPUTS, SERIES_COLUMNS } from '../../shared/model-outputs.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { runModel } from '../../worker/model.js';

const PINNED = {
  version: '0.7.0',
  tables: 'b55542f2c4ac3730b9c20461baa0152abd3f960b45eb346a5db10548380a4d8a',
  disk_model: '802b308b64606bff0c275f551242b7f1bcae76398270696a7f90e959e2e1c139',
  infall_model: '74a488341f54d59c95a6d8f37f2e089826711109bd57017f8b5e91c0ed2cd340',
};

function fingerprints(): typeof PINNED {
  const { timing: _timing, ...outputs } = runModel({ initial_state: 'disk', t_end_myr: 1 });
  const { timing: _infallTiming, ...infall } = runModel({ t_end_myr: 0.3, n_cells: 80, checkpoints_myr: [0.1, 0.3] });
  return {
    version: MODEL_VERSION,
    tables: contentHash({ params: DEFAULT_PARAMS, outputs: OUTPUTS.map((o) => [o.name, o.unit]), series: SERIES_COLUMNS }),
    disk_model: contentHash(outputs),
    infall_model: contentHash(infall),
  };
}

describe('MODEL_VERSION', () => {
  it('is bumped whenever the parameter table, the output registry or a model result changes', () => {
    const now = fingerprints();
    const changed = now.tables !== PINNED.tables || now.disk_model !== PINNED.disk_model || now.infall_model !== PINNED.infall_model;
    const hint = `parameters/outputs/results changed: bump MODEL_VERSION (now ${MODEL_VERSION}) and pin ${JSON.stringify(now)}`;
    if (changed) expect(now.version, hint).not.toBe(PINNED.version);
    expect(now, hint).toEqual(PINNED);
  });
});
