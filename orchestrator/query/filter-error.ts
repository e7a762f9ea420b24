/**
 * Errors of the query grammar: `input/invalid-filter` (exit 2) with the column of the mistake and the input
 * shown with a caret under it, so the message works in a terminal and in a log.
 */
import { DisksweepError } from '../../shared/errors.js';

/** Longest input echoed in an error; longer filters are shown around the mistake. */
const ECHO_CHARS = 100;

/** The input (or a window of it around `column`) and a caret line under the column. */
export function caretLines(text: string, column: number): string[] {
  const flat = text.replace(/[\r\n\t]/g, ' ');
  const start = flat.length <= ECHO_CHARS ? 0 : Math.max(0, Math.min(column - 1 - ECHO_CHARS / 2, flat.length - ECHO_CHARS));
  const shown = flat.slice(start, start + ECHO_CHARS);
  const prefix = start > 0 ? '...' : '';
  return [`${prefix}${shown}${start + ECHO_CHARS < flat.length ? '...' : ''}`, `${' '.repeat(prefix.length + column - 1 - start)}^`];
}

/**
 * @param text the whole filter as given
 * @param column 1-based column of the mistake (text.length + 1 = at the end)
 * @param message what is wrong and what is allowed
 * @param source which input this is (`--where`, or a target's own condition)
 */
export function filterError(text: string, column: number, message: string, source = '--where'): DisksweepError {
  return new DisksweepError('input/invalid-filter', `${source}: column ${column}: ${message}`, { details: caretLines(text, column) });
}
