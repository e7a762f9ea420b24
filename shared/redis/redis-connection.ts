/**
 * A Redis URL (`redis://` or `rediss://` for TLS) turned into the connection options BullMQ takes. Passwords
 * are registered with the one redactor (shared/redact.ts) as they are read. What is ever stored or printed about
 * a Redis is the target's `description` (host, port, db, key prefix): never a password. Both sides import this:
 * the orchestrator's transport and `disksweep work`.
 */
import { readFileSync } from 'node:fs';
import { isIP } from 'node:net';
import { DisksweepError } from '../errors.js';
import { redact, redactError, registerSecret } from '../redact.js';

/** Options handed to BullMQ (which makes its own ioredis connections from them). */
export interface RedisConnectionOptions {
  readonly host?: string;
  readonly port?: number;
  /** A unix socket instead of host and port (`redis+unix:///path/redis.sock` or `unix:///path`). */
  readonly path?: string;
  readonly username?: string;
  readonly password?: string;
  readonly db: number;
  readonly tls?: { readonly servername?: string };
}

export interface RedisTarget {
  readonly connection: RedisConnectionOptions;
  /** Key prefix of every key disksweep writes (BullMQ's `prefix`). */
  readonly prefix: string;
  /** host:port/db or the socket path, plus the prefix: what logs, the database and heartbeats may hold. */
  readonly description: string;
}

/** Wrap any error so nothing that reaches the user carries a password (message, stack and cause redacted). */
export function redactedError(error: unknown, context: string): DisksweepError {
  const wrapped = new DisksweepError('internal/unexpected', `${context}: ${redactError(error)}`);
  if (wrapped.stack !== undefined) wrapped.stack = redact(wrapped.stack);
  return wrapped;
}

export interface TargetInput {
  readonly url: string;
  /** A file whose first line is the password (overrides one in the URL). */
  readonly passwordFile?: string;
  readonly prefix?: string;
}

const PREFIX_RE = /^[A-Za-z0-9_.-]{1,64}$/;

/**
 * A URL that did not parse, for an error message: everything before its last '@' after the scheme is hidden
 * (a malformed URL may hold a password where no URL rule finds it), then the redactor runs as everywhere.
 */
