/**
 * The namespace lab the multi-host test and bench stand on: a host's only route is its own link, a cut link
 * takes it away, stale leftovers of dead runs are removed while a live run's namespaces are never touched, and
 * destroy() leaves nothing behind. Linux + root only (CI); skipped elsewhere with the reason.
 */
import { spawnSync } from 'node:child_process';
import { afterEach, describe, expect, it } from 'vitest';
import { createNetnsHosts, netnsUnavailable, removeStaleNetns, type NetnsLab } from './netns.js';

const unavailable = netnsUnavailable();
const ip = (...args: string[]): string => spawnSync('ip', args, { encoding: 'utf8' }).stdout;
const namespaces = (): string[] => ip('netns', 'list').split('\n').map((l) => l.split(' ')[0]).filter((n) => n !== '');
const links = (): string[] => ip('-o', 'link', 'show').split('\n').map((l) => /^\d+:\s+([^:@\s]+)/.exec(l)?.[1] ?? '').filter((n) => n !== '');

let lab: NetnsLab | null = null;
afterEach(() => {
  lab?.destroy();
  lab = null;
});

describe.skipIf(unavailable !== null)(`network-namespace lab${unavailable === null ? '' : ` — skipped: ${unavailable}`}`, () => {
  it("gives each host one route, over its own link, and a cut link takes it away", () => {
    lab = createNetnsHosts(2);
    const [a, b] = lab.hosts;
    expect(a.rootAddress).not.toBe(b.rootAddress);
    for (const h of [a, b]) {
      const routes = ip('-n', h.name, '-4', 'route', 'show').trim().split('\n');
      expect(routes).toHaveLength(1);
      expect(routes[0]).toMatch(new RegExp(`^10\\.211\\.\\d+\\.\\d+/30 dev ${h.name}h .*src ${h.hostAddress.replace(/\./g, '\\.')}`));
      expect(ip('-4', 'addr', 'show', 'dev', `${h.name}r`)).toContain(`${h.rootAddress}/30`);
    }
    a.setLink(false);
    expect(ip('-n', a.name, '-4', 'route', 'show').trim()).toBe('');
    a.setLink(true);
    expect(ip('-n', a.name, '-4', 'route', 'show')).toContain(`src ${a.hostAddress}`);
  });

  it("removes what dead runs left, never a live run's namespaces, and destroy() leaves nothing", () => {
    lab = createNetnsHosts(1);
    const live = lab.hosts[0].name;
    // A process that has exited stands in for a killed test run.
    const dead = spawnSync(process.execPath, ['-e', '0']).pid;
    const stale = `dsw-${dead.toString(36)}-ff0`;
    spawnSync('ip', ['netns', 'add', stale]);
    spawnSync('ip', ['link', 'add', `dsw-${dead.toString(36)}-ff1r`, 'type', 'veth', 'peer', 'name', `dsw-${dead.toString(36)}-ff1h`]);
    expect(namespaces()).toContain(stale);

    const removed = removeStaleNetns();
    expect(removed).toContain(stale);
    expect(removed).toContain(`dsw-${dead.toString(36)}-ff1r`);
    expect(namespaces()).not.toContain(stale);
    expect(links().filter((l) => l.startsWith(`dsw-${dead.toString(36)}-`))).toEqual([]);
    expect(namespaces()).toContain(live);

    lab.destroy();
    lab = null;
    expect(namespaces()).not.toContain(live);
    expect(links().filter((l) => l.startsWith(live))).toEqual([]);
  });
});
