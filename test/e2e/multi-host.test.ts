/**
 * Workers on other machines, for real: two network namespaces stand in for two hosts, each reaching the Redis
 * of the root namespace only over its own veth link (no loopback, no shared address), with a password read
 * from a file as deploy/ sets it up. One `disksweep work` runs in each. Mid-sweep one host dies (`kill -9` of its worker while it holds a chunk) and the other loses its
 * network for twice the lock duration; the sweep still completes, with exactly one result per point and the
 * same rows as an embedded run. Linux + root only (CI runs as root); skipped elsewhere with the reason.
 */
import { writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { runCli, startCli, stopCli, type CliProcess } from '../support/cli.js';
import { createNetnsHosts, netnsUnavailable, removeStaleNetns, type NetnsHost, type NetnsLab } from '../support/netns.js';
import { startTestRedis, uniquePrefix, type TestRedis } from '../support/redis-harness.js';
import { deterministicRows, resultCount, resultsPerPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';
import { waitFor } from '../support/wait.js';

const unavailable = netnsUnavailable();
const LOCK_MS = 2000;
const TIMING = ['--lock-ms', String(LOCK_MS), '--stalled-ms', '1000'];
/** 60 small models (tens of ms each) in 30 chunks: enough left to do when the faults strike. */
const POINTS = 60;
const spec = { ...gridSpec('tern-two-hosts', 10, 6, 2), model: { n_cells: 80, t_end_myr: 1, checkpoints_myr: [0.5, 1] } };
const summary = z.object({ done: z.number(), failed: z.number(), total: z.number(), interrupted: z.boolean() });

const tmp = useTempDir();
let lab: NetnsLab | null = null;
let redis: TestRedis | null = null;
const procs: CliProcess[] = [];

/** Source addresses of Redis's clients now (CLIENT LIST `addr=IP:PORT`). */
const clientAddresses = (r: TestRedis): Set<string> =>
  new Set([...r.cli(['client', 'list']).matchAll(/\baddr=([0-9.]+):\d+/g)].map((m) => m[1]));

function workerOn(host: NetnsHost, prefix: string, passwordFile: string): CliProcess {
  const url = `redis://${host.rootAddress}:${redis?.port ?? 0}`;
  const args = ['work', '--redis', url, '--redis-password-file', passwordFile, '--redis-prefix', prefix, '--concurrency', '1', '--verbose', ...TIMING];
  const p = startCli(args, { wrapper: host.wrapper, group: true, timeoutMs: 240_000 });
  procs.push(p);
  return p;
}

const lastLine = (p: CliProcess): string => p.stderr().trim().split('\n').at(-1) ?? '';

describe.skipIf(unavailable !== null)(`workers on two hosts (network namespaces)${unavailable === null ? '' : ` — skipped: ${unavailable}`}`, () => {
  beforeAll(() => {
    removeStaleNetns();
    lab = createNetnsHosts(2);
  });
  afterAll(async () => {
    await Promise.all(procs.splice(0).map((p) => stopCli(p)));
    await redis?.stop();
    lab?.destroy();
  });

  it('survive a dead host and a cut link: one result per point, the same rows as an embedded run', async () => {
    if (lab === null) throw new Error('no namespaces');
    const [a, b] = lab.hosts;
    const file = writeSpec(tmp.path, 'tern.yaml', spec);
    const embedded = runCli(['run', file, '--db', tmp.file('embedded.sqlite'), '--workers', '2', '--json']);
    expect(embedded.status, embedded.stderr).toBe(0);

    // Redis listens on the two root-side link addresses only: a host can reach it over its own link alone.
    // It wants a password, as deploy/ sets it up; every process reads it from a file.
    const password = `tern-${uniquePrefix('pw')}`;
    const passwordFile = tmp.file('redis-password');
    writeFileSync(passwordFile, `${password}\n`, { mode: 0o600 });
    redis = await startTestRedis({ bind: [a.rootAddress, b.rootAddress], password });
    const prefix = uniquePrefix('hosts');
    const victim = workerOn(a, prefix, passwordFile);
    const cut = workerOn(b, prefix, passwordFile);
    await Promise.all([victim, cut].map((w) => w.waitForStderr(/ready: model version/, 30_000)));
    expect(victim.stderr()).toContain(`redis ${a.rootAddress}:${redis.port}`);
    expect(cut.stderr()).toContain(`redis ${b.rootAddress}:${redis.port}`);

    const db = tmp.file('hosts.sqlite');
    const run = startCli(['run', file, '--db', db, '--redis', redis.url, '--redis-password-file', passwordFile, '--redis-prefix', prefix, ...TIMING, '--json'], { group: true, timeoutMs: 240_000 });
    procs.push(run);

    // Both hosts take chunks, and their connections come from their own link addresses.
    await waitFor(() => /results sent/.test(victim.stderr()) && /results sent/.test(cut.stderr()), {
      timeoutMs: 90_000, what: () => `both workers to send results; host A:\n${victim.stderr()}\nhost B:\n${cut.stderr()}`,
    });
    const clients = clientAddresses(redis);
    expect(clients.has(a.hostAddress) && clients.has(b.hostAddress), `clients of Redis: ${[...clients].join(', ')}`).toBe(true);
    for (const address of clients) expect([a.hostAddress, b.hostAddress, a.rootAddress, b.rootAddress]).toContain(address);

    // Observed state, not a timer: rows committed, and host A's worker in the middle of a chunk.
    await waitFor(() => resultCount(db) >= 6, { timeoutMs: 60_000, what: () => `6 committed rows; run:\n${run.stderr()}` });
    await waitFor(() => /: started \(/.test(lastLine(victim)), { timeoutMs: 30_000, what: () => `host A to hold a chunk; its log:\n${victim.stderr()}` });
    const killed = await victim.killGroup('SIGKILL');
    expect(killed.signal).toBe('SIGKILL');

    // Host B loses its network for twice the lock duration while it holds a chunk: that lock expires while B
    // cannot renew it.
    await waitFor(() => /: started \(/.test(lastLine(cut)), { timeoutMs: 30_000, what: () => `host B to hold a chunk; its log:\n${cut.stderr()}` });
    b.setLink(false);
    const atCut = resultCount(db);
    expect(atCut, 'the sweep should still have work when the link goes down').toBeLessThan(POINTS);
    const cutLogLength = cut.stderr().length;
    await new Promise((resolve) => setTimeout(resolve, 2 * LOCK_MS));
    b.setLink(true);

    const r = await run.exited;
    expect(r.status, `${r.stderr}\nhost B:\n${cut.stderr()}`).toBe(0);
    expect(summary.parse(JSON.parse(r.stdout))).toEqual({ done: POINTS, failed: 0, total: POINTS, interrupted: false });
    // Host B came back and finished the work (host A is dead); finding its lock gone was logged, not fatal.
    const afterCut = cut.stderr().slice(cutLogLength);
    expect(afterCut).toMatch(/results sent/);
    expect(afterCut).toMatch(/lock/i);
    expect(cut.done, `host B's worker exited:\n${cut.stderr()}`).toBe(false);
    expect(resultsPerPoint(db)).toEqual({ points: POINTS, results: POINTS, maxPerPoint: 1 });
    expect(deterministicRows(db)).toEqual(deterministicRows(tmp.file('embedded.sqlite')));
    for (const log of [r.stderr, r.stdout, victim.stderr(), cut.stderr()]) expect(log).not.toContain(password);
  }, 240_000);
});