function shownUrl(raw: string): string {
  const at = raw.lastIndexOf('@');
  if (at < 0) return redact(raw);
  const scheme = /^[a-z][a-z0-9+.-]*:\/*/i.exec(raw)?.[0] ?? '';
  return redact(`${scheme}***${raw.slice(at)}`);
}

export function parseRedisTarget(input: TargetInput): RedisTarget {
  let url: URL;
  try {
    url = new URL(input.url);
  } catch {
    throw new DisksweepError('input/invalid-flag', `--redis: not a URL (got "${shownUrl(input.url)}"); expected redis://[user:password@]host[:port][/db] or rediss:// for TLS`);
  }
  const passwordInUrl = url.password === '' ? undefined : decodeURIComponent(url.password);
  registerSecret(passwordInUrl);
  let password = passwordInUrl;
  if (input.passwordFile !== undefined) {
    let text: string;
    try {
      text = readFileSync(input.passwordFile, 'utf8');
    } catch (error) {
      throw new DisksweepError('input/unreadable-file', `--redis-password-file ${input.passwordFile}: cannot read it (${error instanceof Error ? error.message : String(error)})`);
    }
    password = text.split(/\r?\n/)[0];
    registerSecret(password);
  }
  const prefix = input.prefix ?? 'disksweep';
  if (!PREFIX_RE.test(prefix)) throw new DisksweepError('input/invalid-flag', `--redis-prefix: expected 1-64 letters, digits, '_', '.' or '-' (got "${prefix}")`);
  const username = url.username === '' ? undefined : decodeURIComponent(url.username);
  const scheme = url.protocol;
  if (scheme === 'redis+unix:' || scheme === 'unix:') {
    const path = decodeURIComponent(url.pathname);
    if (path === '') throw new DisksweepError('input/invalid-flag', `--redis: ${shownUrl(input.url)} names no socket path`);
    const db = dbNumber(url.searchParams.get('db') ?? '0', input.url);
    return { connection: { path, username, password, db }, prefix, description: `unix:${path} db ${db}, prefix ${prefix}` };
  }
  if (scheme !== 'redis:' && scheme !== 'rediss:') {
    throw new DisksweepError('input/invalid-flag', `--redis: expected a redis:// or rediss:// URL (got scheme "${scheme}" in "${shownUrl(input.url)}")`);
  }
  if (url.hostname === '') throw new DisksweepError('input/invalid-flag', `--redis: ${shownUrl(input.url)} names no host`);
  const host = url.hostname.replace(/^\[(.*)\]$/, '$1');
  const port = url.port === '' ? 6379 : Number(url.port);
  const db = dbNumber(url.pathname.replace(/^\//, '') || '0', input.url);
  // SNI carries host names only (RFC 6066); an IP address is checked against the certificate's IP SANs.
  const tls = scheme === 'rediss:' ? (isIP(host) === 0 ? { servername: host } : {}) : undefined;
  return {
    connection: { host, port, username, password, db, ...(tls === undefined ? {} : { tls }) },
    prefix,
    description: `${scheme === 'rediss:' ? 'rediss' : 'redis'} ${host}:${port} db ${db}, prefix ${prefix}`,
  };
}

function dbNumber(text: string, rawUrl: string): number {
  if (!/^\d{1,2}$/.test(text)) throw new DisksweepError('input/invalid-flag', `--redis: database number must be 0-99 (got "${text}" in "${shownUrl(rawUrl)}")`);
  return Number(text);
}

/** True when the URL carries a password itself (it is then visible to anyone who can list processes). */
export function urlHasPassword(rawUrl: string): boolean {
  try {
    return new URL(rawUrl).password !== '';
  } catch {
    return false;
  }
}

/** BullMQ connection options: plain fields plus what workers need (never give up on a request while Redis is away). */
export function bullConnection(c: RedisConnectionOptions): Record<string, unknown> {
  return {
    ...c,
    tls: c.tls === undefined ? undefined : { ...c.tls, ...tlsFromEnv() },
    maxRetriesPerRequest: null,
    enableOfflineQueue: true,
    retryStrategy: (times: number) => Math.min(200 * times, 2000),
  };
}

/** Extra CA certificate for TLS Redis (DISKSWEEP_REDIS_CA: a PEM file), e.g. a private CA. */
function tlsFromEnv(): Record<string, unknown> {
  const ca = process.env.DISKSWEEP_REDIS_CA;
  if (ca === undefined || ca === '') return {};
  try {
    return { ca: readFileSync(ca) };
  } catch (error) {
    throw new DisksweepError('input/unreadable-file', `DISKSWEEP_REDIS_CA ${ca}: cannot read it (${error instanceof Error ? error.message : String(error)})`);
  }
}

/** Errors that retrying cannot cure: a wrong or missing password, a certificate that does not verify. */
const FATAL_CONNECT_ERROR = /WRONGPASS|NOAUTH|invalid password|invalid username-password|certificate|self[- ]signed|unable to verify|SSL routines|wrong version number|ERR_TLS|ERR_SSL/i;

interface ErrorSource {
  on(event: 'error', listener: (error: Error) => void): unknown;
  off(event: 'error', listener: (error: Error) => void): unknown;
}

/**
 * Wait until a BullMQ queue or worker is connected. A wrong password or a TLS certificate that does not verify
 * fails at once; an unreachable Redis fails after `timeoutMs` (never, when it is undefined: a worker started
 * before its Redis waits for it). Every error message is redacted.
 */
export async function awaitRedis(ready: Promise<unknown>, errors: ErrorSource, description: string, timeoutMs?: number): Promise<void> {
  let last = '';
  let onError: ((error: Error) => void) | undefined;
  let timer: NodeJS.Timeout | undefined;
  const failed = new Promise<never>((_resolve, reject) => {
    onError = (error: Error): void => {
      last = redactError(error);
      if (FATAL_CONNECT_ERROR.test(error.message) || FATAL_CONNECT_ERROR.test(String((error as { code?: unknown }).code ?? ''))) {
        reject(new DisksweepError('input/redis-refused', `Redis at ${description} refused this connection: ${last}`, {
          details: ['check the password (--redis-password-file, or the URL) and, for rediss://, the certificate (DISKSWEEP_REDIS_CA names a private CA)'],
        }));
      }
    };
    errors.on('error', onError);
    if (timeoutMs !== undefined) {
      timer = setTimeout(() => reject(new DisksweepError('redis/unreachable', `cannot reach Redis at ${description} within ${timeoutMs / 1000} s${last === '' ? '' : ` (last error: ${last})`}`)), timeoutMs);
    }
  });
  ready.catch(() => undefined); // it may still reject after `failed` has won: not an unhandled rejection
  try {
    await Promise.race([ready, failed]);
  } finally {
    if (onError !== undefined) errors.off('error', onError);
    clearTimeout(timer);
  }
}
