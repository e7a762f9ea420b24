/**
 * The solar-like split re-evaluated from a stored time series, for thresholds other than those a model ran
 * with: the first sample at or after the end of infall where M_* / (M_* + M_disk) >= f_M and
 * J_spin/(J_spin + J_disk) <= f_J (the rule worker/model.ts applies at every step; DESIGN.md §4).
 *
 * The series is sampled (n_series samples up to t_end), the model checks every step: for the thresholds the
 * model ran with, the sample found here is the first sample at or after the recorded first passage, so the two
 * agree within one sample interval when the split keeps holding once reached (test/orchestrator/query).
 * Values are float32 (as stored); thresholds and the infall end are rounded to float32 for the comparison, so
 * a sample equal to a threshold in the stored precision counts as reaching it.
 */
import type Database from 'better-sqlite3';
import { SPLIT_FUNCTION } from './compile-sql.js';

/** Column layouts seen so far (the JSON text of `series_rows.columns`) -> column indexes used here. */
const layouts = new Map<string, { width: number; t: number; mass: number; spin: number } | null>();

function layoutOf(columnsJson: string): { width: number; t: number; mass: number; spin: number } | null {
  let hit = layouts.get(columnsJson);
  if (hit === undefined) {
    let cols: unknown;
    try {
      cols = JSON.parse(columnsJson);
    } catch {
      cols = null;
    }
    const list = Array.isArray(cols) ? cols.map(String) : [];
    const [t, mass, spin] = ['t_myr', 'star_mass_share', 'spin_j_share'].map((c) => list.indexOf(c));
    hit = t < 0 || mass < 0 || spin < 0 ? null : { width: list.length, t, mass, spin };
    if (layouts.size < 64) layouts.set(columnsJson, hit);
  }
  return hit;
}

/**
 * First series time (Myr) at or after `tFromMyr` where the split holds, or null (never, or no usable series).
 * @param columnsJson `series_rows.columns`
 * @param nSamples `series_rows.n_samples`
 * @param data `series_rows.data`: n_samples x columns float32 little-endian, row-major
 * @param fMass least star share of the mass, (0, 1]
 * @param fJ largest spin share of the angular momentum, (0, 1]
 * @param tFromMyr end of infall (null: a model started as a disk, no infall)
 */
export function firstSplitFromSeries(columnsJson: string, nSamples: number, data: Uint8Array, fMass: number, fJ: number, tFromMyr: number | null): number | null {
  const layout = layoutOf(columnsJson);
  if (layout === null || data.byteLength < nSamples * layout.width * 4) return null;
  const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
  const from = tFromMyr === null ? -Infinity : Math.fround(tFromMyr);
  const fm = Math.fround(fMass);
  const fj = Math.fround(fJ);
  for (let r = 0; r < nSamples; r++) {
    const row = r * layout.width * 4;
    const t = view.getFloat32(row + layout.t * 4, true);
    if (t < from) continue;
    if (view.getFloat32(row + layout.mass * 4, true) >= fm && view.getFloat32(row + layout.spin * 4, true) <= fj) return t;
  }
  return null;
}

/** Make `disksweep_split_myr(columns, n_samples, data, f_m, f_j, t_from)` callable in SQL on this connection. */
export function registerSplitFunction(db: Database.Database): void {
  db.function(SPLIT_FUNCTION, { deterministic: true }, (columns: unknown, n: unknown, data: unknown, fm: unknown, fj: unknown, from: unknown) => {
    if (typeof columns !== 'string' || typeof n !== 'number' || !(data instanceof Uint8Array) || typeof fm !== 'number' || typeof fj !== 'number') return null;
    return firstSplitFromSeries(columns, n, data, fm, fj, typeof from === 'number' ? from : null);
  });
}
