/**
 * Network namespaces as stand-in machines: each "host" is a namespace joined to the root namespace by its own
 * veth pair on a private /30 (root side .1, host side .2) that exists only on that pair, so a process in it
 * reaches a server of the root namespace only over that link, like a machine on a LAN. Linux, root and `ip`
 * (iproute2) only; `netnsUnavailable()` says why not elsewhere.
 *
 * Names carry the owner's pid: `dsw-<pid base 36>-<lab number, 2 hex><host index>` for a namespace, plus `r`
 * / `h` for the root-side / host-side veth end (at most 15 characters, the kernel's limit). `removeStaleNetns()` deletes
 * what a dead owner left (a killed test run) and never what a live one uses: vitest runs test files in
 * parallel, and the bench may run beside the suite. Subnets are picked at random in 10.211.0.0/16 and checked
 * against every address and route of the root namespace, so two runs at once never share one.
 */
import { spawnSync } from 'node:child_process';
import { randomInt } from 'node:crypto';
import { platform } from 'node:os';

const NAME_RE = /^dsw-([0-9a-z]{1,7})-[0-9a-f]{2}\d+[rh]?$/;

export interface NetnsHost {
  /** Namespace name (`ip netns exec NAME ...`). */
  readonly name: string;
  /** Address of the root namespace's end of the link: what the host reaches the root namespace at. */
  readonly rootAddress: string;
  /** Address of the host's own end of the link (its traffic comes from here). */
  readonly hostAddress: string;
  /** Command prefix that runs a program inside the namespace. */
  readonly wrapper: readonly string[];
  /** Take the host's end of its link down (a cut cable) or bring it back up. */
  setLink(up: boolean): void;
}

export interface NetnsLab {
  readonly hosts: readonly NetnsHost[];
  /** Kill every process still inside the namespaces, then delete them (their veth pairs go with them). */
  destroy(): void;
}

function ip(args: readonly string[], allowFailure = false): string {
  const r = spawnSync('ip', args, { encoding: 'utf8' });
  if (r.error !== undefined) throw new Error(`ip ${args.join(' ')}: ${r.error.message}`);
  if (r.status !== 0 && !allowFailure) throw new Error(`ip ${args.join(' ')} failed (exit ${r.status}): ${r.stderr.trim()}`);
  return r.stdout;
}

/** Why namespaces cannot be made here (to skip with that message), or null when they can. */
export function netnsUnavailable(): string | null {
  if (platform() !== 'linux') return `network namespaces need Linux (this is ${platform()})`;
  if (process.getuid?.() !== 0) return 'creating network namespaces needs root (run the suite as root, as CI does)';
  if (spawnSync('ip', ['-V'], { encoding: 'utf8' }).status !== 0) return 'the `ip` command (iproute2) is not installed';
  return null;
}

function pidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

const ownerPid = (name: string): number | null => {
  const m = NAME_RE.exec(name);
  return m === null ? null : parseInt(m[1], 36);
};
const isStale = (name: string): boolean => {
  const pid = ownerPid(name);
  return pid !== null && pid !== process.pid && !pidAlive(pid);
};

function killProcessesIn(ns: string): void {
  for (const word of ip(['netns', 'pids', ns], true).split(/\s+/)) {
    const pid = Number(word);
    if (!Number.isInteger(pid) || pid <= 0) continue;
    try {
      process.kill(pid, 'SIGKILL');
    } catch {
      // already gone
    }
  }
}

/** Delete namespaces (and root-side veths) of our naming whose owner process is gone. Returns what was removed. */
export function removeStaleNetns(): string[] {
  const removed: string[] = [];
  const namespaces = ip(['netns', 'list'], true).split('\n').map((l) => l.split(' ')[0]).filter((n) => n !== '');
  for (const ns of namespaces.filter(isStale)) {
    killProcessesIn(ns);
    ip(['netns', 'delete', ns], true);
    removed.push(ns);
  }
  // A run killed between creating a pair and moving its end into the namespace leaves both ends here.
  const links = ip(['-o', 'link', 'show'], true).split('\n').map((l) => /^\d+:\s+([^:@\s]+)/.exec(l)?.[1]).filter((n): n is string => n !== undefined);
  for (const link of links.filter(isStale)) {
    ip(['link', 'delete', link], true);
    removed.push(link);
  }
  return removed;
}

