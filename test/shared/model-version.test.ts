/**
 * MODEL_VERSION is part of every point id, so a sweep database never mixes results of different physics. A
 * change of the parameter table, the output registry or of what a model computes without a version bump would
 * let `resume` and result reuse accept stale rows as current (seen once: dispersal landed while the version
 * stayed put, and a resumed sweep recomputed nothing). This test pins the version to fingerprints of all
 * three; when it fails, bump MODEL_VERSION and then copy the fingerprints the failure prints.
 *
 * The model fingerprint covers one short disk-start run (the timing part excluded), so a physics change that
 * moves its outputs by one bit is caught; a change confined to paths that run does not take (infall, the
 * ionization provider) is caught only by the table fingerprint, if at all. Common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { contentHash } from '../../shared/hashing.js';
import { DEFAULT_PARAMS } from '../../shared/model-params.js';
import { OUTPUTS, SERIES_COLUMNS } from '../../shared/model-outputs.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { runModel } from '../../worker/model.js';

const PINNED = {
  version: '0.7.0',
  tables: '7ad84c0dacfa3a96d5c3894e616c2c2fdf03846a759577b5d8d7a288897d600f',
  disk_model: '57d25c6beafb2f6ea726a99b69187ddffd9c26a6a64c9902e0cd3e8855e7bc78',
};

function fingerprints(): typeof PINNED {
  const { timing: _timing, ...outputs } = runModel({ initial_state: 'disk', t_end_myr: 1 });
  return {
    version: MODEL_VERSION,
    tables: contentHash({ params: DEFAULT_PARAMS, outputs: OUTPUTS.map((o) => [o.name, o.unit]), series: SERIES_COLUMNS }),
    disk_model: contentHash(outputs),
  };
}

describe('MODEL_VERSION', () => {
  it('is bumped whenever the parameter table, the output registry or a model result changes', () => {
    const now = fingerprints();
    const changed = now.tables !== PINNED.tables || now.disk_model !== PINNED.disk_model;
    const hint = `parameters/outputs/results changed: bump MODEL_VERSION (now ${MODEL_VERSION}) and pin ${JSON.stringify(now)}`;
    if (changed) expect(now.version, hint).not.toBe(PINNED.version);
    expect(now, hint).toEqual(PINNED);
  });
});
