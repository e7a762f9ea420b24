/**
 * The built `disksweep` started in its own process group, so a fault test can `kill -9` it as a group (the
 * process and anything it started) the way a crash or an OOM killer would, and watch its stderr meanwhile.
 */
import { spawn } from 'node:child_process';
import { CLI_PATH, type CliRun } from './cli.js';
import { waitFor } from './wait.js';

export interface GroupProcess {
  readonly pid: number;
  stdout(): string;
  stderr(): string;
  readonly done: boolean;
  readonly exited: Promise<CliRun>;
  /** Wait (bounded) until stderr matches `pattern`, failing with what was seen if the process exits first. */
  waitForStderr(pattern: RegExp, timeoutMs?: number): Promise<void>;
  /** Send a signal to the whole process group; resolves once the process has exited (for SIGKILL/SIGTERM). */
  killGroup(signal?: NodeJS.Signals): Promise<CliRun>;
}

export function startCliGroup(args: readonly string[], env: Readonly<Record<string, string>> = {}, timeoutMs = 120_000): GroupProcess {
  const child = spawn(process.execPath, [CLI_PATH, ...args], { env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  if (child.pid === undefined) throw new Error('could not start the disksweep process');
  const pid = child.pid;
  let out = '';
  let err = '';
  let done = false;
  child.stdout?.setEncoding('utf8').on('data', (s: string) => (out += s));
  child.stderr?.setEncoding('utf8').on('data', (s: string) => (err += s));
  const kill = (signal: NodeJS.Signals): void => {
    try {
      process.kill(-pid, signal);
    } catch {
      // already gone
    }
  };
  const limit = setTimeout(() => kill('SIGKILL'), timeoutMs);
  const exited = new Promise<CliRun>((resolve) => {
    child.on('close', (status, signal) => {
      clearTimeout(limit);
      done = true;
      resolve({ status, signal, stdout: out, stderr: err });
    });
  });
  return {
    pid,
    stdout: () => out,
    stderr: () => err,
    get done() {
      return done;
    },
    exited,
    async waitForStderr(pattern, ms = 60_000) {
      await waitFor(() => {
        if (pattern.test(err)) return true;
        if (done) throw new Error(`disksweep ${args.join(' ')} exited before its stderr matched ${pattern}; stderr:\n${err}\nstdout:\n${out}`);
        return false;
      }, { timeoutMs: ms, what: () => `stderr of disksweep ${args.join(' ')} to match ${pattern}; stderr so far:\n${err}` });
    },
    async killGroup(signal = 'SIGKILL') {
      if (!done) kill(signal);
      return exited;
    },
  };
}
