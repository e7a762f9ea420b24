/**
 * Memory of the orchestrator on a large sweep: the built CLI (`disksweep run`) as a child process on a
 * random plan of 10^6 no-op points (DISKSWEEP_MODEL_MODULE = noop-model.js, chunk size calibrated as a user
 * would get it), into a temporary database. Its resident set is sampled from /proc/<pid>/status (VmRSS, and
 * VmHWM, the kernel's peak) while the progress lines on stderr say how far it is. If the sweep would not finish
 * inside the time budget, it is sent SIGINT (it should finish its chunks in flight and exit 130), and SIGKILL
 * if it is still running SIGINT_GRACE_MS later; the report says which happened and how many results were
 * committed (counted in the database afterwards). The trend of RSS against points done is then the evidence
 * for "bounded", not a finished run.
 */
import Database from 'better-sqlite3';
import { spawn } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CLI_PATH, NOOP_MODEL_PATH, noopSpec } from './sweep-bench.js';
import { progress, sig } from './stats.js';
import { withTempDirAsync } from './temp-files.js';

const SAMPLE_MS = 250;
/** After SIGINT, how long the run may take to stop before it is killed. */
const SIGINT_GRACE_MS = 10_000;

export interface RssOptions {
  readonly points: number;
  /** Interrupt the sweep (SIGINT) when it has run this long. */
  readonly budgetMs: number;
  readonly workers: number;
  /** Points per chunk; default: calibrated by `run` itself, as a user gets it. */
  readonly chunk?: number;
}

interface Sample {
  t_s: number;
  done: number;
  rss_mb: number;
}

export interface RssReport {
  command: string;
  points_planned: number;
  points_done: number;
  /** As `run` reported it ("... in N chunks of SIZE"). */
  chunk_size: number | null;
  finished: boolean;
  exit_code: number | null;
  /** Whether the run was sent SIGINT (budget reached), and whether it then exited on its own in time. */
  sigint_sent: boolean;
  sigint_stopped_it: boolean | null;
  wall_s: number;
  points_per_s: number;
  /** Largest VmHWM read (the kernel's own peak of the resident set). */
  peak_rss_mb: number;
  /** Largest VmRSS while the first half of points_done was run, and while the second half was. */
  rss_max_first_half_mb: number | null;
  rss_max_second_half_mb: number | null;
  /** RSS at about every tenth of the run. */
  samples: Sample[];
}

function statusKb(pid: number, field: 'VmRSS' | 'VmHWM'): number | null {
  try {
    const m = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m === null ? null : Number(m[1]);
  } catch {
    return null; // the process has gone
  }
}

/** Largest VmRSS in the first and in the second half of the run (by points done): equal-ish when bounded. */
function halves(samples: readonly Sample[]): { first: number | null; second: number | null } {
  const last = samples.length === 0 ? 0 : samples[samples.length - 1].done;
  const max = (xs: readonly Sample[]): number | null => (xs.length === 0 ? null : sig(Math.max(...xs.map((x) => x.rss_mb)), 3));
  return { first: max(samples.filter((x) => x.done <= last / 2)), second: max(samples.filter((x) => x.done > last / 2)) };
}

export async function benchOrchestratorRss(o: RssOptions): Promise<RssReport> {
  return withTempDirAsync('disksweep-bench-rss-', async (dir) => {
    const specFile = join(dir, 'million.json');
    writeFileSync(specFile, JSON.stringify(noopSpec('bench-rss', o.points, o.chunk ?? 'calibrate')));
    const args = [CLI_PATH, 'run', specFile, '--db', join(dir, 'million.sqlite'), '--workers', String(o.workers), '--json'];
    progress(`orchestrator_rss: disksweep run on ${o.points} no-op points (budget ${o.budgetMs / 1000} s)`);
    const child = spawn(process.execPath, args, {
      env: { ...process.env, DISKSWEEP_MODEL_MODULE: NOOP_MODEL_PATH },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const pid = child.pid;
    if (pid === undefined) throw new Error('could not start disksweep run');
    let stderrTail = '';
    let done = 0;
    let chunk: number | null = null;
    child.stdout.resume(); // the --json summary is not needed: results are counted in the database
    child.stderr.setEncoding('utf8').on('data', (s: string) => {
      stderrTail = (stderrTail + s).slice(-4000);
      for (const m of s.matchAll(/: (\d+)\/\d+ done/g)) done = Number(m[1]);
      const size = / chunks of (\d+)/.exec(s);
      if (size !== null) chunk = Number(size[1]);
    });
    let alive = true;
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => {
      alive = false;
      resolve(code);
    }));
    const t0 = performance.now();
    const all: Sample[] = [];
    let peakKb = 0;
    let interrupted = false;
    let killed = false;
    const timer = setInterval(() => {
      const rss = statusKb(pid, 'VmRSS');
      peakKb = Math.max(peakKb, statusKb(pid, 'VmHWM') ?? 0);
      if (rss !== null) all.push({ t_s: (performance.now() - t0) / 1000, done, rss_mb: rss / 1024 });
      if (!interrupted && performance.now() - t0 > o.budgetMs) {
        interrupted = true;
        progress(`orchestrator_rss: budget reached at ${done} points: SIGINT (finishing the chunks in flight)`);
        child.kill('SIGINT');
        setTimeout(() => {
          if (!alive) return;
          killed = true;
          progress(`orchestrator_rss: still running ${SIGINT_GRACE_MS / 1000} s after SIGINT (at ${done} points): SIGKILL`);
          child.kill('SIGKILL');
        }, SIGINT_GRACE_MS).unref();
      }
    }, SAMPLE_MS);
    const code = await exited;
    clearInterval(timer);
    const wallS = (performance.now() - t0) / 1000;
    if (!killed && code !== 0 && code !== 130) throw new Error(`disksweep run exited with ${code}; stderr ends:\n${stderrTail}`);
    const raw = new Database(join(dir, 'million.sqlite'), { readonly: true });
    const committed = raw.prepare('SELECT count(*) FROM results').pluck().get() as number;
    raw.close();
    const step = Math.max(1, Math.floor(all.length / 10));
    return {
      command: `disksweep run <${o.points}-point random plan, chunks ${o.chunk ?? 'calibrated'}> --workers ${o.workers} (DISKSWEEP_MODEL_MODULE=noop-model.js)`,
      chunk_size: chunk,
      points_planned: o.points,
      points_done: committed,
      finished: code === 0 && committed === o.points,
      exit_code: code,
      sigint_sent: interrupted,
      sigint_stopped_it: interrupted ? !killed : null,
      wall_s: sig(wallS, 3),
      points_per_s: sig(committed / wallS),
      peak_rss_mb: sig(peakKb / 1024, 3),
      rss_max_first_half_mb: halves(all).first,
      rss_max_second_half_mb: halves(all).second,
      samples: all.filter((_, i) => i % step === 0 || i === all.length - 1).map((s) => ({ t_s: sig(s.t_s, 3), done: s.done, rss_mb: sig(s.rss_mb, 3) })),
    };
  });
}
