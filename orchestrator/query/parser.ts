/**
 * The filter grammar: a small language of our own, parsed by recursive descent into a tree. Precedence from
 * loosest to tightest:
 *
 * ```
 * expr       := or
 * or         := and ('or' and)*
 * and        := not ('and' not)*
 * not        := 'not' not | comparison
 * comparison := sum (cmp sum (cmp sum)?)?          cmp: < <= > >= = == != <>
 * sum        := product (('+' | '-') product)*
 * product    := unary (('*' | '/') unary)*
 * unary      := '-' unary | atom
 * atom       := number | 'string' | true | false | name ('@' number 'myr')? | '(' expr ')'
 * ```
 *
 * `a <= x < b` is a range (both comparisons must hold); a chain of more than two comparisons is refused.
 * Types (number, text, boolean) are checked later, against the whitelist (compile-sql.ts), because only the
 * whitelist knows what a name is. Length and nesting depth are limited so that no input can make the parser
 * or SQLite work hard.
 */
import { filterError } from './filter-error.js';
import { tokenize, type Token } from './lexer.js';

/** Longest filter accepted, in characters. */
export const MAX_FILTER_CHARS = 2000;
/** Deepest nesting of parentheses, `not` and unary minus accepted. */
export const MAX_FILTER_DEPTH = 24;

export type CompareOp = '<' | '<=' | '>' | '>=' | '=' | '!=';
export type ArithOp = '+' | '-' | '*' | '/';

/** A node of the filter tree; `column` is where its text starts (1-based). */
export type Expr =
  | { readonly kind: 'number'; readonly value: number; readonly column: number }
  | { readonly kind: 'string'; readonly value: string; readonly column: number }
  | { readonly kind: 'bool'; readonly value: boolean; readonly column: number }
  /** A parameter or output; `atMyr` is set for a checkpoint output (`m_star_msun@1myr`). */
  | { readonly kind: 'ref'; readonly name: string; readonly atMyr: number | null; readonly column: number }
  | { readonly kind: 'neg'; readonly operand: Expr; readonly column: number }
  | { readonly kind: 'arith'; readonly op: ArithOp; readonly left: Expr; readonly right: Expr; readonly column: number }
  /** `operands[i] ops[i] operands[i+1]` for each i; two ops make a range. */
  | { readonly kind: 'compare'; readonly ops: readonly CompareOp[]; readonly operands: readonly Expr[]; readonly column: number }
  | { readonly kind: 'and' | 'or'; readonly left: Expr; readonly right: Expr; readonly column: number }
  | { readonly kind: 'not'; readonly operand: Expr; readonly column: number }
  /**
   * Internal only (the parser never makes it): the first time after infall that the solar-like split holds
   * with the given thresholds, from the recorded scalar or re-evaluated from the stored series (targets.ts).
   */
  | { readonly kind: 'split-time'; readonly fMass: number; readonly fJ: number; readonly column: number };

const COMPARE: Readonly<Record<string, CompareOp>> = { '<': '<', '<=': '<=', '>': '>', '>=': '>=', '=': '=', '==': '=', '!=': '!=', '<>': '!=' };
const KEYWORDS = new Set(['and', 'or', 'not', 'true', 'false']);

class Parser {
  private pos = 0;
  private depth = 0;

  constructor(
    private readonly text: string,
    private readonly tokens: readonly Token[],
    private readonly source: string,
  ) {}

  private peek(): Token {
    return this.tokens[this.pos];
  }

  private next(): Token {
    return this.tokens[this.pos++];
  }

  private fail(column: number, message: string): never {
    throw filterError(this.text, column, message, this.source);
  }

  private isWord(word: string): boolean {
    const t = this.peek();
    return t.kind === 'ident' && t.text === word;
  }

  private nest<T>(column: number, fn: () => T): T {
    if (++this.depth > MAX_FILTER_DEPTH) this.fail(column, `nested more than ${MAX_FILTER_DEPTH} deep`);
    try {
      return fn();
    } finally {
      this.depth--;
    }
  }

  parse(): Expr {
    const e = this.or();
    const t = this.peek();
    if (t.kind !== 'end') {
      this.fail(t.column, t.kind === 'rparen' ? 'this ) has no matching (' : `expected and, or, or the end here (found ${describe(t)})`);
    }
    return e;
  }

  private or(): Expr {
    return this.joined('or', () => this.and());
  }

  private and(): Expr {
    return this.joined('and', () => this.not());
  }

  /** `operand (word operand)*`, folded to the left. */
  private joined(word: 'and' | 'or', operand: () => Expr): Expr {
    let left = operand();
    while (this.isWord(word)) {
      const column = this.next().column;
      left = { kind: word, left, right: operand(), column };
    }
    return left;
  }

