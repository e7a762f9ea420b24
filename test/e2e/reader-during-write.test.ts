/**
 * Readers beside a running sweep (WAL): while `disksweep run` writes, another process (`disksweep status`)
 * and a read-only connection in this process read the database over and over. Every read succeeds, the counts
 * only grow, and the reads land in the middle of the sweep (the sweep is stopped with Ctrl-C once they have).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCliAsync, startCli, stopCli, type CliProcess } from '../support/cli.js';
import { resultCount, resultsPerPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();
const started: CliProcess[] = [];

afterEach(async () => {
  for (const p of started.splice(0)) await stopCli(p);
});

const statusReport = z.object({ points: z.number(), with_result: z.number(), remaining: z.number(), by_status: z.record(z.string(), z.number()) });

const nonDecreasing = (xs: readonly number[]): boolean => xs.every((x, i) => i === 0 || x >= xs[i - 1]);

describe('reading while a sweep writes', () => {
  it('status in another process and a read-only connection see counts that only grow, and never fail', async () => {
    // 4000 tiny models: longer than the reads take, however busy the machine; stopped with Ctrl-C after them.
    const TOTAL = 4000;
    const spec = writeSpec(tmp.path, 'heron-readers.yaml', gridSpec('heron-readers', 40, 100, 8));
    const db = tmp.file('readers.sqlite');
    const writer = startCli(['run', spec, '--db', db, '--workers', '2']);
    started.push(writer);
    // The line is printed once the sweep is registered: from here on every read must succeed.
    await writer.waitForStderr(/^running heron-readers: 4000 points/m);

    const fromStatus: number[] = [];
    const fromConnection: number[] = [];
    const read = async (): Promise<void> => {
      const r = await runCliAsync(['status', '--db', db, '--json']);
      expect(r.status, r.stderr).toBe(0);
      const report = statusReport.parse(JSON.parse(r.stdout));
      expect(report.points).toBe(TOTAL);
      expect(Object.values(report.by_status).reduce((a, b) => a + b, 0)).toBe(report.with_result);
      expect(report.remaining).toBe(TOTAL - report.with_result);
      fromStatus.push(report.with_result);
      fromConnection.push(resultCount(db));
    };
    const midSweep = () => fromStatus.filter((n) => n > 0 && n < TOTAL).length;
    while (!writer.done && midSweep() < 3) await read();
    expect(writer.done, `the sweep ended after ${fromStatus.length} reads: make it bigger`).toBe(false);

    writer.child.kill('SIGINT');
    const end = await writer.exited;
    expect(end.status, end.stderr).toBe(130);
    await read(); // after the writer: the final count, which no earlier read may exceed

    expect(nonDecreasing(fromStatus), fromStatus.join(' ')).toBe(true);
    expect(nonDecreasing(fromConnection), fromConnection.join(' ')).toBe(true);
    expect(new Set(fromStatus).size, `the counts did not move: ${fromStatus.join(' ')}`).toBeGreaterThan(1);
    const stored = resultsPerPoint(db);
    expect(stored.maxPerPoint).toBe(1);
    expect(fromStatus.at(-1)).toBe(stored.results);
  });
});
