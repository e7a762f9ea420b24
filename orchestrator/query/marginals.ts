/**
 * Marginal pass fraction of each varied parameter: the selected points binned along one parameter (in log10
 * for log-sampled ones; one bin per value for lists and choices and for grids with few levels), with the
 * Wilson interval of the pass fraction in every bin.
 */
import type { Evaluation, VariedParameter } from './evaluate.js';
import { wilson, type Proportion } from './wilson.js';

/** At most this many distinct values get one bin each; beyond it values are binned by range. */
const MAX_LEVEL_BINS = 24;

export interface MarginalBin extends Proportion {
  /** Bin edges in the parameter's own unit (not log10); for a level bin both are the value. */
  readonly from: number;
  readonly to: number;
  /** The value's label for choice parameters (else null). */
  readonly label: string | null;
}

export interface Marginal {
  readonly parameter: VariedParameter;
  /** 'levels': one bin per sampled value; 'range': equal-width bins (in log10 for log parameters). */
  readonly binning: 'levels' | 'range';
  readonly bins: readonly MarginalBin[];
}

/** The distinct values of a parameter when there are few of them (list, choice, or small grid), else null. */
function levelsOf(p: VariedParameter, column: Float64Array): number[] | null {
  if (p.kind === 'choice') return (p.values ?? []).map((_, i) => i);
  if (p.values !== null && p.values.length <= MAX_LEVEL_BINS) return [...(p.values as number[])].sort((a, b) => a - b);
  if (p.count !== null && p.count <= MAX_LEVEL_BINS) {
    const seen = new Set<number>();
    for (let i = 0; i < column.length && seen.size <= MAX_LEVEL_BINS; i++) seen.add(column[i]);
    if (seen.size <= MAX_LEVEL_BINS) return [...seen].sort((a, b) => a - b);
  }
  return null;
}

/** Marginal of parameter k of an evaluation, with `bins` range bins when the values are not a few levels. */
export function marginal(ev: Evaluation, k: number, bins = 10): Marginal {
  const p = ev.parameters[k];
  const x = ev.values[k];
  const levels = levelsOf(p, x);
  const n = ev.counts.selected;
  if (levels !== null) {
    const index = new Map(levels.map((v, i) => [v, i]));
    const total = new Float64Array(levels.length);
    const pass = new Float64Array(levels.length);
    for (let i = 0; i < n; i++) {
      const b = index.get(x[i]);
      if (b === undefined) continue;
      total[b]++;
      pass[b] += ev.pass[i];
    }
    return {
      parameter: p,
      binning: 'levels',
      bins: levels.map((v, b) => ({ ...wilson(pass[b], total[b]), from: v, to: v, label: p.kind === 'choice' ? String(p.values?.[v]) : null })),
    };
  }
  const f = (v: number) => (p.logSpace ? Math.log10(v) : v);
  const lo = f(p.min);
  const width = (f(p.max) - lo) / bins;
  const total = new Float64Array(bins);
  const pass = new Float64Array(bins);
  for (let i = 0; i < n; i++) {
    const b = Math.min(bins - 1, Math.max(0, Math.floor((f(x[i]) - lo) / width)));
    if (!Number.isFinite(b)) continue;
    total[b]++;
    pass[b] += ev.pass[i];
  }
  const g = (u: number) => (p.logSpace ? 10 ** u : u);
  return {
    parameter: p,
    binning: 'range',
    bins: Array.from({ length: bins }, (_, b) => ({ ...wilson(pass[b], total[b]), from: g(lo + b * width), to: g(lo + (b + 1) * width), label: null })),
  };
}
