/**
 * Errors with a stable code. The code is what scripts and tests match on; the message names the field, the
 * value received and what was expected. `exitCodeFor` maps every error to the process exit code the CLI uses.
 */
import { redact } from './redact.js';

/** Stable error codes. `input/*` errors are the user's to fix (exit 2); the rest are failures (exit 1). */
export type ErrorCode =
  | 'input/invalid-parameter'
  | 'input/unknown-parameter'
  | 'input/invalid-flag'
  | 'input/invalid-spec'
  | 'input/unreadable-file'
  /** A file a command was asked to write (--out, --svg, --png) cannot be written: missing directory, no permission. */
  | 'input/unwritable-file'
  | 'input/model-version'
  /** The file is not a disksweep database (not SQLite, or another program's SQLite file). */
  | 'input/not-our-database'
  /** The database was written by a newer disksweep (schema version above the one this build knows). */
  | 'input/newer-schema'
  /** A read-only command met a database whose schema a write command must upgrade first. */
  | 'input/older-schema'
  /** A read-only command was pointed at a database file that does not exist. */
  | 'input/missing-database'
  /** Redis refused the connection: a wrong password, or a TLS certificate that does not verify. */
  | 'input/redis-refused'
  /** Redis did not answer within the connection timeout. */
  | 'redis/unreachable'
  /** A --where filter (or a name inside one) that the query grammar does not accept. */
  | 'input/invalid-filter'
  /** A --target that names no target, or gives it an unknown or out-of-range argument. */
  | 'input/invalid-target'
  /** What was asked about is not recorded in this database (an output not in it yet, no ok results). */
  | 'input/no-data'
  /** Another live process owns the sweep lock of the database. */
  | 'store/locked'
  /** This process's lock was taken over (its heartbeat went stale); it must stop writing. */
  | 'store/lock-lost'
  /** A result handed to the store does not match the result schema. */
  | 'store/invalid-outcome'
  /** A row read back from the database does not match the result schema. */
  | 'store/invalid-row'
  /** The database tables disagree with the parameter table or the output registry, or migrations are missing. */
  | 'store/schema-mismatch'
  /** Results were written for a sweep the database does not hold. */
  | 'store/unknown-sweep'
  | 'internal/unexpected';

export class DisksweepError extends Error {
  override readonly name = 'DisksweepError';
  readonly code: ErrorCode;
  /** One line per offending field, e.g. `alpha_active: must be in (0, 1] (got 2)`. */
  readonly details: readonly string[];

  constructor(code: ErrorCode, message: string, options: { details?: readonly string[]; cause?: unknown } = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.code = code;
    this.details = options.details ?? [];
  }
}

/** Exit codes scripts can rely on: 0 success, 1 failure while running, 2 bad input (nothing was run). */
export const EXIT_OK = 0;
export const EXIT_FAILURE = 1;
export const EXIT_BAD_INPUT = 2;

export function exitCodeFor(error: unknown): number {
  if (error instanceof DisksweepError && error.code.startsWith('input/')) return EXIT_BAD_INPUT;
  return EXIT_FAILURE;
}

/** The one place that turns an error into the text a person reads (redacted: no password ever reaches it). */
export function describeError(error: unknown): string {
  if (error instanceof DisksweepError) {
    const lines = [`error [${error.code}]: ${error.message}`, ...error.details.map((d) => `  - ${d}`)];
    return redact(lines.join('\n'));
  }
  if (error instanceof Error) return redact(`error: ${error.message}`);
  return redact(`error: ${String(error)}`);
}
