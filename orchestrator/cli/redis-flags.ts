/**
 * The flags that select and tune the distributed transport, shared by `run`, `resume`, `work` and `cancel`.
 * Only `--redis URL` or DISKSWEEP_REDIS_URL selects Redis (a generic REDIS_URL never does).
 */
import { Option, type Command } from 'commander';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { redact } from '../../shared/redact.js';
import { parseRedisTarget, urlHasPassword, type RedisTarget } from '../../shared/redis/redis-connection.js';

export interface RedisFlags {
  redis?: string;
  redisPasswordFile?: string;
  redisPrefix?: string;
  maxQueued?: string;
  lockMs?: string;
  stalledMs?: string;
}

/** Where the Redis is and how to log in: every command that talks to Redis. */
export const redisConnectionOptions = (): Option[] => [
  new Option('--redis <url>', 'the Redis that carries the sweep\'s chunks (redis://, or rediss:// for TLS); or set DISKSWEEP_REDIS_URL'),
  new Option('--redis-password-file <file>', 'read the Redis password from this file (keeps it off the command line)'),
  new Option('--redis-prefix <prefix>', 'key prefix in Redis (default: disksweep, or DISKSWEEP_REDIS_PREFIX)'),
];

/** The connection flags and the lock tuning: commands that run chunks (run, resume, work). */
export const redisOptions = (): Option[] => [
  ...redisConnectionOptions(),
  new Option('--lock-ms <ms>', 'chunk lock duration: a dead worker\'s chunk is taken again after about this long (default 30000)'),
  new Option('--stalled-ms <ms>', 'how often workers look for chunks of dead workers (default 30000)'),
];

export const maxQueuedOption = (): Option => new Option('--max-queued <n>', 'chunks enqueued in Redis and not yet committed, at most (default 2000)');

const intFlag = (name: string, text: string | undefined, dflt: number, min: number, max: number): number => {
  if (text === undefined) return dflt;
  const r = z.coerce.number().int().min(min).max(max).safeParse(text);
  if (!r.success) throw new DisksweepError('input/invalid-flag', `${name}: expected a whole number from ${min} to ${max} (got "${text}")`);
  return r.data;
};

export interface RedisSettings {
  readonly target: RedisTarget;
  /** The URL without its password: safe to print in a suggested command. */
  readonly publicUrl: string;
  /** True when a password is in use (from the URL or --redis-password-file). */
  readonly hasPassword: boolean;
  readonly maxQueued: number;
  readonly lockMs: number;
  readonly stalledMs: number;
}

function withoutPassword(url: string): string {
  const u = new URL(url); // parseRedisTarget has accepted it
  u.password = '';
  return redact(u.toString());
}

/** The Redis settings the flags ask for, or undefined for the embedded transport. Warns about a password in argv. */
export function redisSettings(opts: RedisFlags, warn: (line: string) => void): RedisSettings | undefined {
  const fromEnv = process.env.DISKSWEEP_REDIS_URL;
  const url = opts.redis ?? (fromEnv === undefined || fromEnv === '' ? undefined : fromEnv);
  if (url === undefined) {
    if (opts.redisPasswordFile !== undefined) throw new DisksweepError('input/invalid-flag', '--redis-password-file needs --redis URL (or DISKSWEEP_REDIS_URL)');
    return undefined;
  }
  const target = parseRedisTarget({ url, passwordFile: opts.redisPasswordFile, prefix: opts.redisPrefix ?? (process.env.DISKSWEEP_REDIS_PREFIX || undefined) });
  if (opts.redis !== undefined && urlHasPassword(opts.redis)) {
    warn('warning: the Redis password is on the command line, where other users of this machine can see it; use --redis-password-file or DISKSWEEP_REDIS_URL');
  }
  return {
    target,
    publicUrl: withoutPassword(url),
    hasPassword: target.connection.password !== undefined && target.connection.password !== '',
    maxQueued: intFlag('--max-queued', opts.maxQueued, 2000, 1, 1_000_000),
    lockMs: intFlag('--lock-ms', opts.lockMs, 30_000, 500, 3_600_000),
    stalledMs: intFlag('--stalled-ms', opts.stalledMs, 30_000, 200, 3_600_000),
  };
}

/**
 * The flags that reach this Redis again, for a command printed for copying (`disksweep work ...`, the resume
 * hint): the URL without its password, `--redis-password-file FILE` when a password is in use, the prefix.
 */
export function redisFlagsForCommand(settings: RedisSettings): string {
  const password = settings.hasPassword ? ' --redis-password-file FILE' : '';
  const prefix = settings.target.prefix === 'disksweep' ? '' : ` --redis-prefix ${settings.target.prefix}`;
  return `--redis '${settings.publicUrl}'${password}${prefix}`;
}

/** Add the Redis flags (and --max-queued) to `run` or `resume`. */
export function withRedisOptions(command: Command): Command {
  for (const opt of [...redisOptions(), maxQueuedOption()]) command.addOption(opt);
  return command.addHelpText('after', '\nDistributed: with --redis URL (or DISKSWEEP_REDIS_URL) chunks go through Redis to `disksweep work` processes\non any machine; --workers N then also runs N worker threads here.');
}

/**
 * A test hook from the environment (nothing else sets these): a whole number of `unit` >= `min`, or undefined
 * when the variable is unset or empty.
 */
export function testHookInteger(name: string, min: number, unit: string): number | undefined {
  const text = process.env[name];
  if (text === undefined || text === '') return undefined;
  const r = z.coerce.number().int().min(min).safeParse(text);
  if (!r.success) throw new DisksweepError('input/invalid-flag', `${name}: expected a whole number of ${unit} >= ${min} (got "${text}")`);
  return r.data;
}
