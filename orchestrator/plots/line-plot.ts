/**
 * Line plots: several series against one x axis, linear or logarithmic on either axis, with a legend. A series
 * is broken where a value cannot be shown (not finite, or ≤ 0 on a log axis) instead of drawing through it.
 */
import { dataRange, drawAxes, makeScale, type Frame, type Scale } from './axes.js';
import { seriesColour } from './colours.js';
import { el, polyline, svgDocument, text, uniqueId, type Figure } from './svg.js';
import type { AxisKind } from './ticks.js';

export interface LineSeries {
  readonly label: string;
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  /** Draw a marker at every point (for sparse data such as checkpoints). */
  readonly markers?: boolean;
  readonly dashed?: boolean;
  /** Palette index (default: the series' position), e.g. to draw a limit in its quantity's colour. */
  readonly colour?: number;
}

export interface LinePlot {
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly xAxis?: AxisKind;
  readonly yAxis?: AxisKind;
  readonly series: readonly LineSeries[];
  /** Fixed y range (e.g. [0, 1] for shares); otherwise from the data. */
  readonly yRange?: readonly [number, number];
  /** What to say when no series has a value the axes can show (default "no data to plot"). */
  readonly emptyText?: string;
  readonly width?: number;
  readonly height?: number;
}

const MARGIN = { left: 78, right: 18, top: 34, bottom: 58 } as const;
const LEGEND_ROW = 16;

const values = (a: ArrayLike<number>): Iterable<number> => Array.from(a);

/** Runs of consecutive drawable points, as pixel pairs. */
function runs(s: LineSeries, x: Scale, y: Scale): [number, number][][] {
  const out: [number, number][][] = [];
  let cur: [number, number][] = [];
  for (let k = 0; k < Math.min(s.x.length, s.y.length); k++) {
    const X = x.map(s.x[k]);
    const Y = y.map(s.y[k]);
    if (Number.isFinite(X) && Number.isFinite(Y)) cur.push([X, Y]);
    else if (cur.length > 0) {
      out.push(cur);
      cur = [];
    }
  }
  if (cur.length > 0) out.push(cur);
  return out;
}

export const linePlotSvg = (plot: LinePlot): string => svgDocument(linePlot(plot));

export function linePlot(plot: LinePlot): Figure {
  const width = plot.width ?? 560;
  const height = plot.height ?? 320;
  const xKind = plot.xAxis ?? 'linear';
  const yKind = plot.yAxis ?? 'linear';
  // As many legend columns as the longest label allows (about 7 px per character at 12 px).
  const longest = Math.max(1, ...plot.series.map((s) => s.label.length));
  const columns = Math.max(1, Math.min(3, Math.floor((width - MARGIN.left - MARGIN.right) / (34 + 7 * longest))));
  const legendRows = Math.ceil(plot.series.length / columns);
  const frame: Frame = {
    left: MARGIN.left,
    top: MARGIN.top,
    width: width - MARGIN.left - MARGIN.right,
    height: height - MARGIN.top - MARGIN.bottom - legendRows * LEGEND_ROW,
  };
  const xr = dataRange(xKind, plot.series.flatMap((s) => [...values(s.x)]));
  const yr = plot.yRange !== undefined ? { lo: plot.yRange[0], hi: plot.yRange[1] } : dataRange(yKind, plot.series.flatMap((s) => [...values(s.y)]));
  const title = text(width / 2, 20, plot.title, { 'text-anchor': 'middle', 'font-weight': 'bold', class: 'plot-title' });
  if (xr === undefined || yr === undefined) {
    return { width, height, title: plot.title, body: title + text(width / 2, height / 2, plot.emptyText ?? 'no data to plot', { 'text-anchor': 'middle' }) };
  }
  const x = makeScale(xKind, xr.lo, xr.hi, frame.left, frame.left + frame.width);
  const y = makeScale(yKind, yr.lo, yr.hi, frame.top + frame.height, frame.top, plot.yRange !== undefined);
  const lines: string[] = [];
  plot.series.forEach((s, k) => {
    const colour = seriesColour(s.colour ?? k);
    const dash = s.dashed === true ? '6 3' : undefined;
    const pieces = runs(s, x, y);
    const body = pieces.map((r) => polyline(r, { stroke: colour, 'stroke-width': 1.8, 'stroke-dasharray': dash })).join('');
    const marks = s.markers === true ? pieces.flat().map(([X, Y]) => el('circle', { cx: X, cy: Y, r: 3, fill: colour })).join('') : '';
    lines.push(el('g', { class: 'series' }, body + marks));
  });
  const legendTop = frame.top + frame.height + 60;
  const colWidth = frame.width / columns;
  const legend = plot.series.map((s, k) => {
    const lx = frame.left + (k % columns) * colWidth;
    const ly = legendTop + Math.floor(k / columns) * LEGEND_ROW;
    return (
      el('line', { x1: lx, y1: ly - 4, x2: lx + 22, y2: ly - 4, stroke: seriesColour(s.colour ?? k), 'stroke-width': 2, 'stroke-dasharray': s.dashed === true ? '6 3' : undefined }) +
      text(lx + 28, ly, s.label)
    );
  });
  const clipId = uniqueId('plot-area');
  const clip = el('clipPath', { id: clipId }, el('rect', { x: frame.left, y: frame.top, width: frame.width, height: frame.height }));
  return {
    width,
    height,
    title: plot.title,
    body:
      title +
      el('defs', {}, clip) +
      drawAxes(frame, x, y, plot.xLabel, plot.yLabel) +
      el('g', { 'clip-path': `url(#${clipId})` }, lines.join('')) +
      el('g', { class: 'legend' }, legend.join('')),
  };
}
