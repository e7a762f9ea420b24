/**
 * The plots of one stored run against time: masses, accretion rate, the star's shares of mass and angular
 * momentum (with the solar-like thresholds), where the angular momentum is, and the dead zone's extent. The
 * masses, rate and shares come from the stored time series; the angular-momentum budget and the dead zone
 * exist only at the checkpoints (the series does not carry them), so those panels plot the checkpoints.
 */
import type { ModelParams } from '../../shared/model-params.js';
import { decodeSeries, type ModelResult } from '../../shared/model-result.js';
import { linePlot, type LinePlot } from '../plots/line-plot.js';
import { stackFigures, type Figure } from '../plots/svg.js';
import { formatNumber } from '../plots/ticks.js';

/** Lower end of the angular-momentum share axis: shares below it are of no consequence. */
const J_SHARE_FLOOR = 1e-6;
import { renderPlot } from '../cli/terminal-plot.js';

const nullToNaN = (v: number | null): number => (v === null ? NaN : v);

export interface PointPanels {
  readonly masses: LinePlot;
  readonly mdot: LinePlot;
  readonly shares: LinePlot;
  readonly angularMomentum: LinePlot;
  readonly deadZone: LinePlot;
}

export function pointPanels(p: ModelParams, r: ModelResult): PointPanels {
  const s = decodeSeries(r.series);
  const t = s.t_myr ?? new Float32Array(0);
  const cps = r.checkpoints;
  const ct = cps.map((c) => nullToNaN(c.t_myr));
  const flat = (v: number) => Array.from(t, () => v);
  const jTotal = cps.map((c) => nullToNaN(c.j_disk_g_cm2_s) + nullToNaN(c.j_spin_g_cm2_s) + nullToNaN(c.j_removed_g_cm2_s) + nullToNaN(c.j_lost_g_cm2_s));
  const jShare = (pick: (c: (typeof cps)[number]) => number | null) => cps.map((c, k) => (jTotal[k] > 0 ? nullToNaN(pick(c)) / jTotal[k] : NaN));
  // A share that stays below the axis floor draws nothing: its legend entry says so instead of naming a curve
  // nobody can find.
  const jSeries = (label: string, pick: (c: (typeof cps)[number]) => number | null) => {
    const y = jShare(pick);
    const hidden = y.every((v) => !(v >= J_SHARE_FLOOR));
    return { label: hidden ? `${label} (below ${J_SHARE_FLOOR.toExponential(0)} throughout)` : label, x: ct, y, markers: true };
  };
  return {
    masses: {
      title: 'star and disk mass', xLabel: 't [Myr]', yLabel: 'mass [M_sun]', yAxis: 'log',
      series: [{ label: 'M_*', x: t, y: s.m_star_msun }, { label: 'M_disk', x: t, y: s.m_disk_msun }],
    },
    mdot: {
      title: 'accretion rate onto the star', xLabel: 't [Myr]', yLabel: 'Ṁ_* [M_sun/yr]', yAxis: 'log',
      series: [{ label: 'Ṁ_*', x: t, y: s.mdot_star_msun_yr }],
    },
    // Plotted as what must become small: the disk's share of the mass (1 - M_* share) and the star's share of
    // the angular momentum, on a log axis with their limits; the split holds where both are below their lines.
    shares: {
      title: 'solar-like split: both curves below their dashed limits', xLabel: 't [Myr]', yLabel: 'share', yAxis: 'log',
      series: [
        { label: `limit 1 - f_M = ${formatNumber(1 - p.f_mass_star)}`, x: t, y: flat(1 - p.f_mass_star), dashed: true, colour: 2 },
        { label: `limit f_J = ${formatNumber(p.f_j_disk_max)}`, x: t, y: flat(p.f_j_disk_max), dashed: true, colour: 3 },
        { label: 'M_disk / (M_* + M_disk)', x: t, y: Array.from(s.star_mass_share, (v) => 1 - v) },
        { label: 'J_spin / (J_spin + J_disk)', x: t, y: s.spin_j_share },
      ],
    },
    angularMomentum: {
      // Shares below 1e-6 of the total are of no consequence and would stretch the axis over many decades.
      title: 'where the angular momentum is (checkpoints)', xLabel: 't [Myr]', yLabel: 'share of the total J', yAxis: 'log', yRange: [J_SHARE_FLOOR, 1],
      series: [
        jSeries('disk', (c) => c.j_disk_g_cm2_s),
        jSeries('star spin', (c) => c.j_spin_g_cm2_s),
        jSeries('removed (torques, winds)', (c) => c.j_removed_g_cm2_s),
        jSeries('lost through R_out', (c) => c.j_lost_g_cm2_s),
      ],
    },
    deadZone: {
      title: 'dead zone (outermost dead band, checkpoints)', xLabel: 't [Myr]', yLabel: 'radius [AU]', yAxis: 'log',
      emptyText: 'no dead zone at any checkpoint',
      series: [
        { label: 'inner edge', x: ct, y: cps.map((c) => nullToNaN(c.r_dead_in_au)), markers: true },
        { label: 'outer edge', x: ct, y: cps.map((c) => nullToNaN(c.r_dead_out_au)), markers: true },
      ],
    },
  };
}

/** All panels as one SVG figure, one below the other. */
export function pointFigure(title: string, panels: PointPanels): Figure {
  return stackFigures(title, [panels.masses, panels.mdot, panels.shares, panels.angularMomentum, panels.deadZone].map((pl) => linePlot({ ...pl, height: 300 })));
}

const SYMBOLS = ['*', 'o', '+', 'x', '#'];

/** The panels the model summary does not already draw (it has the masses), as terminal plots. */
export function terminalPanels(panels: PointPanels): string {
  const one = (pl: LinePlot, extra: string) => {
    const x = pl.series[0].x;
    const usable = pl.series.every((s) => s.x === x);
    if (!usable) throw new Error(`terminal plot ${pl.title}: series must share their x values`);
    const body = renderPlot(x, pl.series.map((s, k) => ({ label: s.label, symbol: SYMBOLS[k % SYMBOLS.length], y: s.y })), {
      logY: pl.yAxis === 'log', height: 10, xLabel: `x: ${pl.xLabel}`, yLabel: pl.yLabel,
    });
    return `${pl.title}${extra}\n${body === '(nothing to plot)' && pl.emptyText !== undefined ? `(${pl.emptyText})` : body}`;
  };
  return [one(panels.mdot, ''), one(panels.shares, ''), one(panels.angularMomentum, ''), one(panels.deadZone, '')].join('\n\n');
}
