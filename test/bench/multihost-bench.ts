/**
 * Throughput of a sweep whose two `disksweep work` processes sit in two network namespaces (each reaching Redis
 * over its own veth link, as machines on a LAN would; see test/support/netns.ts) against the same sweep with
 * both workers on loopback. Ratio = netns points/s over loopback points/s: about 1 means the network path
 * costs nothing a sweep notices. Two sweeps: real small models (what a user runs) and no-op models (the
 * per-chunk transport overhead alone, where a slower path would show first). Loopback and netns rounds
 * alternate so a load spike hits both. Needs Linux, root, `ip` and `redis-server`; otherwise skipped with the
 * reason.
 */
import Database from 'better-sqlite3';
import { spawn, type ChildProcess } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createNetnsHosts, netnsUnavailable, removeStaleNetns, type NetnsLab } from '../support/netns.js';
import { hasRedisServer, startTestRedis, uniquePrefix, type TestRedis } from '../support/redis-harness.js';
import { waitFor } from '../support/wait.js';
import { median, progress, sig } from './stats.js';
import { CLI_PATH, EFFICIENCY_SPEC, NOOP_MODEL_PATH } from './sweep-bench.js';
import { withTempDirAsync } from './temp-files.js';

const ROUNDS = 3;
const READY_TIMEOUT_MS = 30_000;
const SWEEP_TIMEOUT_MS = 180_000;

interface Proc {
  readonly child: ChildProcess;
  stderr(): string;
  /** When stderr first matched `pattern` (performance.now() ms), or null. */
  seenAt(pattern: RegExp): number | null;
  readonly exited: Promise<number | null>;
}

function start(command: readonly string[], args: readonly string[], env: Record<string, string>): Proc {
  const [cmd, ...prefix] = [...command, process.execPath];
  const child = spawn(cmd, [...prefix, CLI_PATH, ...args], { env: { ...process.env, ...env }, stdio: ['ignore', 'ignore', 'pipe'] });
  let err = '';
  const pieces: { t: number; text: string }[] = [];
  child.stderr?.setEncoding('utf8').on('data', (s: string) => {
    err += s;
    pieces.push({ t: performance.now(), text: err });
  });
  const exited = new Promise<number | null>((resolve) => child.on('close', (code) => resolve(code)));
  return { child, stderr: () => err, seenAt: (pattern) => pieces.find((p) => pattern.test(p.text))?.t ?? null, exited };
}

/** Wait until `p`'s log matches `pattern`; fail at once if it exits first. */
function until(what: string, p: Proc, pattern: RegExp, timeoutMs: number): Promise<void> {
  return waitFor(() => {
    if (p.child.exitCode !== null) throw new Error(`${what} exited before ${pattern} in its log:\n${p.stderr()}`);
    return pattern.test(p.stderr());
  }, { timeoutMs, everyMs: 50, what: () => `${what}: ${pattern} in its log:\n${p.stderr()}` });
}

interface Sweep {
  readonly label: string;
  readonly spec: Record<string, unknown>;
  /** Model module for the workers' pool threads (null: the disk model). */
  readonly model: string | null;
}

const SWEEPS: readonly Sweep[] = [
  {
    label: 'real_models',
    spec: { ...EFFICIENCY_SPEC, name: 'bench-multihost-real', vary: { ...EFFICIENCY_SPEC.vary, m_disk_msun: { log: [0.01, 0.1], count: 12 } } },
    model: null,
  },
  {
    label: 'noop_models',
    spec: { ...EFFICIENCY_SPEC, name: 'bench-multihost-noop', vary: { m_disk_msun: { log: [0.01, 0.1], count: 40 }, alpha_active: { log: [1e-3, 3e-2], count: 25 } }, chunks: { size: 5 } },
    model: NOOP_MODEL_PATH,
  },
];

/** Where the two workers run and which Redis address each uses. */
interface Placement {
  readonly redis: TestRedis;
  readonly workers: readonly { wrapper: readonly string[]; url: string }[];
}

/**
 * Steady-state commit rate (points/s) between the 10th and the 90th percentile of the results' commit times:
 * start-up (process, sweep discovery by the workers' registry poll, POLL_MS in worker/queue-worker.ts) and the
 * tail of the last chunks left out.
 */
function steadyRate(dbFile: string): number {
  const db = new Database(dbFile, { readonly: true });
  try {
    const t = db.prepare('SELECT finished_at FROM results ORDER BY finished_at').pluck().all() as number[];
    const lo = Math.floor(0.1 * t.length);
    const hi = Math.ceil(0.9 * t.length) - 1;
    return (hi - lo) / ((t[hi] - t[lo]) / 1000);
  } finally {
    db.close();
  }
}

interface SweepTiming {
  readonly points: number;
  /** Points over the time from the first worker taking the sweep to the run's exit. */
  readonly wallRate: number;
  readonly steadyRate: number;
}

