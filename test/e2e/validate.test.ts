/**
 * `disksweep validate SPEC --json`: the points, chunks, CPU-time estimate and expected database size of a
 * sweep, from a few calibration models, and nothing written. The size estimate is checked against the real
 * database of the same sweep (within a factor of two: it is an estimate, not a promise).
 */
import { statSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCli } from '../support/cli.js';
import { treeSnapshot } from '../support/file-snapshot.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';

const tmp = useTempDir();

const report = z.object({
  name: z.string(),
  sweep_id: z.string().regex(/^[0-9a-f]{64}$/),
  points: z.number().int(),
  chunk_size: z.number().int().min(1),
  chunks: z.number().int(),
  seconds_per_point: z.number(),
  cpu_seconds: z.number(),
  wall_seconds_estimate: z.number(),
  workers: z.number().int(),
  database_bytes_estimate: z.number().int(),
}).strict();

function validate(spec: string, ...flags: string[]) {
  const before = treeSnapshot(tmp.path);
  const r = runCli(['validate', spec, '--json', ...flags], { cwd: tmp.path });
  expect(r.status, r.stderr).toBe(0);
  expect(treeSnapshot(tmp.path), 'validate wrote a file').toEqual(before);
  return report.parse(JSON.parse(r.stdout));
}

describe('disksweep validate --json', () => {
  it('a sweep with a given chunk size: points, chunks, estimates; the size estimate is near the real size', () => {
    const spec = writeSpec(tmp.path, 'heron-validate.yaml', gridSpec('heron-validate', 20, 10, 7));
    const v = validate(spec, '--workers', '2');
    expect(v).toMatchObject({ name: 'heron-validate', points: 200, chunk_size: 7, chunks: 29, workers: 2 });
    expect(v.seconds_per_point).toBeGreaterThan(0);
    expect(v.cpu_seconds).toBeCloseTo(v.seconds_per_point * 200, 9);
    expect(v.wall_seconds_estimate).toBeCloseTo(v.cpu_seconds / 2, 9);

    const db = tmp.file('heron-validate.sqlite');
    const run = runCli(['run', spec, '--db', db, '--workers', '2', '--json']);
    expect(run.status, run.stderr).toBe(0);
    expect(z.object({ sweep_id: z.string() }).parse(JSON.parse(run.stdout)).sweep_id).toBe(v.sweep_id);
    const real = statSync(db).size;
    expect(v.database_bytes_estimate, `estimate ${v.database_bytes_estimate} B, real ${real} B`).toBeGreaterThan(real / 2);
    expect(v.database_bytes_estimate, `estimate ${v.database_bytes_estimate} B, real ${real} B`).toBeLessThan(real * 2);
  });

  it('a sweep with a target chunk duration: the calibrated chunk size gives the chunk count', () => {
    const spec = writeSpec(tmp.path, 'heron-target.yaml', { ...gridSpec('heron-target', 5, 5, 1), chunks: { target_seconds: 0.5 } });
    const v = validate(spec);
    expect(v.points).toBe(25);
    expect(v.chunks).toBe(Math.ceil(25 / v.chunk_size));
  });
});
