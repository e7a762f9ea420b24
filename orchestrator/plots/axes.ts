/**
 * Scales (data value → pixel) and the axes drawn for them: frame, tick marks, tick labels, axis titles and a
 * light grid at the major ticks. Log scales map log10 of the value; values a log axis cannot show (≤ 0, not
 * finite) map to NaN, and the plots leave them out.
 */
import { axisTicks, type AxisKind, type AxisTicks } from './ticks.js';
import { el, text } from './svg.js';

export interface Scale {
  readonly kind: AxisKind;
  readonly min: number;
  readonly max: number;
  /** Pixel range: [start, end] (for y, start is the bottom). */
  readonly from: number;
  readonly to: number;
  readonly ticks: AxisTicks['ticks'];
  map(v: number): number;
}

/** The finite (and, for a log axis, positive) range of some values; undefined when there are none. */
export function dataRange(kind: AxisKind, values: Iterable<number>): { lo: number; hi: number } | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v) || (kind === 'log' && v <= 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? { lo, hi } : undefined;
}

/**
 * A scale from [lo, hi] to pixels [from, to]. `categories` makes it a categorical axis: category k sits at
 * value k and is labelled with its name (a choice parameter, drawn by index).
 */
export function makeScale(kind: AxisKind, lo: number, hi: number, from: number, to: number, tight = false, categories: readonly string[] | null = null): Scale {
  const t = categories === null
    ? axisTicks(kind, lo, hi, tight)
    : { min: lo, max: hi, ticks: categories.map((label, value) => ({ value, label, major: true })) };
  const f = kind === 'log' ? Math.log10 : (v: number) => v;
  const a = f(t.min);
  const b = f(t.max);
  const span = b - a || 1;
  return {
    kind,
    min: t.min,
    max: t.max,
    from,
    to,
    ticks: t.ticks,
    map: (v: number) => (Number.isFinite(v) && (kind === 'linear' || v > 0) ? from + ((f(v) - a) / span) * (to - from) : NaN),
  };
}

/** The plot area inside the margins. */
export interface Frame {
  readonly left: number;
  readonly top: number;
  readonly width: number;
  readonly height: number;
}

const TICK = 5;

/** Frame, grid (light lines at the major ticks, unless `grid: false`), ticks, labels and titles of an x-y plot. */
export function drawAxes(frame: Frame, x: Scale, y: Scale, xLabel: string, yLabel: string, options: { grid?: boolean } = {}): string {
  const grid = options.grid ?? true;
  const { left, top, width, height } = frame;
  const bottom = top + height;
  const right = left + width;
  const parts: string[] = [];
  for (const t of x.ticks) {
    const X = x.map(t.value);
    if (!(X >= left - 0.5 && X <= right + 0.5)) continue;
    if (grid && t.major) parts.push(el('line', { x1: X, y1: top, x2: X, y2: bottom, stroke: '#e5e5e5' }));
    parts.push(el('line', { x1: X, y1: bottom, x2: X, y2: bottom + (t.major ? TICK : TICK / 2), stroke: '#333' }));
    if (t.label !== '') parts.push(text(X, bottom + TICK + 12, t.label, { 'text-anchor': 'middle', class: 'tick' }));
  }
  for (const t of y.ticks) {
    const Y = y.map(t.value);
    if (!(Y >= top - 0.5 && Y <= bottom + 0.5)) continue;
    if (grid && t.major) parts.push(el('line', { x1: left, y1: Y, x2: right, y2: Y, stroke: '#e5e5e5' }));
    parts.push(el('line', { x1: left - (t.major ? TICK : TICK / 2), y1: Y, x2: left, y2: Y, stroke: '#333' }));
    if (t.label !== '') parts.push(text(left - TICK - 3, Y + 4, t.label, { 'text-anchor': 'end', class: 'tick' }));
  }
  parts.push(el('rect', { x: left, y: top, width, height, fill: 'none', stroke: '#333' }));
  parts.push(text(left + width / 2, bottom + TICK + 30, xLabel, { 'text-anchor': 'middle', class: 'axis-title' }));
  const yx = left - 58;
  const yy = top + height / 2;
  parts.push(text(yx, yy, yLabel, { 'text-anchor': 'middle', transform: `rotate(-90 ${yx} ${yy})`, class: 'axis-title' }));
  return el('g', { class: 'axes' }, parts.join(''));
}
