/**
 * A small character plot for terminals: several series against one x axis, optionally logarithmic in y.
 * Points where series overlap show the later series' symbol; non-finite or (log axis) non-positive values
 * are left out.
 */

export interface PlotSeries {
  readonly label: string;
  readonly symbol: string;
  readonly y: ArrayLike<number>;
}

export interface PlotOptions {
  readonly width?: number;
  readonly height?: number;
  readonly logY?: boolean;
  readonly xLabel: string;
  readonly yLabel: string;
}

const fmt = (v: number): string => (Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-2 && v !== 0) ? v.toExponential(1) : v.toPrecision(3));

export function renderPlot(x: ArrayLike<number>, series: readonly PlotSeries[], opts: PlotOptions): string {
  const width = opts.width ?? 60;
  const height = opts.height ?? 14;
  const logY = opts.logY ?? false;
  const toY = (v: number): number => (logY ? Math.log10(v) : v);
  const usable = (v: number): boolean => Number.isFinite(v) && (!logY || v > 0);

  let xMin = Infinity;
  let xMax = -Infinity;
  let yMin = Infinity;
  let yMax = -Infinity;
  for (let k = 0; k < x.length; k++) {
    for (const s of series) {
      const v = s.y[k];
      if (!usable(v) || !Number.isFinite(x[k])) continue;
      xMin = Math.min(xMin, x[k]);
      xMax = Math.max(xMax, x[k]);
      yMin = Math.min(yMin, toY(v));
      yMax = Math.max(yMax, toY(v));
    }
  }
  if (!(xMax >= xMin) || !(yMax >= yMin)) return '(nothing to plot)';
  if (yMax === yMin) [yMin, yMax] = [yMin - 0.5, yMax + 0.5];
  if (xMax === xMin) xMax = xMin + 1;

  const grid = Array.from({ length: height }, () => Array.from({ length: width }, () => ' '));
  for (const s of series) {
    for (let k = 0; k < x.length; k++) {
      const v = s.y[k];
      if (!usable(v) || !Number.isFinite(x[k])) continue;
      const col = Math.round(((x[k] - xMin) / (xMax - xMin)) * (width - 1));
      const row = height - 1 - Math.round(((toY(v) - yMin) / (yMax - yMin)) * (height - 1));
      grid[row][col] = s.symbol;
    }
  }
  const label = (v: number): string => fmt(logY ? 10 ** v : v);
  const top = label(yMax);
  const bottom = label(yMin);
  const pad = Math.max(top.length, bottom.length);
  const lines = grid.map((row, r) => {
    const tick = r === 0 ? top : r === height - 1 ? bottom : '';
    return `${tick.padStart(pad)} |${row.join('')}`;
  });
  lines.push(`${' '.repeat(pad)} +${'-'.repeat(width)}`);
  const xl = fmt(xMin);
  const xr = fmt(xMax);
  lines.push(`${' '.repeat(pad + 2)}${xl}${xr.padStart(width - xl.length)}`);
  lines.push(`${' '.repeat(pad + 2)}${opts.xLabel}; y: ${opts.yLabel}${logY ? ' (log)' : ''}`);
  lines.push(`${' '.repeat(pad + 2)}${series.map((s) => `${s.symbol} ${s.label}`).join('   ')}`);
  return lines.join('\n');
}
