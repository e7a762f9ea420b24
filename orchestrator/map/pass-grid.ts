/**
 * The pass fraction of a target on a grid of two varied parameters, marginalised over all the others: every
 * selected point falls into one cell by its two values, and a cell's fraction is passing points / points.
 *
 * Bins follow how the sweep sampled each parameter, in log10 for log-sampled ones (`logSpace`):
 * - a grid range (count known, grid plan): one bin per grid value, edges halfway between neighbours;
 * - an explicit list of numbers: one bin per distinct value, the same way;
 * - a choice: one bin per choice (its index);
 * - a range sampled otherwise (Latin hypercube, Sobol, random): `bins` equal bins over the range.
 */
import { DisksweepError } from '../../shared/errors.js';
import { parameterLabel, type Evaluation, type VariedParameter } from '../query/index.js';
import { heatMap } from '../plots/heat-map.js';
import type { Figure } from '../plots/svg.js';
import type { MapGrid } from '../plots/terminal-map.js';
import type { AxisKind } from '../plots/ticks.js';

export interface MapAxis {
  readonly parameter: VariedParameter;
  readonly axis: AxisKind;
  /** Bin edges in parameter units (choices: index ± 0.5), ascending, bins + 1 of them. */
  readonly edges: readonly number[];
  /** The axis label: name and unit. */
  readonly label: string;
  /** For a choice parameter, the name of each bin's choice; null for numbers. */
  readonly categories: readonly string[] | null;
}

export interface PassGrid {
  readonly x: MapAxis;
  readonly y: MapAxis;
  /** Row by row, cell (i, j) at j * nx + i. */
  readonly counts: Uint32Array;
  readonly passes: Uint32Array;
  /** passes / counts, NaN for an empty cell. */
  readonly fractions: Float64Array;
}

export const DEFAULT_BINS = 12;
export const MAX_BINS = 200;

/** Edges halfway between sorted distinct values (in the axis' space), the outer ones half a step beyond. */
export function edgesAround(values: readonly number[], toSpace: (v: number) => number, fromSpace: (u: number) => number): number[] {
  const u = [...new Set(values.map(toSpace))].sort((a, b) => a - b);
  if (u.length === 1) return [fromSpace(u[0] - 0.5), fromSpace(u[0] + 0.5)];
  const mids = u.slice(1).map((v, k) => (u[k] + v) / 2);
  return [fromSpace(u[0] - (mids[0] - u[0])), ...mids.map(fromSpace), fromSpace(u[u.length - 1] + (u[u.length - 1] - mids[mids.length - 1]))];
}

export function mapAxis(p: VariedParameter, bins: number, gridPlan: boolean): MapAxis {
  if (p.kind === 'choice') {
    const categories = (p.values ?? []).map(String);
    return { parameter: p, axis: 'linear', edges: Array.from({ length: categories.length + 1 }, (_, k) => k - 0.5), label: p.name, categories };
  }
  const log = p.logSpace;
  const toSpace = log ? Math.log10 : (v: number) => v;
  const fromSpace = log ? (u: number) => 10 ** u : (u: number) => u;
  const axis: AxisKind = log ? 'log' : 'linear';
  const label = parameterLabel(p);
  if (p.values !== null) return { parameter: p, axis, edges: edgesAround(p.values as number[], toSpace, fromSpace), label, categories: null };
  if (gridPlan && p.count !== null) {
    const n = p.count;
    const [a, b] = [toSpace(p.min), toSpace(p.max)];
    const grid = Array.from({ length: n }, (_, k) => fromSpace(n === 1 ? a : a + ((b - a) * k) / (n - 1)));
    return { parameter: p, axis, edges: edgesAround(grid, toSpace, fromSpace), label, categories: null };
  }
  const [a, b] = [toSpace(p.min), toSpace(p.max)];
  if (!(b > a)) return { parameter: p, axis, edges: edgesAround([p.min], toSpace, fromSpace), label, categories: null };
  return { parameter: p, axis, edges: Array.from({ length: bins + 1 }, (_, k) => fromSpace(a + ((b - a) * k) / bins)), label, categories: null };
}

