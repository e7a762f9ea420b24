/**
 * The report as one self-contained HTML page: inline CSS, inline SVG, no script, nothing fetched (a
 * Content-Security-Policy forbids it, so even a mistake could not load anything). Every text that comes from
 * the database or the spec goes through escapeXml; the page is also well-formed XML (polyglot), which the
 * tests use to look at it.
 */
import { MODEL_VERSION } from '../../shared/model-version.js';
import type { QueryAnswer } from '../query/answer.js';
import { rangeLine } from '../query/answer.js';
import { el, escapeXml, svgDocument, type Figure } from '../plots/svg.js';
import { formatNumber } from '../plots/ticks.js';

export interface ReportLink {
  readonly href: string;
  readonly label: string;
}

export interface ReportContent {
  readonly answer: QueryAnswer;
  readonly marginals: readonly Figure[];
  readonly trajectory: Figure | null;
  readonly maps: readonly { readonly caption: string; readonly figure: Figure }[];
  readonly links: readonly ReportLink[];
  /** When the report was made (ISO text, shown as is). */
  readonly generatedAt: string;
}

const CSS = `
body { font-family: 'DejaVu Sans', 'Liberation Sans', Arial, sans-serif; color: #222; margin: 0 auto; max-width: 1180px; padding: 1em 1.5em 3em; line-height: 1.45; }
h1 { font-size: 1.5em; margin-bottom: 0.2em; } h2 { font-size: 1.2em; margin-top: 1.8em; border-bottom: 1px solid #ccc; }
.meta { color: #555; font-size: 0.92em; } .note { background: #fff8e1; border-left: 4px solid #f0b400; padding: 0.3em 0.8em; margin: 0.4em 0; }
.big { font-size: 1.25em; } code, .mono { font-family: 'DejaVu Sans Mono', monospace; font-size: 0.92em; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; } th, td { border: 1px solid #ccc; padding: 0.25em 0.6em; text-align: left; vertical-align: top; }
th { background: #f3f3f3; } td.num { text-align: right; font-variant-numeric: tabular-nums; }
.figures { display: flex; flex-wrap: wrap; gap: 1em; } figure { margin: 0; } figcaption { font-size: 0.88em; color: #555; max-width: 560px; }
ul.summary li { margin: 0.2em 0; } svg { display: block; }
`;

const t = (text: string): string => escapeXml(text);
const p = (html: string, cls?: string): string => el('p', cls === undefined ? {} : { class: cls }, html);
const pct = (v: number): string => (Number.isFinite(v) ? `${(100 * v).toFixed(v < 0.1 ? 1 : 0)} %` : '–');
const row = (cells: readonly string[], header = false): string => el('tr', {}, cells.map((c) => el(header ? 'th' : 'td', {}, c)).join(''));

/** A table; `rows` hold markup (escaped text), `numeric` the columns to right-align. */
function table(header: readonly string[], rows: readonly (readonly string[])[], numeric: readonly number[] = []): string {
  const body = rows.map((r) => el('tr', {}, r.map((c, k) => el('td', numeric.includes(k) ? { class: 'num' } : {}, c)).join(''))).join('');
  return el('table', {}, el('thead', {}, row(header.map(t), true)) + el('tbody', {}, body));
}

function summarySection(a: QueryAnswer): string {
  const ev = a.evaluation;
  const c = ev.counts;
  const parts = [
    el('h2', {}, 'Summary'),
    p(`${t(String(a.pass.k))} of ${t(String(a.pass.n))} selected models pass: <strong>${t(pct(a.pass.fraction))}</strong> (95 % Wilson interval ${t(pct(a.pass.low))} – ${t(pct(a.pass.high))}).`, 'big'),
    p(t(`The sweep has ${c.points} points, ${c.ok} with an ok result; ${c.selected} selected${ev.where === null ? '' : ` by the filter ${ev.where}`}.`)),
    el('ul', {}, ev.targets.map((x) => el('li', {}, `${el('code', {}, t(x.text))}: ${t(x.descriptor.description)} ${el('span', { class: 'meta' }, t(`(${x.descriptor.source})`))}`)).join('')),
    ...ev.notes.map((n) => el('div', { class: 'note' }, t(n))),
  ];
  return parts.join('');
}

