/**
 * A Redis of the test's own: a `redis-server` process on a free port (or a unix socket), without persistence,
 * in its own temp directory and process group, so a test can kill it (-9) and start it again empty. Without
 * `redis-server` on PATH the harness falls back to DISKSWEEP_TEST_REDIS_URL (a Redis it does not own: never
 * flushed, never killed; tests that must kill Redis then fail with a message saying so). Every test uses its own
 * key prefix (`uniquePrefix`).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { waitFor } from './wait.js';

export interface RedisServerOptions {
  /** Require this password (`requirepass`). */
  readonly password?: string;
  /** Serve TLS only, with these PEM files (the port then speaks TLS; the URL is rediss://). */
  readonly tls?: { readonly cert: string; readonly key: string; readonly ca: string };
  /** Listen on these IPv4 addresses instead of 127.0.0.1 (the URL names the first). */
  readonly bind?: readonly string[];
}

export interface TestRedis {
  /** redis:// (or rediss://) URL without the password. */
  readonly url: string;
  readonly host: string;
  readonly port: number;
  /** True when this harness started the server (it may kill, restart and inspect it freely). */
  readonly owned: boolean;
  /** SIGKILL the server's process group and wait until it has exited. */
  kill(): Promise<void>;
  /** Start it again on the same port, empty (no persistence). */
  restart(): Promise<void>;
  /** Stop it and remove its directory (test clean-up). */
  stop(): Promise<void>;
  /** Run redis-cli against it (owned servers only): stdout. */
  cli(args: readonly string[]): string;
}

export const hasRedisServer = (): boolean => spawnSync('redis-server', ['--version'], { encoding: 'utf8' }).status === 0;

/** A key prefix no other test uses. */
export const uniquePrefix = (label = 't'): string => `${label}-${randomBytes(4).toString('hex')}`;

/** A TCP port nobody listens on at `host` now. */
export async function freePort(host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, host, () => {
      const address = server.address();
      const port = typeof address === 'object' && address !== null ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

export async function startTestRedis(options: RedisServerOptions = {}): Promise<TestRedis> {
  if (!hasRedisServer()) {
    const url = process.env.DISKSWEEP_TEST_REDIS_URL;
    if (url === undefined || url === '') throw new Error('no redis-server on PATH and DISKSWEEP_TEST_REDIS_URL is not set: the Redis tests need one of them');
    const parsed = new URL(url);
    const notOwned = (what: string) => async (): Promise<void> => {
      throw new Error(`${what} needs a redis-server this test started; DISKSWEEP_TEST_REDIS_URL (${parsed.host}) is not ours to ${what}`);
    };
    return {
      url, host: parsed.hostname, port: Number(parsed.port || 6379), owned: false,
      kill: notOwned('kill'), restart: notOwned('restart'), stop: async () => undefined,
      cli: () => {
        throw new Error('redis-cli inspection needs a redis-server this test started');
      },
    };
  }
  const dir = mkdtempSync(join(tmpdir(), 'disksweep-redis-'));
  const bind = options.bind ?? ['127.0.0.1'];
  let port = 0;
  let args: string[] = [];
  const useFreePort = async (): Promise<void> => {
    port = await freePort(bind[0]);
    args = ['--bind', ...bind, '--save', '', '--appendonly', 'no', '--dir', dir, '--protected-mode', 'no'];
    if (options.tls === undefined) args.push('--port', String(port));
    else args.push('--port', '0', '--tls-port', String(port), '--tls-cert-file', options.tls.cert, '--tls-key-file', options.tls.key, '--tls-ca-cert-file', options.tls.ca, '--tls-auth-clients', 'no');
    if (options.password !== undefined) args.push('--requirepass', options.password);
  };
  let child: ChildProcess | null = null;
  let log = '';

  const launch = async (): Promise<void> => {
    log = '';
    const c = spawn('redis-server', args, { detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    child = c;
    c.stdout?.setEncoding('utf8').on('data', (s: string) => (log += s));
    c.stderr?.setEncoding('utf8').on('data', (s: string) => (log += s));
    let exited = false;
    c.once('exit', () => (exited = true));
    await waitFor(() => {
      if (exited) throw new Error(`redis-server exited while starting:\n${log}`);
      return /Ready to accept connections/.test(log);
    }, { timeoutMs: 15_000, what: () => `redis-server on port ${port} to accept connections; its log:\n${log}` });
  };

  const kill = async (): Promise<void> => {
    const c = child;
    if (c === null || c.exitCode !== null || c.signalCode !== null) return;
    const gone = new Promise<void>((resolve) => c.once('exit', () => resolve()));
    try {
      process.kill(-(c.pid ?? 0), 'SIGKILL');
    } catch {
      c.kill('SIGKILL');
    }
    await gone;
    child = null;
  };

  // The probe socket of freePort is closed before redis-server binds, so a server of another test file may
  // take the port in between: then start again on another one (only the first start; restarts keep theirs).
  for (let attempt = 1; ; attempt++) {
    await useFreePort();
    try {
      await launch();
      break;
    } catch (error) {
      if (attempt >= 5 || !/Address already in use/i.test(log)) throw error;
    }
  }
  const cliBase = ['-h', bind[0], '-p', String(port), ...(options.tls === undefined ? [] : ['--tls', '--cacert', options.tls.ca]), ...(options.password === undefined ? [] : ['--no-auth-warning', '-a', options.password])];
  return {
    url: `${options.tls === undefined ? 'redis' : 'rediss'}://${bind[0]}:${port}`,
    host: bind[0],
    port,
    owned: true,
    kill,
    restart: async () => {
      await kill();
      await launch();
    },
    stop: async () => {
      await kill();
      rmSync(dir, { recursive: true, force: true });
    },
    cli: (cliArgs) => {
      const r = spawnSync('redis-cli', [...cliBase, ...cliArgs], { encoding: 'utf8' });
      if (r.status !== 0) throw new Error(`redis-cli ${cliArgs.join(' ')} failed: ${r.stderr}`);
      return r.stdout;
    },
  };
}

/** Every key and value under a prefix as text (owned servers): to check what Redis holds. */
export function dumpKeys(redis: TestRedis, pattern = '*'): string {
  const keys = redis.cli(['--scan', '--pattern', pattern]).split('\n').filter((k) => k !== '');
  const parts: string[] = [];
  for (const key of keys) {
    const type = redis.cli(['type', key]).trim();
    const read: Record<string, string[]> = {
      string: ['get', key], hash: ['hgetall', key], list: ['lrange', key, '0', '-1'], set: ['smembers', key],
      zset: ['zrange', key, '0', '-1'], stream: ['xrange', key, '-', '+'],
    };
    parts.push(`${key} (${type}): ${read[type] === undefined ? '' : redis.cli(read[type])}`);
  }
  return parts.join('\n');
}
