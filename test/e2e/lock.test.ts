/**
 * One sweep process per database: while `disksweep run` is active, a second `run` or a `resume` on the same
 * database exits 1 and names the owner's host and pid, and the first run goes on undisturbed.
 */
import { hostname } from 'node:os';
import { afterEach, describe, expect, it } from 'vitest';
import { runCliAsync, startCli, stopCli, type CliProcess } from '../support/cli.js';
import { lockRows, resultsPerPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();
const started: CliProcess[] = [];

afterEach(async () => {
  for (const p of started.splice(0)) await stopCli(p);
});

describe('the sweep lock across processes', () => {
  it('a second run or resume while one is active exits 1 naming host and pid', async () => {
    // 8000 tiny models: far longer than the checks take, however busy the machine; stopped with Ctrl-C after.
    const spec = writeSpec(tmp.path, 'heron-lock.yaml', gridSpec('heron-lock', 80, 100, 8));
    const db = tmp.file('lock.sqlite');
    const owner = startCli(['run', spec, '--db', db, '--workers', '2']);
    started.push(owner);
    await owner.waitForStderr(/^running heron-lock: 8000 points/m);
    expect(lockRows(db)).toEqual([{ scope: '*', host: hostname(), pid: owner.pid }]);

    for (const args of [['run', spec, '--db', db], ['resume', '--db', db]]) {
      const second = await runCliAsync(args);
      expect(owner.done, `the first run ended before \`${args.join(' ')}\` tried: make the sweep bigger`).toBe(false);
      expect(second.status, second.stderr).toBe(1);
      expect(second.stderr).toContain('[store/locked]');
      expect(second.stderr).toContain(`host ${hostname()}, pid ${owner.pid}`);
      expect(second.stdout).toBe('');
    }

    // The owner was not disturbed: it stops cleanly on Ctrl-C, releases the lock, one result per point.
    owner.child.kill('SIGINT');
    const end = await owner.exited;
    expect(end.status, end.stderr).toBe(130);
    const stored = resultsPerPoint(db);
    expect(stored.maxPerPoint).toBe(1);
    expect(stored.results).toBeGreaterThan(0);
    expect(lockRows(db)).toEqual([]);
  });
});
