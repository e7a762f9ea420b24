/**
 * The SVG plots as documents: well-formed XML, text from data escaped (a label that looks like markup stays
 * text), log axes placing decades evenly, series broken where a log axis cannot show a value, heat-map cells
 * and contours where they belong, bars with error bars, and PNG rendering with visible text.
 */
import { describe, expect, it } from 'vitest';
import { barChartSvg } from '../../../orchestrator/plots/bar-chart.js';
import { heatMapSvg } from '../../../orchestrator/plots/heat-map.js';
import { linePlotSvg } from '../../../orchestrator/plots/line-plot.js';
import { svgToPng } from '../../../orchestrator/plots/png.js';
import { escapeXml } from '../../../orchestrator/plots/svg.js';
import { renderTerminalMap, shadeOf } from '../../../orchestrator/plots/terminal-map.js';
import { allElements, parseXml, textOf, type XmlElement } from '../../support/xml-tree.js';

const HOSTILE = '<script>alert(1)</script> & "q" \'a\'';

const byClass = (root: XmlElement, cls: string) => allElements(root).filter((e) => e.attrs.class === cls);
const named = (root: XmlElement, name: string) => allElements(root).filter((e) => e.name === name);

describe('escaping', () => {
  it('turns markup characters into entities and drops characters XML forbids', () => {
    expect(escapeXml(HOSTILE)).toBe('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;q&quot; &#39;a&#39;');
    expect(escapeXml('a\u0000b\u0007')).toBe('a\uFFFDb\uFFFD');
  });
});

describe('line plot', () => {
  const t = [0.01, 0.1, 1, 10];
  const svg = linePlotSvg({
    title: HOSTILE,
    xLabel: 't [Myr]',
    yLabel: `y ${HOSTILE}`,
    xAxis: 'log',
    yAxis: 'log',
    series: [
      { label: HOSTILE, x: t, y: [1e-8, 1e-7, 1e-6, 1e-5] },
      { label: 'with a gap', x: t, y: [1e-8, 0, 1e-6, 1e-5] },
    ],
  });
  const root = parseXml(svg);

  it('is a well-formed SVG whose hostile texts are text nodes, with no script element', () => {
    expect(root.name).toBe('svg');
    expect(named(root, 'script')).toHaveLength(0);
    expect(textOf(named(root, 'title')[0])).toBe(HOSTILE);
    expect(named(root, 'text').map(textOf)).toContain(HOSTILE);
    expect(named(root, 'text').map(textOf)).toContain(`y ${HOSTILE}`);
  });

  it('places decades evenly on log axes, labelled', () => {
    // x tick labels are centred under their tick, y tick labels end left of theirs.
    const labels = byClass(root, 'tick').map((e) => ({ label: textOf(e), x: Number(e.attrs.x), y: Number(e.attrs.y), xAxis: e.attrs['text-anchor'] === 'middle' }));
    const xTicks = ['0.01', '0.1', '1', '10'].map((l) => labels.find((k) => k.label === l && k.xAxis));
    for (const k of xTicks) expect(k).toBeDefined();
    const gaps = xTicks.slice(1).map((k, i) => k!.x - xTicks[i]!.x);
    for (const g of gaps) expect(g).toBeCloseTo(gaps[0], 1);
    const yDecades = ['1e-8', '1e-7', '1e-6', '1e-5'].map((l) => labels.find((k) => k.label === l && !k.xAxis));
    for (const k of yDecades) expect(k).toBeDefined();
    // Higher values are higher up (smaller y).
    expect(yDecades[3]!.y).toBeLessThan(yDecades[0]!.y);
  });

  it('breaks a series where a log axis cannot show the value', () => {
    const groups = byClass(root, 'series');
    expect(groups).toHaveLength(2);
    expect(named(groups[0], 'polyline')).toHaveLength(1);
    const pieces = named(groups[1], 'polyline');
    expect(pieces).toHaveLength(2);
    expect(pieces[0].attrs.points.split(' ')).toHaveLength(1);
  });

  it('says so when nothing can be plotted', () => {
    const empty = parseXml(linePlotSvg({ title: 't', xLabel: 'x', yLabel: 'y', yAxis: 'log', series: [{ label: 'a', x: [1, 2], y: [0, -1] }] }));
    expect(named(empty, 'text').map(textOf)).toContain('no data to plot');
  });
});