  private not(): Expr {
    if (!this.isWord('not')) return this.comparison();
    const column = this.next().column;
    return this.nest(column, () => ({ kind: 'not', operand: this.not(), column }));
  }

  private comparison(): Expr {
    const first = this.sum();
    const ops: CompareOp[] = [];
    const operands: Expr[] = [first];
    while (this.peek().kind === 'op' && COMPARE[this.peek().text] !== undefined) {
      const t = this.next();
      if (ops.length === 2) this.fail(t.column, 'at most two comparisons in a row (a range like 1e-3 <= alpha_active < 1e-2)');
      ops.push(COMPARE[t.text]);
      operands.push(this.sum());
    }
    if (ops.length === 2) {
      const lower = ops[0] === '<' || ops[0] === '<=';
      const upper = ops[1] === '<' || ops[1] === '<=';
      const down = (ops[0] === '>' || ops[0] === '>=') && (ops[1] === '>' || ops[1] === '>=');
      if (!(lower && upper) && !down) {
        this.fail(operands[1].column, 'a range needs both comparisons in the same direction (a < x <= b, or b > x >= a)');
      }
    }
    return ops.length === 0 ? first : { kind: 'compare', ops, operands, column: first.column };
  }

  private sum(): Expr {
    return this.arithmetic(['+', '-'], () => this.product());
  }

  private product(): Expr {
    return this.arithmetic(['*', '/'], () => this.unary());
  }

  /** `operand (op operand)*` for the given operators, folded to the left. */
  private arithmetic(ops: readonly ArithOp[], operand: () => Expr): Expr {
    let left = operand();
    while (this.peek().kind === 'op' && (ops as readonly string[]).includes(this.peek().text)) {
      const t = this.next();
      left = { kind: 'arith', op: t.text as ArithOp, left, right: operand(), column: t.column };
    }
    return left;
  }

  private unary(): Expr {
    const t = this.peek();
    if (t.kind === 'op' && t.text === '-') {
      this.next();
      return this.nest(t.column, () => {
        const operand = this.unary();
        return operand.kind === 'number' ? { ...operand, value: -operand.value, column: t.column } : { kind: 'neg', operand, column: t.column };
      });
    }
    return this.atom();
  }

  private atom(): Expr {
    const t = this.next();
    switch (t.kind) {
      case 'number':
        if (this.peek().kind === 'ident' && !KEYWORDS.has(this.peek().text)) this.fail(this.peek().column, `a number cannot be followed by a name here (write ${t.text} and ... or name@${t.text}myr)`);
        return { kind: 'number', value: t.value, column: t.column };
      case 'string':
        return { kind: 'string', value: t.text, column: t.column };
      case 'lparen':
        return this.nest(t.column, () => {
          const inner = this.or();
          const close = this.next();
          if (close.kind !== 'rparen') this.fail(close.column, `expected ) to close the ( at column ${t.column} (found ${describe(close)})`);
          return inner;
        });
      case 'ident':
        if (t.text === 'true' || t.text === 'false') return { kind: 'bool', value: t.text === 'true', column: t.column };
        if (KEYWORDS.has(t.text)) this.fail(t.column, `expected a name, a number or ( before "${t.text}"`);
        return this.reference(t);
      case 'end':
        return this.fail(t.column, 'the filter ends too early: expected a name, a number or (');
      default:
        return this.fail(t.column, `expected a name, a number or ( (found ${describe(t)})`);
    }
  }

  private reference(name: Token): Expr {
    if (this.peek().kind !== 'at') return { kind: 'ref', name: name.text, atMyr: null, column: name.column };
    this.next();
    const time = this.next();
    if (time.kind !== 'number') this.fail(time.column, `after ${name.text}@ write a checkpoint time in Myr, e.g. ${name.text}@1myr`);
    const unit = this.next();
    if (unit.kind !== 'ident' || unit.text !== 'myr') {
      this.fail(unit.column, `the checkpoint time needs its unit: ${name.text}@${time.text}myr`);
    }
    return { kind: 'ref', name: name.text, atMyr: time.value, column: name.column };
  }
}

function describe(t: Token): string {
  if (t.kind === 'end') return 'the end of the filter';
  if (t.kind === 'string') return `the string '${t.text}'`;
  return `"${t.text}"`;
}

/**
 * Parse a filter into its tree. Throws `input/invalid-filter` (exit 2) naming the column of the first mistake.
 * @param source how the input is named in errors (default `--where`)
 */
export function parseFilter(text: string, source = '--where'): Expr {
  if (text.length > MAX_FILTER_CHARS) {
    throw filterError(text, MAX_FILTER_CHARS + 1, `longer than ${MAX_FILTER_CHARS} characters`, source);
  }
  if (text.trim() === '') throw filterError(text, 1, 'the filter is empty', source);
  return new Parser(text, tokenize(text, source), source).parse();
}
