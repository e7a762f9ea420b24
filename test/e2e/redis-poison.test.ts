/**
 * Poison chunks through Redis: a point that kills its thread every time, and one that hangs, each in a chunk
 * of four. The chunk uses its attempts, is split in halves down to single points on the last one, the healthy
 * points get their results, the poison point is stored as an infrastructure failure with its reason, and the
 * sweep completes without anyone's help.
 */
import { describe, expect, it } from 'vitest';
import { faultModelEnv } from '../support/cli.js';
import { sweepSummary, useRedisSweep } from '../support/redis-sweep.js';
import { resultsPerPoint, statusByIndex } from '../support/sweep-db.js';
import { TINY_FIXED, TINY_MODEL, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();
const ctx = useRedisSweep();

const KILLS_THREAD = 0.0203;
const HANGS = 0.0205;

async function poisonSweep(name: string, poison: number): Promise<{ statuses: Map<number, { status: string; reason: string | null }>; workerLog: string }> {
  // Points 0-7; the poison point is index 6, in the second chunk (4-7), so the first chunk is timed first.
  const spec = writeSpec(tmp.path, `${name}.yaml`, {
    name, model: TINY_MODEL, fixed: TINY_FIXED,
    vary: { alpha_active: { values: [0.001, 0.002, 0.003, 0.005, 0.007, 0.01, poison, 0.03] } },
    chunks: { size: 4 },
  });
  const env = { ...faultModelEnv(), DISKSWEEP_TEST_WATCHDOG_MS: '3000' } // well above a cold thread's start and import on a loaded machine;
  const worker = ctx.worker({ env });
  await worker.waitForStderr(/ready: model version/);
  const db = tmp.file(`${name}.sqlite`);
  const r = await ctx.start(['run', spec, '--db', db, ...ctx.args, '--json'], { env }).exited;
  expect(r.status, `${r.stderr}\nworker:\n${worker.stderr()}`).toBe(0);
  expect(sweepSummary.parse(JSON.parse(r.stdout))).toEqual({ done: 8, failed: 1, total: 8, committed: 8, interrupted: false });
  expect(resultsPerPoint(db)).toEqual({ points: 8, results: 8, maxPerPoint: 1 });
  // Three attempts of the whole chunk, then the split.
  expect(worker.stderr()).toMatch(/chunk 1 of [0-9a-f]{12}: started \(4 points, attempt 3\)/);
  return { statuses: statusByIndex(db), workerLog: worker.stderr() };
}

describe('poison chunks through Redis', () => {
  it('a point that kills its thread every time ends as an infrastructure failure; its chunk-mates get results', async () => {
    const { statuses } = await poisonSweep('wren-poison', KILLS_THREAD);
    expect([...Array(8).keys()].map((i) => statuses.get(i)?.status)).toEqual(['ok', 'ok', 'ok', 'ok', 'ok', 'ok', 'infrastructure_error', 'ok']);
    expect(statuses.get(6)?.reason).toMatch(/^failed alone after every attempt of its chunk: .*exit/i);
  });

  it('a point that hangs is ended by the watchdog and stored with the reason', async () => {
    const { statuses } = await poisonSweep('wren-hang', HANGS);
    expect([...Array(8).keys()].map((i) => statuses.get(i)?.status)).toEqual(['ok', 'ok', 'ok', 'ok', 'ok', 'ok', 'infrastructure_error', 'ok']);
    expect(statuses.get(6)?.reason).toMatch(/^failed alone after every attempt of its chunk: watchdog: the point ran longer than \d+ ms/);
  });
});