describe('heat map', () => {
  // 4 x 3 cells on a log x axis; one cell without points.
  const xEdges = [1e-3, 1e-2, 1e-1, 1, 10];
  const yEdges = [0, 1, 2, 3];
  const values = [0, 0.2, 0.6, 1, 0, 0.4, 0.8, 1, 0, NaN, 0.9, 1];
  const counts = values.map((v) => (Number.isNaN(v) ? 0 : 10));
  const passes = values.map((v) => (Number.isNaN(v) ? 0 : Math.round(v * 10)));
  const svg = heatMapSvg({ title: HOSTILE, xLabel: 'alpha', yLabel: 'm_core_msun', xAxis: 'log', yAxis: 'linear', xEdges, yEdges, values, counts, passes, valueLabel: 'pass fraction' });
  const root = parseXml(svg);

  it('draws one cell per bin, equal widths on the log axis, with its counts as a tooltip', () => {
    const cells = named(byClass(root, 'cells')[0], 'rect');
    expect(cells).toHaveLength(12);
    const widths = cells.slice(0, 4).map((c) => Number(c.attrs.width));
    for (const w of widths) expect(w).toBeCloseTo(widths[0], 1);
    expect(textOf(cells[2])).toContain('6 of 10 pass (60 %)');
    expect(textOf(cells[9])).toContain('no points');
    expect(cells[9].attrs.fill).toBe('#d9d9d9');
    expect(cells[0].attrs.fill).toBe('#440154'); // viridis(0)
    expect(cells[3].attrs.fill).toBe('#fde725'); // viridis(1)
  });

  it('draws the 50 % contour between the cells below and above one half', () => {
    const contours = byClass(root, 'contour');
    expect(contours.length).toBeGreaterThanOrEqual(1);
    const cells = named(byClass(root, 'cells')[0], 'rect');
    const colLeft = (i: number) => Number(cells[i].attrs.x);
    const colRight = (i: number) => Number(cells[i].attrs.x) + Number(cells[i].attrs.width);
    // Row 0: 0.2 (column 1) -> 0.6 (column 2): the crossing lies between the centres of columns 1 and 2.
    const pts = contours[0].attrs.points.split(' ').map((p) => p.split(',').map(Number));
    for (const [x] of pts) {
      expect(x).toBeGreaterThan((colLeft(1) + colRight(1)) / 2 - 1);
      expect(x).toBeLessThan((colLeft(2) + colRight(2)) / 2 + 1);
    }
    expect(textOf(root)).toContain('no points');
    expect(named(root, 'script')).toHaveLength(0);
    expect(textOf(named(root, 'title')[0])).toBe(HOSTILE);
  });
});

describe('bar chart', () => {
  const svg = barChartSvg({
    title: 'pass fraction by alpha_active',
    xLabel: 'alpha_active',
    yLabel: 'pass fraction',
    xAxis: 'log',
    bars: [
      { lo: 1e-4, hi: 1e-3, value: 0.25, errLo: 0.1, errHi: 0.45, n: 20 },
      { lo: 1e-3, hi: 1e-2, value: null, errLo: null, errHi: null, n: 0 },
      { lo: 1e-2, hi: 1e-1, value: 0.75, errLo: 0.55, errHi: 0.9, n: 20 },
    ],
    reference: { value: 0.5, label: 'all points' },
  });
  const root = parseXml(svg);

  it('draws bars of the right heights, error bars, and marks an empty bin', () => {
    const bars = byClass(root, 'bar');
    expect(bars).toHaveLength(2);
    const rects = bars.map((b) => named(b, 'rect')[0]);
    const h = rects.map((r) => Number(r.attrs.height));
    expect(h[1] / h[0]).toBeCloseTo(3, 1);
    for (const b of bars) expect(named(b, 'path')).toHaveLength(1);
    expect(textOf(byClass(root, 'bar empty')[0])).toContain('n=0');
    expect(textOf(bars[0])).toContain('interval 0.1 – 0.45');
  });
});

describe('PNG', () => {
  it('renders the SVG with its text (fonts found)', () => {
    const png = svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="120" height="40"><text x="5" y="28" font-size="24" font-family="DejaVu Sans">Ṁ 1e-8</text></svg>', 1);
    expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
    const blank = svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="120" height="40"></svg>', 1);
    // The same image without text compresses to fewer bytes; with no font, resvg silently draws no text.
    expect(png.length).toBeGreaterThan(blank.length + 100);
  });

  it('renders a whole plot at twice its size', () => {
    const png = svgToPng(linePlotSvg({ title: 'a', xLabel: 'x', yLabel: 'y', series: [{ label: 's', x: [0, 1], y: [0, 1] }] }));
    expect(png.readUInt32BE(16)).toBe(1120); // IHDR width
  });
});

describe('terminal map', () => {
  const grid = (nx: number) => ({
    xLabel: 'alpha_active', yLabel: 'm_core_msun', xAxis: 'log' as const, yAxis: 'linear' as const,
    xEdges: Array.from({ length: nx + 1 }, (_, i) => 10 ** (-4 + (3 * i) / nx)), yEdges: [0, 1, 2],
    values: Array.from({ length: 2 * nx }, (_, k) => (k === 0 ? NaN : (k % nx) / nx)),
  });

  it('shades by fraction with the 50 % level between ▒ and ▓, marks empty cells, and has a legend', () => {
    const text = renderTerminalMap(grid(4));
    const rows = text.split('\n').filter((l) => l.includes('|') && !l.includes('+'));
    expect(rows).toHaveLength(2);
    // Bottom row (j = 0): NaN, 0.25, 0.5, 0.75 -> '·', '░', '▓', '█', two columns each.
    expect(rows[1]).toContain('|··░░▓▓██|');
    expect(rows[0]).toContain('|  ░░▓▓██|');
    expect(text).toContain('[··] no points');
    expect(text).toContain('alpha_active (log)');
    expect(shadeOf(0.4999)).toBe('▒');
    expect(shadeOf(0.5)).toBe('▓');
  });

  it('uses one column per cell past 40 cells', () => {
    const rows = renderTerminalMap(grid(60)).split('\n').filter((l) => l.includes('|') && !l.includes('+'));
    expect(rows[0].split('|')[1]).toHaveLength(60);
  });
});