/** One sweep with two fresh workers (one thread each) placed as given. */
async function timeSweep(dir: string, sweep: Sweep, place: Placement, round: number, where: string): Promise<SweepTiming> {
  const prefix = uniquePrefix('bench');
  const env: Record<string, string> = sweep.model === null ? {} : { DISKSWEEP_MODEL_MODULE: sweep.model };
  const workers = place.workers.map((w) => start(w.wrapper, ['work', '--redis', w.url, '--redis-prefix', prefix, '--concurrency', '1'], env));
  try {
    await Promise.all(workers.map((w, i) => until(`worker ${i} (${where})`, w, /ready: model version/, READY_TIMEOUT_MS)));
    const specFile = join(dir, `${sweep.label}-${where}-${round}.json`);
    writeFileSync(specFile, JSON.stringify(sweep.spec));
    const dbFile = join(dir, `${sweep.label}-${where}-${round}.sqlite`);
    const run = start([], ['run', specFile, '--db', dbFile, '--redis', place.redis.url, '--redis-prefix', prefix], {});
    const timer = setTimeout(() => run.child.kill('SIGKILL'), SWEEP_TIMEOUT_MS);
    const code = await run.exited;
    const t1 = performance.now();
    clearTimeout(timer);
    // From the first worker taking the sweep's chunks (process start-up and planning excluded) to the run's exit.
    const taken = workers.map((w) => w.seenAt(/taking chunks of sweep/)).filter((t): t is number => t !== null);
    if (taken.length === 0) throw new Error(`${sweep.label} (${where}): no worker took a chunk`);
    const seconds = (t1 - Math.min(...taken)) / 1000;
    if (code !== 0) throw new Error(`${sweep.label} (${where}) exited ${code}:\n${run.stderr()}`);
    const points = Number(/(\d+) points in/.exec(run.stderr())?.[1] ?? NaN);
    return { points, wallRate: points / seconds, steadyRate: steadyRate(dbFile) };
  } finally {
    for (const w of workers) w.child.kill('SIGKILL');
    await Promise.all(workers.map((w) => w.exited));
  }
}

export type MultiHostReport =
  | { skipped: true; reason: string }
  | {
      skipped: false;
      how: string;
      [sweep: string]: unknown;
    };

export async function benchMultiHost(): Promise<MultiHostReport> {
  const reason = netnsUnavailable() ?? (hasRedisServer() ? null : 'no redis-server on PATH');
  if (reason !== null) {
    progress(`multi_host skipped: ${reason}`);
    return { skipped: true, reason };
  }
  removeStaleNetns();
  let lab: NetnsLab | null = null;
  const servers: TestRedis[] = [];
  try {
    lab = createNetnsHosts(2);
    const [a, b] = lab.hosts;
    const loopRedis = await startTestRedis();
    servers.push(loopRedis);
    const netRedis = await startTestRedis({ bind: [a.rootAddress, b.rootAddress] });
    servers.push(netRedis);
    const loopback: Placement = { redis: loopRedis, workers: [{ wrapper: [], url: loopRedis.url }, { wrapper: [], url: loopRedis.url }] };
    const netns: Placement = {
      redis: netRedis,
      workers: [a, b].map((h) => ({ wrapper: h.wrapper, url: `redis://${h.rootAddress}:${netRedis.port}` })),
    };
    const sections: Record<string, unknown> = {};
    await withTempDirAsync('disksweep-bench-multihost-', async (dir) => {
      for (const sweep of SWEEPS) {
        const rates = { loopback: [] as SweepTiming[], netns: [] as SweepTiming[] };
        let points = 0;
        for (let round = 0; round < ROUNDS; round++) {
          progress(`multi_host: ${sweep.label}, round ${round + 1}/${ROUNDS} (loopback, then two namespaces)`);
          for (const [where, place] of [['loopback', loopback], ['netns', netns]] as const) {
            const r = await timeSweep(dir, sweep, place, round, where);
            rates[where].push(r);
            points = r.points;
          }
        }
        const loop = median(rates.loopback.map((r) => r.steadyRate));
        const net = median(rates.netns.map((r) => r.steadyRate));
        const loopWall = median(rates.loopback.map((r) => r.wallRate));
        const netWall = median(rates.netns.map((r) => r.wallRate));
        sections[sweep.label] = {
          points,
          loopback_points_per_s: sig(loop),
          netns_points_per_s: sig(net),
          ratio_netns_over_loopback: sig(net / loop, 3),
          loopback_points_per_s_wall: sig(loopWall),
          netns_points_per_s_wall: sig(netWall),
          ratio_wall: sig(netWall / loopWall, 3),
          rounds: ROUNDS,
        };
      }
    });
    return {
      skipped: false,
      how:
        'built CLI: `run --redis` in the root namespace, two `work --concurrency 1` started fresh per sweep, either both on ' +
        '127.0.0.1 or one in each of two network namespaces over its own veth /30; points/s = steady commit rate between the 10th and 90th percentile of results.finished_at (the _wall variants: ' +
        'points / (run exit - first worker taking the sweep)); median of rounds',
      ...sections,
    };
  } finally {
    await Promise.all(servers.map((s) => s.stop()));
    lab?.destroy();
  }
}
