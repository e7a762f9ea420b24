/**
 * What an evaluation of targets adds to an export: a last column `pass` (the point passes every target; empty
 * for a point without an ok result) when there are targets, and, with a --where filter, only the rows of the
 * points it selected. Looked up by point index from a byte per point (10^6 points: 1 MB).
 */
import type { Evaluation } from '../query/index.js';
import type { ExportOptions } from './export-table.js';

/** Per point index: 0 not selected (no ok result, or the filter refused it), 1 fails, 2 passes. */
export function selectionState(ev: Evaluation): Uint8Array {
  const state = new Uint8Array(ev.sweep.nPoints);
  ev.pointIndex.forEach((i, k) => (state[i] = 1 + ev.pass[k]));
  return state;
}

export function targetColumnOptions(ev: Evaluation): Pick<ExportOptions, 'extra' | 'include'> {
  const state = selectionState(ev);
  const include = ev.where === null ? undefined : (i: number) => state[i] !== 0;
  if (ev.targets.length === 0) return { include };
  const targets = ev.targets.map((t) => t.text).join(' and ');
  const description = `passes every target: ${targets}${ev.where === null ? '' : ` (points selected by ${ev.where})`}; empty without an ok result`;
  return {
    include,
    extra: [{ column: { name: 'pass', type: 'bool', unit: null, description, source: 'value' }, valueAt: (i) => (state[i] === 0 ? null : state[i] === 2) }],
  };
}
