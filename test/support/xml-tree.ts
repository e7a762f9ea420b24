/**
 * A strict little XML reader for tests: parses what our SVG and XHTML-like output contains (elements,
 * attributes in double quotes, text, the five predefined entities and numeric references, an optional
 * doctype) into a tree, and throws on anything malformed (an unclosed or mismatched tag, a raw `<` or `&` in
 * text, an unquoted attribute). With it a test can say "this text is a text node, and there is no script
 * element" by looking, not by searching strings.
 */

export interface XmlElement {
  readonly name: string;
  readonly attrs: Readonly<Record<string, string>>;
  readonly children: readonly XmlNode[];
}
export type XmlNode = XmlElement | string;

const ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function decode(s: string, where: number): string {
  return s.replace(/&([^;\s]*);?/g, (m, body: string) => {
    if (!m.endsWith(';')) throw new Error(`bare & at ${where}`);
    if (body.startsWith('#x')) return String.fromCodePoint(parseInt(body.slice(2), 16));
    if (body.startsWith('#')) return String.fromCodePoint(parseInt(body.slice(1), 10));
    const e = ENTITIES[body];
    if (e === undefined) throw new Error(`unknown entity &${body}; at ${where}`);
    return e;
  });
}

const TAG = /<(\/?)([A-Za-z][\w:.-]*)((?:\s+[\w:.-]+="[^"<]*")*)\s*(\/?)>/y;
const ATTR = /([\w:.-]+)="([^"<]*)"/g;

export function parseXml(input: string): XmlElement {
  let pos = 0;
  const doc = input.replace(/^\s*(<\?xml[^>]*\?>)?\s*(<!DOCTYPE[^>]*>)?\s*/i, (m) => ' '.repeat(m.length));
  const stack: { name: string; attrs: Record<string, string>; children: XmlNode[] }[] = [{ name: '#root', attrs: {}, children: [] }];
  while (pos < doc.length) {
    const lt = doc.indexOf('<', pos);
    const chunk = doc.slice(pos, lt === -1 ? doc.length : lt);
    if (chunk.length > 0) {
      const t = decode(chunk, pos);
      if (t.trim() !== '' || stack.length > 1) stack[stack.length - 1].children.push(t);
    }
    if (lt === -1) break;
    if (doc.startsWith('<!--', lt)) {
      const end = doc.indexOf('-->', lt);
      if (end === -1) throw new Error(`unclosed comment at ${lt}`);
      pos = end + 3;
      continue;
    }
    TAG.lastIndex = lt;
    const m = TAG.exec(doc);
    if (m === null) throw new Error(`malformed markup at ${lt}: ${JSON.stringify(doc.slice(lt, lt + 40))}`);
    const [, close, name, attrText, selfClose] = m;
    pos = TAG.lastIndex;
    if (close === '/') {
      const top = stack.pop();
      if (top === undefined || top.name !== name || stack.length === 0) throw new Error(`</${name}> does not close <${top?.name}> at ${lt}`);
      stack[stack.length - 1].children.push(top);
      continue;
    }
    const attrs: Record<string, string> = {};
    for (const a of attrText.matchAll(ATTR)) {
      if (a[1] in attrs) throw new Error(`attribute ${a[1]} twice at ${lt}`);
      attrs[a[1]] = decode(a[2], lt);
    }
    const node = { name, attrs, children: [] as XmlNode[] };
    if (selfClose === '/') stack[stack.length - 1].children.push(node);
    else stack.push(node);
  }
  if (stack.length !== 1) throw new Error(`unclosed <${stack[stack.length - 1].name}>`);
  const roots = stack[0].children.filter((c): c is XmlElement => typeof c !== 'string');
  if (roots.length !== 1) throw new Error(`expected one root element, found ${roots.length}`);
  return roots[0];
}

/** Every element below (and including) `node`, depth first. */
export function allElements(node: XmlElement): XmlElement[] {
  return [node, ...node.children.flatMap((c) => (typeof c === 'string' ? [] : allElements(c)))];
}

/** The text content of an element (all descendant text nodes joined). */
export function textOf(node: XmlNode): string {
  return typeof node === 'string' ? node : node.children.map(textOf).join('');
}
