/**
 * Run the built `disksweep` command as a real process (the way a researcher or a script runs it), so exit
 * codes, stdout and stderr are what they will see. Needs `npm run build` first; `npm test` does it.
 *
 * - `runCli(args, options?)`: run to completion (blocking), like a shell command.
 * - `runCliAsync(args, options?)`: the same without blocking this process (for readers beside a writer).
 * - `startCli(args, options?)`: start and return at once, to watch stderr and send signals (interrupt tests);
 *   with `group: true` in its own process group, so a fault test can `kill -9` it as a group (the process and
 *   anything it started) the way a crash or an OOM killer would.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { waitFor } from './wait.js';

export const CLI_PATH = fileURLToPath(new URL('../../dist/orchestrator/cli/main.js', import.meta.url));

/** The test model of dist/ (see fault-model.ts), for DISKSWEEP_MODEL_MODULE. */
export const FAULT_MODEL_PATH = fileURLToPath(new URL('../../dist/test/support/fault-model.js', import.meta.url));

export interface CliRun {
  status: number | null;
  /** The signal that ended the process, if one did. */
  signal?: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

export interface CliOptions {
  /** Extra environment variables (added to this process's environment). */
  readonly env?: Readonly<Record<string, string>>;
  /** Working directory (default: this process's). */
  readonly cwd?: string;
  /** Kill the process after this long (default 120 s). */
  readonly timeoutMs?: number;
  /** startCli only: start it in its own process group (killGroup then signals the whole group). */
  readonly group?: boolean;
  /**
   * startCli only: run the CLI under this command, which must exec it in place (e.g. `['ip', 'netns', 'exec',
   * NAME]`), so the process started is still the CLI itself.
   */
  readonly wrapper?: readonly string[];
}

function requireBuilt(path: string): void {
  if (!existsSync(path)) throw new Error(`${path} is missing: run \`npm run build\` before the tests`);
}

/** The environment that runs the fault model in pool threads instead of the disk model. */
export function faultModelEnv(): Record<string, string> {
  requireBuilt(FAULT_MODEL_PATH);
  return { DISKSWEEP_MODEL_MODULE: FAULT_MODEL_PATH };
}

const childEnv = (options: CliOptions): NodeJS.ProcessEnv => ({ ...process.env, ...options.env });

export function runCli(args: readonly string[], options: CliOptions = {}): CliRun {
  requireBuilt(CLI_PATH);
  const r = spawnSync(process.execPath, [CLI_PATH, ...args], {
    encoding: 'utf8',
    timeout: options.timeoutMs ?? 120_000,
    env: childEnv(options),
    cwd: options.cwd,
  });
  return { status: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr };
}

/** A CLI process started in the background. */
export interface CliProcess {
  readonly child: ChildProcess;
  readonly pid: number;
  /** Everything written so far. */
  stdout(): string;
  stderr(): string;
  /** True once the process has exited. */
  readonly done: boolean;
  /** Resolves when the process has exited (never rejects). */
  readonly exited: Promise<CliRun>;
  /** Wait (bounded) until stderr matches `pattern`; fails naming what was seen if the process exits first. */
  waitForStderr(pattern: RegExp, timeoutMs?: number): Promise<RegExpMatchArray>;
  /** Signal the process (its whole group when started with `group: true`); resolves once it has exited. */
  killGroup(signal?: NodeJS.Signals): Promise<CliRun>;
}

export function startCli(args: readonly string[], options: CliOptions = {}): CliProcess {
  requireBuilt(CLI_PATH);
  const [command, ...prefix] = [...(options.wrapper ?? []), process.execPath];
  const child = spawn(command, [...prefix, CLI_PATH, ...args], {
    env: childEnv(options),
    cwd: options.cwd,
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: options.group === true,
  });
  const pid = child.pid;
  if (pid === undefined) throw new Error('could not start the disksweep process');
  let out = '';
  let err = '';
  let done = false;
  child.stdout?.setEncoding('utf8').on('data', (s: string) => (out += s));
  child.stderr?.setEncoding('utf8').on('data', (s: string) => (err += s));
  const kill = (signal: NodeJS.Signals): void => {
    try {
      if (options.group === true) process.kill(-pid, signal);
      else child.kill(signal);
    } catch {
      // already gone
    }
  };
  const limit = setTimeout(() => kill('SIGKILL'), options.timeoutMs ?? 120_000);
  const exited = new Promise<CliRun>((resolve) => {
    child.on('close', (status, signal) => {
      clearTimeout(limit);
      done = true;
      resolve({ status, signal, stdout: out, stderr: err });
    });
  });
  return {
    child,
    pid,
    stdout: () => out,
    stderr: () => err,
    get done() {
      return done;
    },
    exited,
    async waitForStderr(pattern, timeoutMs = 60_000) {
      const found: { match: RegExpMatchArray | null } = { match: null };
      await waitFor(() => {
        found.match = err.match(pattern);
        if (found.match === null && done) {
          throw new Error(`disksweep ${args.join(' ')} exited before its stderr matched ${pattern}; stderr:\n${err}\nstdout:\n${out}`);
        }
        return found.match !== null;
      }, { timeoutMs, what: () => `stderr of disksweep ${args.join(' ')} to match ${pattern}; stderr so far:\n${err}` });
      if (found.match === null) throw new Error(`stderr never matched ${pattern}`);
      return found.match;
    },
    async killGroup(signal = 'SIGKILL') {
      if (!done) kill(signal);
      return exited;
    },
  };
}

/** Run to completion without blocking this process. */
export function runCliAsync(args: readonly string[], options: CliOptions = {}): Promise<CliRun> {
  return startCli(args, options).exited;
}

/** Stop a background process that is still running (test clean-up); resolves when it has exited. */
export async function stopCli(p: CliProcess): Promise<void> {
  await p.killGroup('SIGKILL');
}
