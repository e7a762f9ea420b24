/**
 * Axis ticks a reader can use: linear ticks at 1, 2 or 5 times a power of ten (Heckbert 1990, "Nice numbers
 * for graph labels", Graphics Gems I), logarithmic ticks at whole decades (with 2 and 5 in between when the
 * axis spans less than about two decades, and every n-th decade when it spans many), and labels as short as
 * the numbers allow.
 */

export type AxisKind = 'linear' | 'log';

export interface Tick {
  readonly value: number;
  readonly label: string;
  /** Minor ticks get a tick mark but no label. */
  readonly major: boolean;
}

export interface AxisTicks {
  /** The axis range, widened to the outermost ticks (loose labelling) unless `tight` was asked for. */
  readonly min: number;
  readonly max: number;
  readonly ticks: readonly Tick[];
}

/** The nice number (1, 2, 5 or 10 times a power of ten) nearest `x` (round) or not below it. Heckbert 1990. */
export function niceNumber(x: number, round: boolean): number {
  const exp = Math.floor(Math.log10(x));
  const f = x / 10 ** exp;
  const nf = round ? (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) : f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
  return nf * 10 ** exp;
}

/** A short label: plain decimals where they are short, otherwise mantissa-exponent (`3e-9`, `2.5e+30` → `2.5e30`). */
export function formatNumber(v: number, digits = 3): string {
  if (v === 0) return '0';
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  // Whole digits are never rounded away (1234, not 1230); digits beyond `digits` significant ones are.
  if (a >= 1e-3 && a < 1e5) return String(Number(v.toPrecision(Math.max(digits, Math.floor(Math.log10(a)) + 1))));
  const [m, e] = v.toExponential(digits - 1).split('e');
  return `${String(Number(m))}e${Number(e)}`;
}

/** Linear ticks covering [lo, hi] with about `target` intervals. */
export function linearTicks(lo: number, hi: number, target = 5, tight = false): AxisTicks {
  if (!(hi > lo)) {
    const pad = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    return linearTicks(lo - pad, hi + pad, target, tight);
  }
  const step = niceNumber(niceNumber(hi - lo, false) / Math.max(1, target), true);
  const first = Math.floor(lo / step + 1e-9);
  const last = Math.ceil(hi / step - 1e-9);
  const ticks: Tick[] = [];
  // Labels from the step's own precision, so 0.1 + 0.2 prints as 0.3.
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  for (let k = first; k <= last; k++) {
    const value = Number((k * step).toFixed(Math.min(20, decimals)));
    if (tight && (value < lo - step * 1e-9 || value > hi + step * 1e-9)) continue;
    ticks.push({ value, label: formatNumber(value, 6), major: true });
  }
  return tight ? { min: lo, max: hi, ticks } : { min: first * step, max: last * step, ticks };
}

/** 10^d exactly as the decimal literal reads (10 ** -5 is 9.999999999999999e-6). */
const decade = (d: number): number => Number(`1e${d}`);

/** Logarithmic ticks covering [lo, hi] (both > 0). */
export function logTicks(lo: number, hi: number, tight = false): AxisTicks {
  if (!(lo > 0) || !(hi > 0)) throw new RangeError(`log axis needs positive bounds (got ${lo}, ${hi})`);
  if (!(hi > lo)) return logTicks(lo / 2, hi * 2, tight);
  const d0 = Math.floor(Math.log10(lo) + 1e-9);
  const d1 = Math.ceil(Math.log10(hi) - 1e-9);
  const decades = d1 - d0;
  const every = Math.max(1, Math.ceil(decades / 8));
  const mantissas = decades <= 2 ? [1, 2, 5] : [1];
  const ticks: Tick[] = [];
  for (let d = d0; d <= d1; d++) {
    for (const m of mantissas) {
      const value = Number(`${m}e${d}`);
      if (value > decade(d1) * (1 + 1e-9)) continue;
      if (tight && (value < lo * (1 - 1e-9) || value > hi * (1 + 1e-9))) continue;
      const major = m === 1 ? (d - d0) % every === 0 : true;
      ticks.push({ value, label: major ? formatNumber(value) : '', major });
    }
    if (decades > 2) {
      // Unlabelled 2..9 ticks show the axis is logarithmic when decades are few enough to see them.
      if (decades <= 6 && d < d1) {
        for (let m = 2; m <= 9; m++) {
          const value = Number(`${m}e${d}`);
          if (!tight || (value >= lo && value <= hi)) ticks.push({ value, label: '', major: false });
        }
      }
    }
  }
  return tight ? { min: lo, max: hi, ticks } : { min: decade(d0), max: decade(d1), ticks };
}

export function axisTicks(kind: AxisKind, lo: number, hi: number, tight = false): AxisTicks {
  return kind === 'log' ? logTicks(lo, hi, tight) : linearTicks(lo, hi, 5, tight);
}
