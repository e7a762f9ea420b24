/**
 * The same spec run as real processes into separate databases, with one thread and with two, gives the same
 * deterministic outputs row for row (every column of points, results, checkpoints and series except wall_ms,
 * worker_host and finished_at). So does a renamed copy whose chunk size is calibrated instead of given: the
 * sweep id ignores name and chunking, and chunking does not touch results. Running a finished sweep again
 * computes nothing; an edited spec reuses the stored results whose points are unchanged.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCli } from '../support/cli.js';
import { deterministicRows, provenanceByPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();

/** What `run --json` prints. */
const runSummary = z.object({
  sweep_id: z.string(),
  done: z.number(),
  failed: z.number(),
  total: z.number(),
  committed: z.number(),
  interrupted: z.boolean(),
  reused: z.number(),
});

function run(spec: string, db: string, workers: number) {
  const r = runCli(['run', spec, '--db', db, '--workers', String(workers), '--json']);
  expect(r.status, r.stderr).toBe(0);
  return { ...runSummary.parse(JSON.parse(r.stdout)), stderr: r.stderr };
}

describe('determinism across runs and thread counts', () => {
  it('one thread, two threads and a calibrated renamed copy store identical outputs', () => {
    const spec = gridSpec('heron-determinism', 6, 5, 3);
    const file = writeSpec(tmp.path, 'heron.yaml', spec);
    const renamed = writeSpec(tmp.path, 'renamed.yaml', { ...spec, name: 'heron-determinism-copy', chunks: { target_seconds: 0.5 } });

    const one = run(file, tmp.file('one.sqlite'), 1);
    const two = run(file, tmp.file('two.sqlite'), 2);
    const copy = run(renamed, tmp.file('copy.sqlite'), 2);
    expect(one.stderr).toContain('embedded, 1 thread\n');
    expect(two.stderr).toContain('embedded, 2 threads\n');
    expect(copy.stderr).toContain('calibrating the chunk size');
    for (const s of [one, two]) expect(s).toMatchObject({ done: 30, total: 30, committed: 30, failed: 0, interrupted: false });
    // (the calibrated run commits its 3 calibration models before the sweep proper; its summary counts the rest)
    expect(copy).toMatchObject({ done: 30, total: 30, failed: 0, interrupted: false });
    expect(copy.sweep_id).toBe(one.sweep_id);

    const reference = deterministicRows(tmp.file('one.sqlite'));
    // Enough content that an empty or partial database could not pass for equal.
    expect(reference.points).toHaveLength(30);
    expect(reference.results.map((r) => r.status)).toEqual(Array(30).fill('ok'));
    expect(reference.checkpoints).toHaveLength(60);
    expect(reference.series).toHaveLength(30);
    for (const s of reference.series) expect(String(s.data).length).toBeGreaterThan(100);

    expect(deterministicRows(tmp.file('two.sqlite'))).toEqual(reference);
    expect(deterministicRows(tmp.file('copy.sqlite'))).toEqual(reference);
  });

  it('running a finished sweep again computes nothing; an edited spec reuses its unchanged points', () => {
    const base = gridSpec('heron-reuse', 4, 3, 4);
    const spec = { ...base, vary: { ...base.vary, m_disk_msun: { values: [0.01, 0.03, 0.1] } } };
    const db = tmp.file('reuse.sqlite');
    run(writeSpec(tmp.path, 'heron.yaml', spec), db, 2);
    const first = provenanceByPoint(db);
    expect(first.size).toBe(12);

    const again = run(tmp.file('heron.yaml'), db, 2);
    expect(again.stderr).toContain('already holds this sweep: continuing it');
    expect(again).toMatchObject({ done: 12, committed: 0 });
    expect(provenanceByPoint(db)).toEqual(first);

    // Two more disk masses on the same alpha levels: the 4 x 3 models already stored are reused, 4 x 2 are new.
    const edited = { ...spec, name: 'heron-reuse-wider', vary: { ...spec.vary, m_disk_msun: { values: [0.01, 0.03, 0.1, 0.3, 1] } } };
    const wider = run(writeSpec(tmp.path, 'wider.yaml', edited), db, 2);
    expect(wider.sweep_id).not.toBe(again.sweep_id);
    expect(wider.stderr).toMatch(/reused 12 results of sweep heron-reuse \([0-9a-f]{12}\) with matching point ids/);
    expect(wider).toMatchObject({ total: 20, done: 20, reused: 12, committed: 8 });
  });
});
