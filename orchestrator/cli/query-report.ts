/**
 * How `disksweep query` presents a QueryAnswer: a terminal report (pass count, marginal tables with bar charts,
 * PRIM boxes with their trajectory, the constraint summary) or one JSON object with all of it.
 */
import { parameterLabel } from '../query/index.js';
import type { Marginal } from '../query/marginals.js';
import type { BoxAnswer, QueryAnswer } from '../query/answer.js';
import type { PrimStep } from '../query/prim.js';
import type { Proportion } from '../query/wilson.js';
import { num, table } from './text-table.js';

const BAR_WIDTH = 30;
const EIGHTHS = ['', '▏', '▎', '▍', '▌', '▋', '▊', '▉'];

/** A horizontal bar of `fraction` (0..1) in BAR_WIDTH cells, with eighth-cell resolution. */
export function bar(fraction: number): string {
  if (!Number.isFinite(fraction)) return ' '.repeat(BAR_WIDTH);
  const eighths = Math.round(Math.min(1, Math.max(0, fraction)) * BAR_WIDTH * 8);
  const text = '█'.repeat(Math.floor(eighths / 8)) + EIGHTHS[eighths % 8];
  return text.padEnd(BAR_WIDTH, ' ');
}

const pct = (v: number): string => (Number.isFinite(v) ? `${(100 * v).toFixed(1)}%` : '-');
const interval = (p: Proportion): string => (p.n === 0 ? '-' : `${pct(p.low)}-${pct(p.high)}`);

function marginalBlock(m: Marginal): string {
  const p = m.parameter;
  const how = p.kind === 'choice' ? 'choice' : `${p.logSpace ? 'log' : p.scale === 'values' ? 'values' : 'linear'}, ${num(p.min)} to ${num(p.max)}`;
  const rows = m.bins.map((b) => [
    b.label ?? (m.binning === 'levels' ? num(b.from) : `${num(b.from)}-${num(b.to)}`),
    String(b.n),
    String(b.k),
    pct(b.fraction),
    interval(b),
    `|${bar(b.fraction)}|`,
  ]);
  const t = table(['value', 'n', 'pass', 'fraction', '95% interval', `pass fraction (0 to 100%)`.padEnd(BAR_WIDTH + 2)], rows);
  return `${parameterLabel(p)} (${how}${m.binning === 'range' ? `, ${m.bins.length} ${p.logSpace ? 'log ' : ''}bins` : ''})\n${t}`;
}

/** At most `max` trajectory steps: evenly spread, always the first, the chosen and the last. */
function trajectoryRows(steps: readonly PrimStep[], chosen: number, max = 12): number[] {
  const keep = new Set<number>([0, chosen, steps.length - 1]);
  const stride = Math.max(1, Math.ceil(steps.length / max));
  for (let k = 0; k < steps.length; k += stride) keep.add(k);
  return [...keep].sort((a, b) => a - b);
}

function boxBlock(b: BoxAnswer, index: number, names: readonly string[]): string {
  const box = b.box;
  const lines = [
    `box ${index + 1}: ${box.n} models (support ${pct(box.support)}), pass rate ${pct(b.density.fraction)} (${interval(b.density)}), ` +
      `coverage ${pct(box.coverage)} of all passing models; chosen at peeling step ${box.chosenStep} of ${box.trajectory.length - 1}, then ${box.pastes} paste${box.pastes === 1 ? '' : 's'}`,
  ];
  for (const r of b.ranges) {
    const p = r.parameter;
    const show = (v: number | null, open: string) => (v === null ? open : num(v));
    const range = r.choices !== null ? `{${r.choices.join(', ')}}` : `${show(r.lower, `(${num(p.min)})`)} .. ${show(r.upper, `(${num(p.max)})`)}`;
    lines.push(`  ${p.name.padEnd(24)} ${range.padEnd(26)} ${r.constrained ? `keeps ${pct(r.keptShare)} of the ${p.logSpace ? 'log ' : ''}range` : 'unconstrained'}`);
  }
  const steps = trajectoryRows(box.trajectory, box.chosenStep);
  const rows = steps.map((k) => {
    const s = box.trajectory[k];
    const peeled = s.peeled === null ? 'start' : `${names[s.peeled.dim]} ${s.peeled.side === 'lower' ? 'low' : 'high'}`;
    return [`${k}${k === box.chosenStep ? ' *' : ''}`, String(s.n), pct(s.support), pct(s.coverage), pct(s.density), peeled];
  });
  lines.push('  peeling trajectory (* = chosen; rows sampled):', ...table(['step', 'n', 'support', 'coverage', 'density', 'last peel'], rows).split('\n').map((l) => `    ${l}`));
  return lines.join('\n');
}

