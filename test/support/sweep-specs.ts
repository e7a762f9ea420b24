/**
 * Sweep specs for tests, in invented scenarios (the "Heron Reach" cloud, the made-up TERN survey), with model
 * settings small enough that one model runs in milliseconds.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { stringify } from 'yaml';

/** 40 cells, 0.2 Myr of a ready-made disk: a few ms per model. */
export const TINY_MODEL = { n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] } as const;
export const TINY_FIXED = { initial_state: 'disk' } as const;

/** A spec as an object (what the YAML file will hold). */
export type SpecObject = Record<string, unknown>;

/** The shape gridSpec returns, typed so tests can derive edited copies. */
export type GridSpec = {
  name: string;
  description: string;
  model: Record<string, unknown>;
  fixed: Record<string, unknown>;
  vary: Record<string, Record<string, unknown>>;
  sampling: Record<string, unknown>;
  chunks: Record<string, unknown>;
};

/**
 * A grid of `b` x `a` tiny disk models over m_disk_msun (slowest) and alpha_active, `chunk` points per chunk.
 * The varied names are deliberately not in alphabetical order: the point order follows the spec, and anything
 * that sorts keys on the way (canonical JSON, a stored spec read back) must not change it.
 */
export function gridSpec(name: string, a: number, b: number, chunk: number): GridSpec {
  return {
    name,
    description: 'Heron Reach disks from the TERN survey (invented), a tiny test grid',
    model: { ...TINY_MODEL },
    fixed: { ...TINY_FIXED },
    vary: {
      m_disk_msun: { log: [0.01, 0.1], count: b },
      alpha_active: { log: [1e-3, 1e-1], count: a },
    },
    sampling: { plan: 'grid' },
    chunks: { size: chunk },
  };
}

/** Write a spec as YAML (or JSON for a .json name) into `dir`; returns its path. */
export function writeSpec(dir: string, fileName: string, spec: SpecObject): string {
  const path = join(dir, fileName);
  writeFileSync(path, fileName.endsWith('.json') ? JSON.stringify(spec, null, 2) : stringify(spec));
  return path;
}
