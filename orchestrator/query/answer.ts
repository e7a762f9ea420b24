/**
 * The answer `disksweep query` gives, computed from one Evaluation: the pass count with its Wilson interval,
 * the marginal pass fraction of every varied parameter, PRIM boxes (in log space for log-sampled parameters)
 * and the constraint summary of the best box. Plain data; query-report.ts and --json present it.
 */
import type { Evaluation, VariedParameter } from './evaluate.js';
import { marginal, type Marginal } from './marginals.js';
import { prim, type PrimBox, type PrimResult } from './prim.js';
import { wilson, type Proportion } from './wilson.js';

export interface AnswerOptions {
  /** Range bins per parameter for the marginals (levels of lists, choices and small grids get one bin each). */
  readonly bins?: number;
  /** PRIM peeling fraction (default 0.05). */
  readonly alpha?: number;
  /** PRIM minimum support beta0 (default 0.05). */
  readonly minSupport?: number;
  /** PRIM boxes by covering (default 3). */
  readonly maxBoxes?: number;
}

/** One parameter inside one box, in the parameter's own unit. */
export interface ParameterRange {
  readonly parameter: VariedParameter;
  /** Box bounds (null: that face never moved, the range is open there). */
  readonly lower: number | null;
  readonly upper: number | null;
  /** Share of the sampled range (log range for log parameters) the box keeps. */
  readonly keptShare: number;
  /** For a choice parameter: the values inside the box. */
  readonly choices: readonly string[] | null;
  /** True when the box narrows the parameter at all. */
  readonly constrained: boolean;
}

export interface BoxAnswer {
  readonly box: PrimBox;
  readonly density: Proportion;
  readonly ranges: readonly ParameterRange[];
}

export interface QueryAnswer {
  readonly evaluation: Evaluation;
  readonly pass: Proportion;
  readonly marginals: readonly Marginal[];
  readonly prim: PrimResult;
  readonly boxes: readonly BoxAnswer[];
  /** Lines a person can paste into a paper (the best box), and the unconstrained parameter names. */
  readonly summary: { readonly lines: readonly string[]; readonly unconstrained: readonly string[] };
}

const toSpace = (p: VariedParameter, v: number): number => (p.logSpace ? Math.log10(v) : v);
const fromSpace = (p: VariedParameter, u: number): number => (p.logSpace ? 10 ** u : u);

/** The columns of an evaluation in PRIM space: log10 of log parameters, choice indexes as they are. */
export function primColumns(ev: Evaluation): Float64Array[] {
  return ev.parameters.map((p, k) => (p.logSpace ? ev.values[k].map(Math.log10) : ev.values[k]));
}

function ranges(ev: Evaluation, box: PrimBox): ParameterRange[] {
  return ev.parameters.map((p, j) => {
    const lo = box.shownLower[j];
    const hi = box.shownUpper[j];
    const [sMin, sMax] = [toSpace(p, p.min), toSpace(p, p.max)];
    const a = lo === null ? sMin : Math.max(sMin, lo);
    const b = hi === null ? sMax : Math.min(sMax, hi);
    const keptShare = sMax > sMin ? Math.max(0, b - a) / (sMax - sMin) : 1;
    const choices = p.kind === 'choice' ? (p.values ?? []).filter((_, i) => i > box.lower[j] && i < box.upper[j]).map(String) : null;
    return {
      parameter: p,
      lower: lo === null ? null : fromSpace(p, lo),
      upper: hi === null ? null : fromSpace(p, hi),
      keptShare,
      choices,
      constrained: lo !== null || hi !== null,
    };
  });
}

const sig = (v: number): string => (v === 0 ? '0' : Math.abs(v) >= 1e4 || Math.abs(v) < 1e-2 ? v.toExponential(2) : String(Number(v.toPrecision(3))));
const pct = (v: number): string => `${(100 * v).toFixed(v < 0.1 ? 1 : 0)} %`;

/** One line for one constrained parameter, e.g. `1.2e-3 <= alpha_active <= 3.4e-2  (sampled ..., log)`. */
export function rangeLine(r: ParameterRange): string {
  const p = r.parameter;
  const unit = p.unit === '' || p.unit === '1' ? '' : ` ${p.unit}`;
  const sampled = p.kind === 'choice' ? `of ${(p.values ?? []).join(', ')}` : `sampled ${sig(p.min)} to ${sig(p.max)}${unit}, ${p.logSpace ? 'log' : p.scale === 'values' ? 'listed values' : 'linear'}`;
  let core: string;
  if (r.choices !== null) core = `${p.name} in {${r.choices.join(', ')}}`;
  else if (r.lower !== null && r.upper !== null) core = `${sig(r.lower)} <= ${p.name} <= ${sig(r.upper)}${unit}`;
  else if (r.lower !== null) core = `${p.name} >= ${sig(r.lower)}${unit}`;
  else core = `${p.name} <= ${sig(r.upper ?? Number.NaN)}${unit}`;
  return `${core}  (${sampled}; the box keeps ${pct(r.keptShare)} of the ${p.logSpace ? 'log ' : ''}range)`;
}

function summaryOf(ev: Evaluation, result: PrimResult, boxes: readonly BoxAnswer[], overall: Proportion): QueryAnswer['summary'] {
  const best = boxes[0];
  if (best === undefined) {
    return { lines: [`No PRIM box: ${overall.k === 0 ? 'no selected model passes' : 'too few models to peel'}.`], unconstrained: ev.parameters.map((p) => p.name) };
  }
  const b = best.box;
  const d = best.density;
  const lines = [
    `Best PRIM box (Friedman & Fisher 1999; peeling alpha = ${result.alpha}, minimum support = ${result.minSupport}${ev.parameters.some((p) => p.logSpace) ? ', log-sampled parameters in log space' : ''}): ` +
      `${b.n} of ${result.n} models (${pct(b.support)}), pass rate ${pct(d.fraction)} (95 % Wilson interval ${pct(d.low)}-${pct(d.high)}) ` +
      `against ${pct(overall.fraction)} overall; the box holds ${pct(b.coverage)} of all passing models.`,
    ...best.ranges.filter((r) => r.constrained).map(rangeLine),
  ];
  const unconstrained = best.ranges.filter((r) => !r.constrained).map((r) => r.parameter.name);
  lines.push(unconstrained.length === 0 ? 'Every varied parameter is constrained.' : `Unconstrained (the box spans the whole sampled range): ${unconstrained.join(', ')}.`);
  return { lines, unconstrained };
}

/** Everything `disksweep query` reports, from one evaluation. */
export function answerQuery(ev: Evaluation, options: AnswerOptions = {}): QueryAnswer {
  const overall = wilson(ev.counts.passed, ev.counts.selected);
  const marginals = ev.parameters.map((_, k) => marginal(ev, k, options.bins ?? 10));
  const result = prim(primColumns(ev), ev.pass, { alpha: options.alpha, minSupport: options.minSupport, maxBoxes: options.maxBoxes });
  const boxes = result.boxes.map((box) => ({ box, density: wilson(box.passes, box.n), ranges: ranges(ev, box) }));
  return { evaluation: ev, pass: overall, marginals, prim: result, boxes, summary: summaryOf(ev, result, boxes, overall) };
}
