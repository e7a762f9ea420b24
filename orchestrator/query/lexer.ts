/**
 * Tokens of the filter grammar (see parser.ts). Every token keeps the 1-based column where it starts, so an
 * error can point at the mistake. Nothing here knows about SQL: a string literal is data, an identifier is a
 * name that must later be found in the whitelist (names.ts).
 */
import { filterError } from './filter-error.js';

export type TokenKind = 'number' | 'string' | 'ident' | 'op' | 'lparen' | 'rparen' | 'at' | 'comma' | 'end';

export interface Token {
  readonly kind: TokenKind;
  /** The text as typed (for strings: the value without quotes; for identifiers: lower case). */
  readonly text: string;
  /** Numeric value of a number token. */
  readonly value: number;
  /** 1-based column of the first character. */
  readonly column: number;
}

/** Longest first, so `<=` is not read as `<` then `=`. */
const OPERATORS = ['<=', '>=', '==', '!=', '<>', '<', '>', '=', '+', '-', '*', '/'] as const;

/** A number: digits with an optional fraction and exponent (`1`, `0.5`, `.5`, `1e-3`, `2.5E+7`). */
const NUMBER = /^(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?/;
const IDENT = /^[A-Za-z_][A-Za-z0-9_]*/;

/** Split `text` into tokens; the last token is always `end`. */
export function tokenize(text: string, source = '--where'): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  const push = (kind: TokenKind, tokenText: string, column: number, value = Number.NaN) =>
    tokens.push({ kind, text: tokenText, value, column });
  while (i < text.length) {
    const ch = text[i];
    const column = i + 1;
    if (/\s/.test(ch)) {
      i++;
      continue;
    }
    const rest = text.slice(i);
    const num = NUMBER.exec(rest);
    if (num !== null) {
      // `1e` or `2.5e+` followed by no digit is not a number with an exponent: say so rather than read `e`.
      if (/^[eE](?:[-+]|$|[^A-Za-z0-9_])/.test(rest.slice(num[0].length))) {
        throw filterError(text, column + num[0].length, 'an exponent needs digits (write 1e-3, not 1e-)', source);
      }
      const value = Number(num[0]);
      if (!Number.isFinite(value)) throw filterError(text, column, `number ${num[0]} is out of range`, source);
      push('number', num[0], column, value);
      i += num[0].length;
      continue;
    }
    const id = IDENT.exec(rest);
    if (id !== null) {
      push('ident', id[0].toLowerCase(), column);
      i += id[0].length;
      continue;
    }
    if (ch === "'" || ch === '"') {
      const close = text.indexOf(ch, i + 1);
      if (close < 0) throw filterError(text, column, `this ${ch} string is never closed`, source);
      push('string', text.slice(i + 1, close), column);
      i = close + 1;
      continue;
    }
    if (ch === '(' || ch === ')' || ch === '@' || ch === ',') {
      push(ch === '(' ? 'lparen' : ch === ')' ? 'rparen' : ch === '@' ? 'at' : 'comma', ch, column);
      i++;
      continue;
    }
    const op = OPERATORS.find((o) => rest.startsWith(o));
    if (op !== undefined) {
      push('op', op, column);
      i += op.length;
      continue;
    }
    throw filterError(
      text,
      column,
      `unexpected character ${JSON.stringify(ch)}: the grammar has names, numbers, 'strings', comparisons (< <= > >= = !=), + - * /, and, or, not, parentheses and name@<t>myr`,
      source,
    );
  }
  push('end', '', text.length + 1);
  return tokens;
}
