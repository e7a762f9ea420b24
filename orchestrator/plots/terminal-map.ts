/**
 * A pass-fraction map for the terminal: one block character per cell (two columns wide, so cells come out
 * roughly square; one past 40 cells), darker for higher fractions, with the axis ranges and a legend. The 50 % level is a shade
 * boundary (▒ below, ▓ at or above), so the contour shows as the edge between those two shades.
 */
import { formatNumber, type AxisKind } from './ticks.js';

/** A fraction on a grid of two parameters: what the terminal map and the SVG heat map both draw. */
export interface MapGrid {
  readonly xLabel: string;
  readonly yLabel: string;
  readonly xAxis: AxisKind;
  readonly yAxis: AxisKind;
  readonly xEdges: readonly number[];
  readonly yEdges: readonly number[];
  /** Row by row (cell (i, j) at j * nx + i); NaN where a cell has no points. */
  readonly values: ArrayLike<number>;
  /** Names of the bins of a categorical axis (a choice parameter: bin k is choice k), else absent. */
  readonly xCategories?: readonly string[] | null;
  readonly yCategories?: readonly string[] | null;
}

/** Shades from low to high; a fraction f gets the last shade whose lower bound is ≤ f. */
export const SHADES: readonly { readonly from: number; readonly char: string }[] = [
  { from: 0, char: ' ' },
  { from: 0.1, char: '░' },
  { from: 0.3, char: '▒' },
  { from: 0.5, char: '▓' },
  { from: 0.75, char: '█' },
];
export const NO_POINTS_CHAR = '·';

export function shadeOf(f: number): string {
  if (!Number.isFinite(f)) return NO_POINTS_CHAR;
  let c = SHADES[0].char;
  for (const s of SHADES) if (f >= s.from) c = s.char;
  return c;
}

export function renderTerminalMap(m: MapGrid): string {
  const nx = m.xEdges.length - 1;
  const ny = m.yEdges.length - 1;
  // Ends of an axis: its outer edges, or for categories the first and last names.
  const yTop = m.yCategories?.[ny - 1] ?? formatNumber(m.yEdges[ny]);
  const yBottom = m.yCategories?.[0] ?? formatNumber(m.yEdges[0]);
  const pad = Math.max(yTop.length, yBottom.length);
  // Two columns per cell look square in most terminal fonts; past 40 cells, one keeps the map on a screen.
  const cw = nx > 40 ? 1 : 2;
  const lines: string[] = [`${' '.repeat(pad)}  ${m.yLabel}${m.yAxis === 'log' ? ' (log)' : ''}`];
  for (let j = ny - 1; j >= 0; j--) {
    let row = '';
    for (let i = 0; i < nx; i++) row += shadeOf(m.values[j * nx + i]).repeat(cw);
    const label = j === ny - 1 ? yTop : j === 0 ? yBottom : '';
    lines.push(`${label.padStart(pad)} |${row}|`);
  }
  lines.push(`${' '.repeat(pad)} +${'-'.repeat(cw * nx)}+`);
  const xl = m.xCategories?.[0] ?? formatNumber(m.xEdges[0]);
  const xr = m.xCategories?.[nx - 1] ?? formatNumber(m.xEdges[nx]);
  lines.push(`${' '.repeat(pad + 2)}${xl}${xr.padStart(Math.max(xr.length + 1, cw * nx - xl.length))}`);
  lines.push(`${' '.repeat(pad + 2)}${m.xLabel}${m.xAxis === 'log' ? ' (log)' : ''}`);
  const bounds = SHADES.map((s, k) => {
    const next = SHADES[k + 1];
    const range = next === undefined ? `≥ ${100 * s.from} %` : `${100 * s.from}–${100 * next.from} %`;
    return `[${s.char}${s.char}] ${range}`;
  });
  lines.push(`pass fraction: ${bounds.join('  ')}  [${NO_POINTS_CHAR}${NO_POINTS_CHAR}] no points`);
  lines.push('the 50 % contour is the edge between ▒ and ▓');
  return lines.join('\n');
}