function constraintSection(a: QueryAnswer): string {
  const parts = [el('h2', {}, 'Constraints'), el('ul', { class: 'summary' }, a.summary.lines.map((l) => el('li', {}, t(l))).join(''))];
  const best = a.boxes[0];
  if (best !== undefined) {
    const rows = best.ranges.map((r) => {
      const pm = r.parameter;
      const unit = pm.unit === '' || pm.unit === '1' ? '' : pm.unit;
      const bound = (v: number | null) => (v === null ? '(open)' : formatNumber(v));
      return [
        el('code', {}, t(pm.name)), t(unit), t(r.choices !== null ? r.choices.join(', ') : bound(r.lower)), t(r.choices !== null ? '' : bound(r.upper)),
        t(pct(r.keptShare)), t(`${formatNumber(pm.min)} – ${formatNumber(pm.max)}${pm.logSpace ? ' (log)' : ''}`), t(r.constrained ? 'yes' : 'no'),
      ];
    });
    parts.push(p(t('Best PRIM box, parameter by parameter (bounds halfway between the last point removed and the first kept):')));
    parts.push(table(['parameter', 'unit', 'lower', 'upper', 'range kept', 'sampled', 'constrained'], rows, [2, 3, 4]));
    parts.push(p(t('All boxes (covering: each later box is found among the points outside the earlier ones):')));
    parts.push(table(['box', 'models', 'support', 'coverage', 'pass rate', '95 % interval', 'ranges'], a.boxes.map((b, k) => [
      t(String(k + 1)), t(String(b.box.n)), t(pct(b.box.support)), t(pct(b.box.coverage)), t(pct(b.box.density)), t(`${pct(b.density.low)} – ${pct(b.density.high)}`),
      b.ranges.filter((r) => r.constrained).map((r) => t(rangeLine(r))).join('<br/>') || t('(whole space)'),
    ]), [1, 2, 3, 4]));
  }
  return parts.join('');
}

const figure = (fig: Figure, caption?: string): string =>
  el('figure', {}, svgDocument(fig) + (caption === undefined ? '' : el('figcaption', {}, t(caption))));

/** The whole page. */
export function reportPage(c: ReportContent): string {
  const ev = c.answer.evaluation;
  const s = ev.sweep;
  const title = `disksweep report: ${s.name}`;
  const head =
    el('meta', { charset: 'utf-8' }) +
    el('meta', { 'http-equiv': 'Content-Security-Policy', content: "default-src 'none'; style-src 'unsafe-inline'; img-src data:" }) +
    el('meta', { name: 'viewport', content: 'width=device-width, initial-scale=1' }) +
    el('title', {}, t(title)) +
    el('style', {}, CSS);
  const body = [
    el('h1', {}, t(title)),
    p(t(`sweep ${s.sweepId} · model ${s.modelVersion} · report by disksweep (model ${MODEL_VERSION}) at ${c.generatedAt}`), 'meta'),
    ...(s.description === null ? [] : [p(t(s.description))]),
    summarySection(c.answer),
    constraintSection(c.answer),
    el('h2', {}, 'Marginal pass fractions'),
    p(t('Pass fraction in bins of each varied parameter, all other parameters marginalised; error bars are 95 % Wilson intervals, the dashed line the overall fraction.')),
    el('div', { class: 'figures' }, c.marginals.map((f) => figure(f)).join('')),
    ...(c.trajectory === null ? [] : [el('h2', {}, 'PRIM trajectory'), el('div', { class: 'figures' }, figure(c.trajectory, 'Each step peels a small slice off one face of the box; the box kept is the largest whose pass rate cannot be told from the best one (95 % Wilson bounds).'))]),
    el('h2', {}, 'Maps of the most constraining pairs'),
    c.maps.length === 0 ? p(t('The sweep varies fewer than two parameters: no maps.')) : el('div', { class: 'figures' }, c.maps.map((m) => figure(m.figure, m.caption)).join('')),
    el('h2', {}, 'Data'),
    el('ul', {}, c.links.map((l) => el('li', {}, el('a', { href: l.href }, t(l.label)))).join('')),
  ];
  return `<!DOCTYPE html>\n${el('html', { lang: 'en' }, el('head', {}, head) + el('body', {}, body.join('')))}\n`;
}