/** The terminal report. */
export function formatQueryReport(a: QueryAnswer): string {
  const ev = a.evaluation;
  const out: string[] = [];
  out.push(`sweep ${ev.sweep.name} (${ev.sweep.sweepId.slice(0, 12)}): ${ev.counts.points} points, ${ev.counts.ok} with an ok result, ${ev.counts.selected} selected${ev.where === null ? '' : ` by --where ${ev.where}`}`);
  for (const t of ev.targets) out.push(`target ${t.text}: ${t.descriptor.description}`);
  out.push(`PASS: ${a.pass.k} of ${a.pass.n} (${pct(a.pass.fraction)}; 95% Wilson interval ${interval(a.pass)})`);
  for (const n of ev.notes) out.push(`note: ${n}`);
  out.push('', 'Marginal pass fraction per parameter (Wilson 95% intervals)');
  for (const m of a.marginals) out.push('', marginalBlock(m));
  out.push('', `PRIM boxes (Friedman & Fisher 1999: peeling alpha = ${a.prim.alpha}, minimum support = ${a.prim.minSupport}, then pasting; covering for further boxes)`);
  if (a.boxes.length === 0) out.push('  none');
  a.boxes.forEach((b, i) => out.push('', boxBlock(b, i, ev.parameters.map((p) => p.name))));
  out.push('', 'Constraint summary (paste into a paper):', ...a.summary.lines.map((l) => `  ${l}`));
  return out.join('\n');
}

const proportionJson = (p: Proportion) => ({ pass: p.k, n: p.n, fraction: p.n === 0 ? null : p.fraction, low: p.low, high: p.high });
const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** Everything of the answer as one JSON-ready object (snake_case keys; infinite bounds as null). */
export function queryAnswerJson(a: QueryAnswer): unknown {
  const ev = a.evaluation;
  return {
    sweep: { sweep_id: ev.sweep.sweepId, name: ev.sweep.name, points: ev.counts.points, ok: ev.counts.ok },
    targets: ev.targets.map((t) => ({ target: t.text, name: t.descriptor.name, args: t.args, description: t.descriptor.description, source: t.descriptor.source })),
    where: ev.where,
    selected: ev.counts.selected,
    pass: { ...proportionJson(a.pass), interval: 'Wilson 1927, 95 %' },
    notes: ev.notes,
    parameters: ev.parameters.map((p) => ({ name: p.name, unit: p.unit, scale: p.scale, log_space: p.logSpace, kind: p.kind, min: p.min, max: p.max, values: p.values })),
    marginals: a.marginals.map((m) => ({
      parameter: m.parameter.name,
      binning: m.binning,
      bins: m.bins.map((b) => ({ from: b.from, to: b.to, label: b.label, ...proportionJson(b) })),
    })),
    prim: {
      alpha: a.prim.alpha,
      min_support: a.prim.minSupport,
      points: a.prim.n,
      passes: a.prim.passes,
      boxes: a.boxes.map((b) => ({
        n: b.box.n, passes: b.box.passes, support: b.box.support, coverage: b.box.coverage, density: b.box.density,
        density_low: b.density.low, density_high: b.density.high, chosen_step: b.box.chosenStep, pastes: b.box.pastes,
        ranges: b.ranges.map((r) => ({ parameter: r.parameter.name, lower: r.lower, upper: r.upper, choices: r.choices, kept_share: r.keptShare, constrained: r.constrained })),
        trajectory_bounds: 'exclusive thresholds in PRIM space: log10 of the value for log-space parameters, the index for choices',
        trajectory: b.box.trajectory.map((s) => ({
          n: s.n, passes: s.passes, support: s.support, coverage: s.coverage, density: s.density,
          peeled: s.peeled === null ? null : { parameter: ev.parameters[s.peeled.dim].name, side: s.peeled.side },
          lower: [...s.lower].map(finiteOrNull), upper: [...s.upper].map(finiteOrNull),
        })),
      })),
    },
    constraints: { lines: a.summary.lines, unconstrained: a.summary.unconstrained },
  };
}
