/**
 * Periodic passive WAL checkpoints: committed batches are copied back into the database file every N batches
 * (or T ms), so the WAL does not grow without bound during a long sweep.
 */
import { statSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { openStore } from '../../../orchestrator/store/sweep-store.js';
import { manyOutcomes, modelRun, sweepFixture } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();
const size = (file: string) => statSync(file).size;

function writeTwoBatches(file: string, checkpointEveryBatches: number): { afterFirst: number; afterSecond: number; initial: number } {
  const store = openStore(file, { mode: 'write', checkpointEveryBatches, checkpointEveryMs: 3_600_000 });
  const sweep = sweepFixture();
  store.registerSweep(sweep);
  const initial = size(file);
  const run = modelRun({});
  store.writeResults(manyOutcomes(sweep.sweepId, run, 150));
  const afterFirst = size(file);
  store.writeResults(manyOutcomes(sweep.sweepId, run, 150, 150));
  const afterSecond = size(file);
  store.close();
  return { initial, afterFirst, afterSecond };
}

describe('WAL checkpoints', () => {
  it('copies committed batches into the database file every N batches, not before', () => {
    const every2 = writeTwoBatches(tmp.file('every2.sqlite'), 2);
    expect(every2.afterFirst).toBe(every2.initial); // still only in the WAL
    expect(every2.afterSecond).toBeGreaterThan(every2.initial + 300 * 1000); // checkpointed after batch 2

    const rarely = writeTwoBatches(tmp.file('rarely.sqlite'), 1000);
    expect(rarely.afterSecond).toBe(rarely.initial);
  });

  it('checkpoints on time as well as on count', () => {
    const file = tmp.file('timed.sqlite');
    let t = 0;
    const store = openStore(file, { mode: 'write', now: () => t, checkpointEveryBatches: 1000, checkpointEveryMs: 5_000 });
    const sweep = sweepFixture();
    store.registerSweep(sweep);
    const initial = size(file);
    store.writeResults(manyOutcomes(sweep.sweepId, modelRun({}), 100));
    expect(size(file)).toBe(initial);
    t += 5_000;
    store.writeResults(manyOutcomes(sweep.sweepId, modelRun({}), 100, 100));
    expect(size(file)).toBeGreaterThan(initial + 200 * 1000);
    const report = store.checkpointWal();
    expect(report.busy).toBe(0);
    expect(report.checkpointed).toBe(report.log);
    store.close();
  });
});