/**
 * A function giving the bin holding v (edges ascending, in the axis' space), clamped to the outer bins; -1 for
 * NaN. Equal bins (ranges and grids) are found by one division, uneven ones (lists) by bisection.
 */
function binner(edges: Float64Array): (v: number) => number {
  const n = edges.length - 1;
  const a = edges[0];
  const w = (edges[n] - a) / n;
  const uniform = edges.every((e, k) => Math.abs(e - (a + k * w)) <= 1e-9 * Math.abs(w));
  if (uniform) {
    return (v) => {
      if (Number.isNaN(v)) return -1;
      const k = Math.floor((v - a) / w);
      return k < 0 ? 0 : k >= n ? n - 1 : k;
    };
  }
  return (v) => binOf(edges, v);
}

function binOf(edges: Float64Array, v: number): number {
  if (Number.isNaN(v)) return -1;
  let lo = 0;
  let hi = edges.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (v >= edges[mid]) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Count points and passes per cell of `x` by `y` (names of varied parameters of the evaluation). */
export function passGrid(ev: Evaluation, xName: string, yName: string, options: { bins: number; gridPlan: boolean }): PassGrid {
  const find = (name: string, flag: string): number => {
    const k = ev.parameters.findIndex((p) => p.name === name);
    if (k < 0) {
      throw new DisksweepError('input/invalid-flag', `${flag} ${name}: not a parameter sweep ${ev.sweep.name} varies`, {
        details: [`varied: ${ev.parameters.map((p) => p.name).join(', ')}`],
      });
    }
    return k;
  };
  const xi = find(xName, '--x');
  const yi = find(yName, '--y');
  if (xi === yi) throw new DisksweepError('input/invalid-flag', `--x and --y are both ${xName}: a map needs two different parameters`);
  const x = mapAxis(ev.parameters[xi], options.bins, options.gridPlan);
  const y = mapAxis(ev.parameters[yi], options.bins, options.gridPlan);
  const nx = x.edges.length - 1;
  const ny = y.edges.length - 1;
  const counts = new Uint32Array(nx * ny);
  const passes = new Uint32Array(nx * ny);
  const space = (a: MapAxis) => Float64Array.from(a.edges, a.axis === 'log' ? Math.log10 : (v) => v);
  const bx = binner(space(x));
  const by = binner(space(y));
  const vx = ev.values[xi];
  const vy = ev.values[yi];
  const lx = x.axis === 'log';
  const ly = y.axis === 'log';
  for (let k = 0; k < ev.pass.length; k++) {
    const i = bx(lx ? Math.log10(vx[k]) : vx[k]);
    const j = by(ly ? Math.log10(vy[k]) : vy[k]);
    if (i < 0 || j < 0) continue;
    const c = j * nx + i;
    counts[c]++;
    passes[c] += ev.pass[k];
  }
  const fractions = Float64Array.from(counts, (n, c) => (n === 0 ? NaN : passes[c] / n));
  return { x, y, counts, passes, fractions };
}

/** The SVG heat map of a grid (pass fraction, counts in the tooltips, 50 % contour). */
export function gridHeatMap(grid: PassGrid, title: string): Figure {
  return heatMap({
    title, xLabel: grid.x.label, yLabel: grid.y.label, xAxis: grid.x.axis, yAxis: grid.y.axis,
    xEdges: grid.x.edges, yEdges: grid.y.edges, xCategories: grid.x.categories, yCategories: grid.y.categories,
    values: grid.fractions, counts: grid.counts, passes: grid.passes, valueLabel: 'pass fraction',
  });
}

/** The terminal map of a grid. */
export function gridTerminalMap(grid: PassGrid): MapGrid {
  return {
    xLabel: grid.x.label, yLabel: grid.y.label, xAxis: grid.x.axis, yAxis: grid.y.axis, xEdges: grid.x.edges, yEdges: grid.y.edges,
    xCategories: grid.x.categories, yCategories: grid.y.categories, values: grid.fractions,
  };
}
