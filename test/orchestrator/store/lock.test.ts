/**
 * The sweep lock: a second owner fails naming the first one's host and pid while it lives; a dead owner on
 * this host, or one whose heartbeat went stale, is taken over; the old owner then learns it lost the lock.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { hostname } from 'node:os';
import { afterEach, describe, expect, it } from 'vitest';
import { EXIT_FAILURE, exitCodeFor } from '../../../shared/errors.js';
import { isPidAlive } from '../../../orchestrator/store/store-lock.js';
import { openStore } from '../../../orchestrator/store/sweep-store.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();
const children: ChildProcess[] = [];

afterEach(() => {
  for (const c of children.splice(0)) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
});

/** A real process that stays alive until killed. */
function liveChild(): ChildProcess & { pid: number } {
  const child = spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' });
  children.push(child);
  if (child.pid === undefined) throw new Error('could not start a child process');
  return child as ChildProcess & { pid: number };
}

function killAndWait(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    child.once('exit', () => resolve());
    child.kill('SIGKILL');
  });
}

function caught(fn: () => unknown): unknown {
  try {
    fn();
  } catch (error) {
    return error;
  }
  return undefined;
}

describe('sweep lock', () => {
  it('refuses a second owner while the first lives, naming host and pid; takes over once it is dead', async () => {
    const file = tmp.file('lock.sqlite');
    const host = hostname();
    const child = liveChild();
    const first = openStore(file, { mode: 'write' });
    expect(first.acquireLock({ host, pid: child.pid })).toEqual({ kind: 'acquired' });
    expect(first.acquireLock({ host, pid: child.pid })).toEqual({ kind: 'reacquired' });

    const second = openStore(file, { mode: 'write' });
    const error = caught(() => second.acquireLock({ host, pid: process.pid }));
    expect(error).toMatchObject({ code: 'store/locked' });
    expect(exitCodeFor(error)).toBe(EXIT_FAILURE);
    expect((error as Error).message).toContain(`host ${host}, pid ${child.pid}`);
    expect(second.lockOwner()).toMatchObject({ host, pid: child.pid });

    await killAndWait(child);
    expect(isPidAlive(child.pid)).toBe(false);
    const outcome = second.acquireLock({ host, pid: process.pid });
    expect(outcome).toMatchObject({ kind: 'taken-over', previous: { host, pid: child.pid } });
    expect(second.lockOwner()).toMatchObject({ host, pid: process.pid });

    // The first store learns at its next heartbeat that it lost the lock.
    expect(() => first.heartbeat()).toThrow(expect.objectContaining({ code: 'store/lock-lost', message: expect.stringContaining(`pid ${process.pid}`) }));
    first.close();
    expect(second.lockOwner()).toMatchObject({ pid: process.pid }); // closing the loser did not free the winner's lock

    second.close(); // releases
    const third = openStore(file, { mode: 'write' });
    expect(third.lockOwner()).toBeUndefined();
    third.close();
  });

  it('takes over a lock whose heartbeat is older than the stale limit, and only then', () => {
    const file = tmp.file('stale.sqlite');
    let t = 1_800_000_000_000;
    const clock = () => t;
    const remote = openStore(file, { mode: 'write', now: clock });
    remote.acquireLock({ host: 'node-17.cluster', pid: 4242 });

    const local = openStore(file, { mode: 'write', now: clock });
    t += 30_000;
    expect(() => local.acquireLock({ host: hostname(), pid: process.pid })).toThrow(/host node-17\.cluster, pid 4242.*last heartbeat 30 s ago/);
    remote.heartbeat(); // the remote owner is alive and says so
    t += 59_000;
    expect(() => local.acquireLock({ host: hostname(), pid: process.pid })).toThrow(expect.objectContaining({ code: 'store/locked' }));
    t += 2_000; // 61 s since the last heartbeat
    expect(local.acquireLock({ host: hostname(), pid: process.pid })).toMatchObject({
      kind: 'taken-over',
      previous: { host: 'node-17.cluster', pid: 4242 },
    });
    expect(() => remote.heartbeat()).toThrow(expect.objectContaining({ code: 'store/lock-lost' }));
    local.heartbeat();
    expect(local.lockOwner()?.heartbeatAt).toBe(t);
    local.releaseLock();
    expect(local.lockOwner()).toBeUndefined();
    remote.close();
    local.close();
  });

  it('scopes a lock to one sweep when asked', () => {
    const file = tmp.file('scoped.sqlite');
    const a = openStore(file, { mode: 'write', pidAlive: () => true });
    const b = openStore(file, { mode: 'write', pidAlive: () => true });
    a.acquireLock({ host: 'h', pid: 1, scope: 'sweep-one' });
    expect(b.acquireLock({ host: 'h', pid: 2, scope: 'sweep-two' })).toEqual({ kind: 'acquired' });
    expect(() => b.acquireLock({ host: 'h', pid: 2, scope: 'sweep-one' })).toThrow(/already holds the lock of scope sweep-two/);
    const c = openStore(file, { mode: 'write', pidAlive: () => true });
    expect(() => c.acquireLock({ host: 'h', pid: 3, scope: 'sweep-one' })).toThrow(/host h, pid 1/);
    a.close();
    b.close();
    c.close();
  });
});
