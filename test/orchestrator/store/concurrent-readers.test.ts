/**
 * Readers run while a sweep writes (WAL): a read-mode store, in this process or in another one, sees every
 * committed batch, does not see a transaction in progress, and never waits for the writer.
 */
import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { openStore } from '../../../orchestrator/store/sweep-store.js';
import { manyOutcomes, modelRun, sha256File, sweepFixture } from '../../support/store-fixtures.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();

const DIST_STORE = fileURLToPath(new URL('../../../dist/orchestrator/store/sweep-store.js', import.meta.url));

/** Run a snippet of ESM in a fresh node process with `store` = the built store module. */
function inOtherProcess(code: string): { status: number | null; stdout: string; stderr: string } {
  if (!existsSync(DIST_STORE)) throw new Error(`${DIST_STORE} is missing: run \`npm run build\` before the tests`);
  const script = `const store = await import(${JSON.stringify(pathToFileURL(DIST_STORE).href)});\n${code}`;
  const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('readers beside a writer', () => {
  it('a read-mode connection sees committed batches and not a transaction in progress', () => {
    const file = tmp.file('wal.sqlite');
    const writer = openStore(file, { mode: 'write' });
    writer.acquireLock({ host: 'this-host', pid: process.pid });
    const sweep = sweepFixture();
    writer.registerSweep(sweep);
    const run = modelRun({});
    writer.writeResults(manyOutcomes(sweep.sweepId, run, 200));

    const reader = openStore(file, { mode: 'read' });
    expect(reader.statusCounts(sweep.sweepId).withResult).toBe(200);

    // Another writer connection holds an open write transaction (as the sweep does mid-batch).
    const busy = new Database(file);
    busy.exec('BEGIN IMMEDIATE');
    busy.prepare('DELETE FROM results').run();
    busy.prepare("UPDATE sweeps SET name = 'uncommitted'").run();
    const started = performance.now();
    expect(reader.statusCounts(sweep.sweepId).withResult).toBe(200);
    expect(reader.getSweep(sweep.sweepId)?.name).toBe('test-sweep');
    expect(performance.now() - started).toBeLessThan(2000); // well below the busy timeout: it did not wait
    busy.exec('ROLLBACK');
    busy.close();

    // A later batch from the real writer is visible to the same reader at its next read.
    writer.writeResults(manyOutcomes(sweep.sweepId, run, 100, 200));
    expect(reader.statusCounts(sweep.sweepId).withResult).toBe(300);
    expect(reader.pointIndexesWithResult(sweep.sweepId).reduce((a, b) => a + b, 0)).toBe(300);
    reader.close();
    writer.close();
  });

  it('a reader process sees what the writer committed while the writer holds the database', () => {
    const file = tmp.file('proc.sqlite');
    const writer = openStore(file, { mode: 'write' });
    writer.acquireLock({ host: 'this-host', pid: process.pid });
    const sweep = sweepFixture();
    writer.registerSweep(sweep);
    const batch = manyOutcomes(sweep.sweepId, modelRun({}), 250);
    writer.writeResults(batch);
    const busy = new Database(file);
    busy.exec('BEGIN IMMEDIATE');
    busy.prepare('DELETE FROM results').run();

    const r = inOtherProcess(`
      const s = store.openStore(${JSON.stringify(file)}, { mode: 'read' });
      const counts = s.statusCounts(${JSON.stringify(sweep.sweepId)});
      const one = s.readResult(${JSON.stringify(sweep.sweepId)}, ${JSON.stringify(batch[17].pointId)});
      s.close();
      console.log(JSON.stringify({ counts, one }));
    `);
    busy.exec('ROLLBACK');
    busy.close();
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const seen = JSON.parse(r.stdout) as { counts: { withResult: number }; one: unknown };
    expect(seen.counts.withResult).toBe(250);
    expect(seen.one).toEqual(batch[17]);
    expect(writer.lockOwner()).toMatchObject({ host: 'this-host', pid: process.pid });
    writer.close();
  });

  it('the built store finds its migrations and creates a store another process can use', () => {
    const file = tmp.file('from-dist.sqlite');
    const r = inOtherProcess(`
      const s = store.openStore(${JSON.stringify(file)}, { mode: 'write' });
      console.log(JSON.stringify({ created: s.created, sweeps: s.listSweeps().length }));
      s.close();
    `);
    expect(r.stderr).toBe('');
    expect(JSON.parse(r.stdout)).toEqual({ created: true, sweeps: 0 });
    const hash = sha256File(file);
    const here = openStore(file, { mode: 'write' });
    expect(here.created).toBe(false);
    expect(here.addedColumns).toEqual([]);
    here.close();
    expect(sha256File(file)).toBe(hash); // nothing to migrate, nothing to add: reopening wrote nothing
  });
});
