/**
 * A 2-D heat map of a fraction in [0, 1] (the pass fraction of a target on a grid of two parameters), with a
 * colour legend, cells without points shown apart, each cell's counts as a tooltip, and contour lines (the
 * 50 % level by default) by marching squares through the cell centres.
 */
import { drawAxes, makeScale, type Frame } from './axes.js';
import { NO_DATA_FILL, viridis } from './colours.js';
import { marchingSquares } from './contour.js';
import { el, escapeXml, polyline, svgDocument, text, type Figure } from './svg.js';
import type { MapGrid } from './terminal-map.js';
import { formatNumber } from './ticks.js';

export interface HeatMap extends MapGrid {
  readonly title: string;
  /** Points per cell and passing points per cell, for the tooltips. */
  readonly counts: ArrayLike<number>;
  readonly passes: ArrayLike<number>;
  readonly valueLabel: string;
  /** Contour levels (default [0.5]). */
  readonly levels?: readonly number[];
  readonly width?: number;
  readonly height?: number;
}

const MARGIN = { left: 78, right: 96, top: 34, bottom: 52 } as const;

export const heatMapSvg = (map: HeatMap): string => svgDocument(heatMap(map));

export function heatMap(map: HeatMap): Figure {
  const nx = map.xEdges.length - 1;
  const ny = map.yEdges.length - 1;
  if (nx < 1 || ny < 1 || map.values.length !== nx * ny) {
    throw new RangeError(`heat map: ${map.values.length} values for ${nx} x ${ny} cells`);
  }
  const width = map.width ?? 560;
  const height = map.height ?? 440;
  const frame: Frame = { left: MARGIN.left, top: MARGIN.top, width: width - MARGIN.left - MARGIN.right, height: height - MARGIN.top - MARGIN.bottom };
  const x = makeScale(map.xAxis, map.xEdges[0], map.xEdges[nx], frame.left, frame.left + frame.width, true, map.xCategories ?? null);
  const y = makeScale(map.yAxis, map.yEdges[0], map.yEdges[ny], frame.top + frame.height, frame.top, true, map.yCategories ?? null);
  const X = map.xEdges.map((e) => x.map(e));
  const Y = map.yEdges.map((e) => y.map(e));

  const cells: string[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      const f = map.values[k];
      const range = (edges: readonly number[], cats: readonly string[] | null | undefined, k: number) =>
        cats?.[k] ?? `${formatNumber(edges[k])} – ${formatNumber(edges[k + 1])}`;
      const tip =
        `${map.xLabel} ${range(map.xEdges, map.xCategories, i)}, ${map.yLabel} ${range(map.yEdges, map.yCategories, j)}: ` +
        (Number.isFinite(f) ? `${map.passes[k]} of ${map.counts[k]} pass (${(100 * f).toFixed(0)} %)` : 'no points');
      cells.push(
        el(
          'rect',
          { x: X[i], y: Y[j + 1], width: X[i + 1] - X[i], height: Y[j] - Y[j + 1], fill: Number.isFinite(f) ? viridis(f) : NO_DATA_FILL },
          el('title', {}, escapeXml(tip)),
        ),
      );
    }
  }

  // Contours through the cell centres: index coordinate u maps linearly between neighbouring centres.
  const centre = (edges: readonly number[], u: number): number => {
    const c = (k: number) => (edges[k] + edges[k + 1]) / 2;
    const n = edges.length - 1;
    if (n === 1) return c(0);
    const k = Math.min(n - 2, Math.max(0, Math.floor(u)));
    return c(k) + (u - k) * (c(k + 1) - c(k));
  };
  const contours = (map.levels ?? [0.5]).flatMap((level) =>
    marchingSquares({ nx, ny, values: map.values }, level).map((line) =>
      polyline(line.map(([u, v]) => [centre(X, u), centre(Y, v)] as [number, number]), { stroke: 'white', 'stroke-width': 2.5, class: 'contour' }) +
      polyline(line.map(([u, v]) => [centre(X, u), centre(Y, v)] as [number, number]), { stroke: '#111', 'stroke-width': 1.2, 'stroke-dasharray': '5 3' }),
    ),
  );

  return {
    width,
    height,
    title: map.title,
    body:
      text(width / 2, 20, map.title, { 'text-anchor': 'middle', 'font-weight': 'bold', class: 'plot-title' }) +
      el('g', { class: 'cells', 'shape-rendering': 'crispEdges' }, cells.join('')) +
      el('g', { class: 'contours' }, contours.join('')) +
      drawAxes(frame, x, y, map.xLabel, map.yLabel, { grid: false }) +
      colourLegend(frame.left + frame.width + 22, frame.top, frame.height, map.valueLabel, map.levels ?? [0.5]),
  };
}

/** A vertical colour bar from 0 (bottom) to 1 (top), the contour levels marked, and the no-data swatch. */
function colourLegend(left: number, top: number, height: number, label: string, levels: readonly number[]): string {
  const barH = height - 40;
  const steps = 64;
  const parts: string[] = [];
  for (let s = 0; s < steps; s++) {
    const y0 = top + barH * (1 - (s + 1) / steps);
    parts.push(el('rect', { x: left, y: y0, width: 16, height: barH / steps + 0.5, fill: viridis((s + 0.5) / steps) }));
  }
  parts.push(el('rect', { x: left, y: top, width: 16, height: barH, fill: 'none', stroke: '#333' }));
  for (const t of [0, 0.25, 0.5, 0.75, 1]) {
    const yy = top + barH * (1 - t);
    parts.push(el('line', { x1: left + 16, y1: yy, x2: left + 20, y2: yy, stroke: '#333' }));
    parts.push(text(left + 23, yy + 4, formatNumber(t)));
  }
  for (const l of levels) {
    const yy = top + barH * (1 - l);
    parts.push(el('line', { x1: left - 3, y1: yy, x2: left + 19, y2: yy, stroke: '#111', 'stroke-width': 1.5, 'stroke-dasharray': '4 2' }));
  }
  parts.push(el('rect', { x: left, y: top + barH + 12, width: 16, height: 12, fill: NO_DATA_FILL, stroke: '#333' }));
  parts.push(text(left + 20, top + barH + 22, 'no points', { 'font-size': 10 }));
  const lx = left + 62;
  const ly = top + barH / 2;
  parts.push(text(lx, ly, label, { 'text-anchor': 'middle', transform: `rotate(90 ${lx} ${ly})` }));
  return el('g', { class: 'colour-legend' }, parts.join(''));
}
