/**
 * Bars over bins of a numeric axis (linear or logarithmic), each with an error bar: the marginal pass fraction
 * of a target per bin of one parameter with its confidence interval. A bin without points gets no bar and an
 * "n = 0" mark, so an empty bin is not mistaken for a fraction of zero.
 */
import { drawAxes, makeScale, type Frame } from './axes.js';
import { seriesColour } from './colours.js';
import { el, escapeXml, svgDocument, text, type Figure } from './svg.js';
import { formatNumber, type AxisKind } from './ticks.js';

export interface Bar {
  /** Bin edges on the x axis. */
  readonly lo: number;
  readonly hi: number;
  /** Bar height; null for an empty bin. */
  readonly value: number | null;
  /** Error bar; omitted when null. */
  readonly errLo: number | null;
  readonly errHi: number | null;
  /** Points in the bin (shown in the tooltip). */
  readonly n: number;
}

export interface BarChart {
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly xAxis: AxisKind;
  /** Bar k is category k (a choice parameter): the axis is labelled with these names. */
  readonly xCategories?: readonly string[] | null;
  readonly bars: readonly Bar[];
  /** Default [0, 1]. */
  readonly yRange?: readonly [number, number];
  /** A dashed horizontal reference line (e.g. the overall pass fraction). */
  readonly reference?: { readonly value: number; readonly label: string };
  readonly width?: number;
  readonly height?: number;
}

const MARGIN = { left: 78, right: 18, top: 34, bottom: 56 } as const;

export const barChartSvg = (chart: BarChart): string => svgDocument(barChart(chart));

export function barChart(chart: BarChart): Figure {
  const width = chart.width ?? 420;
  const height = chart.height ?? 280;
  const frame: Frame = { left: MARGIN.left, top: MARGIN.top, width: width - MARGIN.left - MARGIN.right, height: height - MARGIN.top - MARGIN.bottom };
  const [y0, y1] = chart.yRange ?? [0, 1];
  const title = text(width / 2, 20, chart.title, { 'text-anchor': 'middle', 'font-weight': 'bold', class: 'plot-title' });
  if (chart.bars.length === 0) return { width, height, title: chart.title, body: title + text(width / 2, height / 2, 'no data to plot', { 'text-anchor': 'middle' }) };
  const lo = Math.min(...chart.bars.map((b) => b.lo));
  const hi = Math.max(...chart.bars.map((b) => b.hi));
  const x = makeScale(chart.xAxis, lo, hi, frame.left, frame.left + frame.width, true, chart.xCategories ?? null);
  const y = makeScale('linear', y0, y1, frame.top + frame.height, frame.top, true);
  const colour = seriesColour(0);
  const parts = chart.bars.map((b, k) => {
    const left = x.map(b.lo) + 1;
    const right = x.map(b.hi) - 1;
    const mid = (left + right) / 2;
    const tip = `${chart.xLabel} ${chart.xCategories?.[k] ?? `${formatNumber(b.lo)} – ${formatNumber(b.hi)}`}: ` +
      (b.value === null ? 'no points' : `${formatNumber(b.value)} (n = ${b.n})` + (b.errLo !== null && b.errHi !== null ? `, interval ${formatNumber(b.errLo)} – ${formatNumber(b.errHi)}` : ''));
    if (b.value === null) {
      return el('g', { class: 'bar empty' }, el('title', {}, escapeXml(tip)) + text(mid, y.map(y0) - 4, 'n=0', { 'text-anchor': 'middle', 'font-size': 9, fill: '#777' }));
    }
    let g = el('rect', { x: left, y: y.map(b.value), width: Math.max(0.5, right - left), height: Math.max(0, y.map(y0) - y.map(b.value)), fill: colour, 'fill-opacity': 0.75 });
    if (b.errLo !== null && b.errHi !== null) {
      const a = y.map(b.errLo);
      const c = y.map(b.errHi);
      const cap = Math.min(6, (right - left) / 4);
      g += el('path', { d: `M${mid} ${a}V${c}M${mid - cap} ${a}H${mid + cap}M${mid - cap} ${c}H${mid + cap}`, stroke: '#111', 'stroke-width': 1.3, fill: 'none' });
    }
    return el('g', { class: 'bar' }, el('title', {}, escapeXml(tip)) + g);
  });
  let ref = '';
  if (chart.reference !== undefined) {
    const ry = y.map(chart.reference.value);
    ref = el('line', { x1: frame.left, y1: ry, x2: frame.left + frame.width, y2: ry, stroke: seriesColour(1), 'stroke-dasharray': '6 3', 'stroke-width': 1.5 }) +
      text(frame.left + frame.width - 4, ry - 4, chart.reference.label, { 'text-anchor': 'end', 'font-size': 10, fill: seriesColour(1) });
  }
  return { width, height, title: chart.title, body: title + drawAxes(frame, x, y, chart.xLabel, chart.yLabel) + el('g', { class: 'bars' }, parts.join('')) + ref };
}
