/**
 * The figures of a report, from a query answer: one bar chart of the marginal pass fraction per varied
 * parameter (Wilson intervals as error bars, the overall fraction as a reference line), the PRIM peeling
 * trajectory of the best box (density against support, Friedman & Fisher 1999, fig. 3 style), and pass maps
 * for the pairs of parameters that constrain the targets most.
 */
import type { QueryAnswer } from '../query/answer.js';
import type { Marginal } from '../query/marginals.js';
import { parameterLabel, type Evaluation } from '../query/index.js';
import { edgesAround, gridHeatMap, passGrid, type PassGrid } from '../map/pass-grid.js';
import { barChart, type Bar } from '../plots/bar-chart.js';
import { linePlot } from '../plots/line-plot.js';
import type { Figure } from '../plots/svg.js';

export function marginalFigure(m: Marginal, overall: number): Figure {
  const p = m.parameter;
  const log = p.logSpace;
  let edges: number[];
  if (m.binning === 'levels') {
    edges = p.kind === 'choice' ? m.bins.map((_, k) => k - 0.5).concat(m.bins.length - 0.5) : edgesAround(m.bins.map((b) => b.from), log ? Math.log10 : (v) => v, log ? (u) => 10 ** u : (u) => u);
  } else edges = [...m.bins.map((b) => b.from), m.bins[m.bins.length - 1].to];
  const bars: Bar[] = m.bins.map((b, k) => ({
    lo: edges[k], hi: edges[k + 1], n: b.n,
    value: b.n === 0 ? null : b.fraction, errLo: b.n === 0 ? null : b.low, errHi: b.n === 0 ? null : b.high,
  }));
  return barChart({
    title: `pass fraction by ${p.name}`, xLabel: parameterLabel(p), yLabel: 'pass fraction', xAxis: log ? 'log' : 'linear', bars,
    xCategories: p.kind === 'choice' ? (p.values ?? []).map(String) : null,
    reference: Number.isFinite(overall) ? { value: overall, label: 'all selected points' } : undefined,
  });
}

/** Density against support along the peeling trajectory of the best box; the chosen step marked. */
export function trajectoryFigure(a: QueryAnswer): Figure | null {
  const best = a.boxes[0];
  if (best === undefined) return null;
  const t = best.box.trajectory;
  const chosen = t[best.box.chosenStep];
  return linePlot({
    title: 'PRIM peeling trajectory of the best box', xLabel: 'support (share of the points in the box)', yLabel: 'density (pass rate in the box)', xAxis: 'linear', yRange: [0, 1],
    series: [
      { label: 'peeling steps', x: t.map((s) => s.support), y: t.map((s) => s.density) },
      { label: 'chosen box (before pasting)', x: [chosen.support], y: [chosen.density], markers: true },
      { label: 'after pasting', x: [best.box.support], y: [best.box.density], markers: true },
    ],
  });
}

/**
 * Varied parameters ranked by how much they constrain the targets: first by the share of their range the
 * best PRIM box cuts away, then by the spread of their marginal pass fraction (largest minus smallest over
 * bins with points). Returns parameter indexes, most constraining first.
 */
export function rankParameters(a: QueryAnswer): number[] {
  const cut = a.evaluation.parameters.map((_, k) => 1 - (a.boxes[0]?.ranges[k]?.keptShare ?? 1));
  const spread = a.marginals.map((m) => {
    const f = m.bins.filter((b) => b.n > 0).map((b) => b.fraction);
    return f.length === 0 ? 0 : Math.max(...f) - Math.min(...f);
  });
  return a.evaluation.parameters.map((_, k) => k).sort((i, j) => cut[j] - cut[i] || spread[j] - spread[i] || i - j);
}

/** Pairs among the `top` most constraining parameters, most constraining first. */
export function constrainingPairs(a: QueryAnswer, top = 3): [number, number][] {
  const ranked = rankParameters(a).slice(0, top);
  const pairs: [number, number][] = [];
  for (let u = 0; u < ranked.length; u++) for (let v = u + 1; v < ranked.length; v++) pairs.push([ranked[u], ranked[v]]);
  return pairs;
}

export interface MapFigure {
  readonly grid: PassGrid;
  readonly figure: Figure;
}

export function mapFigure(ev: Evaluation, x: number, y: number, bins: number, gridPlan: boolean, title: string): MapFigure {
  const grid = passGrid(ev, ev.parameters[x].name, ev.parameters[y].name, { bins, gridPlan });
  return { grid, figure: gridHeatMap(grid, title) };
}