const toInt = (a: string): number => a.split('.').reduce((acc, octet) => acc * 256 + Number(octet), 0);
const toAddress = (n: number): string => [24, 16, 8, 0].map((s) => (n >>> s) & 255).join('.');
const maskOf = (bits: number): number => (bits === 0 ? 0 : (0xffffffff << (32 - bits)) >>> 0);

/** Networks (address, prefix length) the root namespace has addresses or routes in. */
function networksInUse(): { base: number; bits: number }[] {
  const text = ip(['-o', '-4', 'addr', 'show']) + '\n' + ip(['-4', 'route', 'show', 'table', 'all']);
  const out: { base: number; bits: number }[] = [];
  for (const m of text.matchAll(/(\d+\.\d+\.\d+\.\d+)(?:\/(\d+))?/g)) {
    const bits = m[2] === undefined ? 32 : Number(m[2]);
    out.push({ base: (toInt(m[1]) & maskOf(bits)) >>> 0, bits });
  }
  return out;
}

function freeSubnet(taken: readonly { base: number; bits: number }[]): number {
  for (let attempt = 0; attempt < 200; attempt++) {
    const base = (toInt('10.211.0.0') + randomInt(0, 16384) * 4) >>> 0;
    const overlaps = taken.some((t) => {
      const bits = Math.min(t.bits, 30);
      return ((t.base & maskOf(bits)) >>> 0) === ((base & maskOf(bits)) >>> 0);
    });
    if (!overlaps) return base;
  }
  throw new Error('no free /30 in 10.211.0.0/16 for a test link');
}

/** Labs made by this process so far (mod 256): with the pid, a name no other lab alive now has. */
let labsMade = randomInt(0, 256);

/** Make `count` namespaces, each with its own veth link to the root namespace. Call destroy() when done. */
export function createNetnsHosts(count: number): NetnsLab {
  labsMade = (labsMade + 1) % 256;
  const tag = `dsw-${process.pid.toString(36)}-${labsMade.toString(16).padStart(2, '0')}`;
  const made: string[] = [];
  const destroy = (): void => {
    for (const ns of made) {
      killProcessesIn(ns);
      ip(['netns', 'delete', ns], true);
      ip(['link', 'delete', `${ns}r`], true); // normally gone with the namespace already
    }
  };
  const hosts: NetnsHost[] = [];
  const taken = networksInUse();
  try {
    for (let i = 0; i < count; i++) {
      const name = `${tag}${i}`;
      const base = freeSubnet(taken);
      taken.push({ base, bits: 30 });
      const rootAddress = toAddress(base + 1);
      const hostAddress = toAddress(base + 2);
      const rootIf = `${name}r`;
      const hostIf = `${name}h`;
      ip(['netns', 'add', name]);
      made.push(name);
      ip(['link', 'add', rootIf, 'type', 'veth', 'peer', 'name', hostIf, 'netns', name]);
      ip(['addr', 'add', `${rootAddress}/30`, 'dev', rootIf]);
      ip(['link', 'set', rootIf, 'up']);
      ip(['-n', name, 'addr', 'add', `${hostAddress}/30`, 'dev', hostIf]);
      ip(['-n', name, 'link', 'set', hostIf, 'up']);
      ip(['-n', name, 'link', 'set', 'lo', 'up']);
      hosts.push({
        name, rootAddress, hostAddress, wrapper: ['ip', 'netns', 'exec', name],
        setLink: (up) => void ip(['-n', name, 'link', 'set', hostIf, up ? 'up' : 'down']),
      });
    }
  } catch (error) {
    destroy();
    throw error;
  }
  return { hosts, destroy };
}
