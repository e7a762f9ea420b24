/**
 * The little SVG vocabulary the plots are written in. Every attribute value and every text node goes through
 * `escapeXml`, so a sweep name or a parameter value from the database can never open an element: the result
 * is safe both as a standalone SVG file and inlined in an HTML page.
 */

/** Characters XML 1.0 does not allow at all (C0 controls other than tab, newline, return; lone surrogates). */
const NOT_XML = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/** Text as XML/HTML character data or a quoted attribute value: markup characters become entities. */
export function escapeXml(text: string): string {
  return text
    .replace(NOT_XML, '\uFFFD')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

export type Attrs = Readonly<Record<string, string | number | undefined>>;

/** A coordinate with at most two decimals (sub-pixel precision is noise in the file). */
export const px = (v: number): string => String(Math.round(v * 100) / 100);

function attrText(attrs: Attrs): string {
  let s = '';
  for (const [k, v] of Object.entries(attrs)) {
    if (v === undefined) continue;
    s += ` ${k}="${escapeXml(typeof v === 'number' ? px(v) : v)}"`;
  }
  return s;
}

/**
 * One element. `children` is markup made by these functions (already escaped); pass text through `text()`.
 * Element names are ours, never data.
 */
export function el(name: string, attrs: Attrs = {}, children?: string): string {
  return children === undefined ? `<${name}${attrText(attrs)}/>` : `<${name}${attrText(attrs)}>${children}</${name}>`;
}

/** A text element; `content` is data and is escaped. */
export function text(x: number, y: number, content: string, attrs: Attrs = {}): string {
  return el('text', { x, y, ...attrs }, escapeXml(content));
}

/** A polyline through points given as [x, y] pixel pairs. */
export function polyline(points: readonly (readonly [number, number])[], attrs: Attrs): string {
  return el('polyline', { points: points.map(([x, y]) => `${px(x)},${px(y)}`).join(' '), fill: 'none', ...attrs });
}

let idCounter = 0;

/** An element id unique within this process, so several SVGs inlined in one HTML page never share one. */
export function uniqueId(base: string): string {
  idCounter += 1;
  return `${base}-${idCounter}`;
}

/** Fonts that exist on a Debian machine with fonts-dejavu-core, then generic fallbacks (browsers). */
export const FONT_FAMILY = "'DejaVu Sans', 'Liberation Sans', Arial, sans-serif";

/** A drawing before it becomes a document: several can be stacked into one (`stackFigures`). */
export interface Figure {
  readonly width: number;
  readonly height: number;
  /** The accessible name of the document (and a tooltip in browsers); data, escaped when written. */
  readonly title: string;
  /** Markup made by the functions above. */
  readonly body: string;
}

/** A complete SVG document of a figure. */
export function svgDocument(fig: Figure): string {
  const { width, height } = fig;
  return el(
    'svg',
    {
      xmlns: 'http://www.w3.org/2000/svg',
      width,
      height,
      viewBox: `0 0 ${px(width)} ${px(height)}`,
      'font-family': FONT_FAMILY,
      'font-size': 12,
      role: 'img',
    },
    el('title', {}, escapeXml(fig.title)) + el('rect', { width, height, fill: 'white' }) + fig.body,
  );
}

/** Figures one below the other (a multi-panel figure), as wide as the widest. */
export function stackFigures(title: string, figs: readonly Figure[]): Figure {
  let y = 0;
  const body = figs.map((f) => {
    const g = el('g', { transform: `translate(0 ${px(y)})`, class: 'panel' }, f.body);
    y += f.height;
    return g;
  });
  return { width: Math.max(0, ...figs.map((f) => f.width)), height: y, title, body: body.join('') };
}
