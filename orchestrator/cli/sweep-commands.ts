/**
 * `validate`, `run`, `resume`, `status` and `sweeps`: the sweep life cycle on one database. Each command
 * validates everything it reads before it writes anything; bad input exits 2, runtime failures 1, an
 * interrupted run 130 (after printing the command that resumes it).
 */
import { existsSync, statSync } from 'node:fs';
import { Command, Option } from 'commander';
import { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { contentHash } from '../../shared/hashing.js';
import { MODEL_VERSION } from '../../shared/model-version.js';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS } from '../../shared/model-outputs.js';
import { PARAM_NAMES } from '../../shared/model-params.js';
import { loadSpecFile, parseSpecText } from '../spec/load-spec.js';
import { openStore, type StoreReader, type SweepRecord, type SweepStore } from '../store/index.js';
import { pickSweep } from '../store/pick-sweep.js';
import { createEmbeddedTransport, defaultThreadCount } from '../transport/embedded-transport.js';
import { executeSweep, type ExecuteResult } from '../sweep/execute-sweep.js';
import { chunkCount } from '../sweep/sweep-runner.js';
import { storedOutcomes } from '../sweep/result-committer.js';
import { calibrate, planSweep, storedSpecJson, type SweepPlan } from '../sweep/sweep-plan.js';
import { formatDuration } from './progress.js';
import { checkRedis, openTransport } from './open-transport.js';
import { lockStore } from './lock-store.js';
import { redisStatus } from './redis-commands.js';
import { redisConnectionOptions, redisFlagsForCommand, withRedisOptions, type RedisFlags, type RedisSettings } from './redis-flags.js';

export const EXIT_INTERRUPTED = 130;

const workersSchema = z.coerce.number().int().min(1).max(1024);

function parseWorkers(text: string | undefined): number {
  if (text === undefined) return defaultThreadCount();
  const r = workersSchema.safeParse(text);
  if (!r.success) throw new DisksweepError('input/invalid-flag', `--workers: expected a whole number from 1 to 1024 (got "${text}")`);
  return r.data;
}

const workersOption = () => new Option('-w, --workers <n>', 'worker threads (default: one per core)');
const dbOption = () => new Option('--db <file>', 'the SQLite database of results').makeOptionMandatory();
const sweepOption = () => new Option('--sweep <id-or-name>', 'which sweep, when the database holds several (id prefix or name)');

function write(json: boolean, data: unknown, text: string): void {
  process.stdout.write((json ? JSON.stringify(data) : text) + '\n');
}

function checkModelVersion(sweep: SweepRecord, file: string): void {
  if (sweep.modelVersion !== MODEL_VERSION) {
    throw new DisksweepError('input/model-version', `sweep ${sweep.name} in ${file} was run with model version ${sweep.modelVersion}; this disksweep runs model version ${MODEL_VERSION}`, {
      details: ['results of different physics must not mix: run the spec into a new database, or use the disksweep release that made this one'],
    });
  }
}

/** Approximate bytes per stored point: typed columns at ~9 bytes, checkpoint rows, the series blob, row overhead. */
function bytesPerPoint(checkpoints: number, seriesSamples: number): number {
  const scalars = PARAM_NAMES.length + SCALAR_OUTPUTS.length + 12;
  return 9 * scalars + checkpoints * (9 * (CHECKPOINT_OUTPUTS.length + 1) + 40) + seriesSamples * 24 + 200;
}

function runSummary(plan: SweepPlan, dbFile: string, r: ExecuteResult, reused: number): string {
  const lines = [
    `sweep ${plan.spec.name} (${plan.sweepId.slice(0, 12)}): ${r.done}/${r.total} points have a result; this run committed ${r.committed}` +
      `${reused > 0 ? `, reused ${reused} from earlier sweeps` : ''}; ${r.failed} of this run's failed`,
    `database: ${dbFile}`,
  ];
  if (!r.interrupted) lines.push(`next: disksweep status --db ${dbFile}   (counts, failure reasons)`);
  return lines.join('\n');
}

/** A path as a shell word (quoted only when it needs to be), for commands we print for copying. */
const shellWord = (text: string): string => (/^[\w@%+=:,./-]+$/.test(text) ? text : `'${text.replace(/'/g, `'\\''`)}'`);

/**
 * The command that goes on with an interrupted sweep. It names the sweep when the database holds several:
 * `resume` without --sweep refuses such a database.
 */
export function resumeCommand(store: StoreReader, plan: SweepPlan): string {
  const several = store.listSweeps().length > 1;
  return `disksweep resume --db ${shellWord(store.file)}${several ? ` --sweep ${plan.sweepId.slice(0, 12)}` : ''}`;
}

async function runPlanned(store: SweepStore, plan: SweepPlan, chunkSize: number, dbFile: string, workers: number, retryFailed: boolean, reused: number, json: boolean, redis: RedisSettings | undefined, localWorkers: boolean): Promise<number> {
  const transport = await openTransport({ redis, localWorkers, workers, store, plan }); // Redis: drains waiting results first
  const hasResult = store.pointIndexesWithResult(plan.sweepId, { retryFailed });
  process.stderr.write(`running ${plan.spec.name}: ${plan.source.size} points in ${chunkCount(plan.source.size, chunkSize)} chunks of ${chunkSize}, ${transport.description}\n`);
  const r = await executeSweep({ store, plan, chunkSize, hasResult, transport, progressStream: process.stderr, handleSignals: true });
  // The resume hint goes to stderr: stdout carries the summary (JSON with --json) and may be redirected, and
  // the person who pressed Ctrl-C must see how to go on.
  if (r.interrupted) process.stderr.write(`interrupted: resume with  ${resumeCommand(store, plan)}${redis === undefined ? '' : ` ${redisFlagsForCommand(redis)}`}\n`);
  write(json, { sweep_id: plan.sweepId, name: plan.spec.name, db: dbFile, ...r, reused }, runSummary(plan, dbFile, r, reused));
  return r.interrupted ? EXIT_INTERRUPTED : 0;
}

/**
 * Run the checks that only read (which sweep, which model version) on a read-only connection before the lock
 * is taken, so a wrong --sweep, a database without sweeps or another model version exits 2 without writing to
 * the database (taking the lock writes to it; opening a missing file for writing would create it). An older
 * schema cannot be opened read-only; it is upgraded by the write open, and the same checks run after it.
 */
function beforeLocking<T>(dbFile: string, check: (reader: StoreReader) => T): T | undefined {
  let reader: StoreReader;
  try {
    reader = openStore(dbFile, { mode: 'read' });
  } catch (error) {
    if (error instanceof DisksweepError && error.code === 'input/older-schema') return undefined;
    throw error;
  }
  try {
    return check(reader);
  } finally {
    reader.close();
  }
}

async function runCommandAction(specFile: string, opts: { db?: string; workers?: string; json?: boolean } & RedisFlags): Promise<number> {
  const workers = parseWorkers(opts.workers);
  const plan = planSweep(loadSpecFile(specFile));
  const redis = await checkRedis(opts); // before anything is written
  const dbFile = opts.db ?? `${plan.spec.name}.sqlite`;
  // A new (absent or empty) file is created by the write open; an existing one is checked read-only first.
  if (existsSync(dbFile) && statSync(dbFile).size > 0) {
    beforeLocking(dbFile, (reader) => {
      const stored = reader.getSweep(plan.sweepId);
      if (stored !== undefined) checkModelVersion(stored, dbFile);
    });
  }
  const store = lockStore(dbFile);
  try {
    let sweep = store.getSweep(plan.sweepId);
    let reused = 0;
    if (sweep !== undefined) {
      checkModelVersion(sweep, dbFile);
      process.stderr.write(`${dbFile} already holds this sweep: continuing it\n`);
    } else {
      let chunkSize: number;
      let calibrationOutcomes: ReturnType<typeof storedOutcomes> = [];
      if ('size' in plan.spec.chunks) chunkSize = plan.spec.chunks.size;
      else {
        process.stderr.write('calibrating the chunk size on a few of the sweep\'s points...\n');
        const c = await calibrate(plan, createEmbeddedTransport({ threads: Math.min(3, workers) }), plan.spec.chunks.target_seconds);
        chunkSize = c.chunkSize;
        calibrationOutcomes = c.outcomes.flatMap((o) => storedOutcomes(plan.source, o));
      }
      const specJson = storedSpecJson(plan.spec);
      const registered = store.registerSweep({
        sweepId: plan.sweepId, name: plan.spec.name, description: plan.spec.description ?? null, specJson,
        specHash: contentHash(plan.spec), modelVersion: MODEL_VERSION, nPoints: plan.source.size, chunkSize,
      });
      sweep = registered.sweep;
      if (calibrationOutcomes.length > 0) store.writeResults(calibrationOutcomes);
      reused = reuseEarlierResults(store, plan);
    }
    return await runPlanned(store, plan, sweep.chunkSize, dbFile, workers, false, reused, opts.json === true, redis, opts.workers !== undefined);
  } finally {
    store.close();
  }
}

/** Copy results of other sweeps in this database whose point ids match (an edited spec keeps its models). */
function reuseEarlierResults(store: SweepStore, plan: SweepPlan): number {
  const others = store.listSweeps().filter((s) => s.sweepId !== plan.sweepId && s.modelVersion === MODEL_VERSION);
  let copied = 0;
  for (const other of others) {
    const points = (function* () {
      for (let i = 0; i < plan.source.size; i++) yield { pointId: plan.source.taskAt(i).pointId, pointIndex: i };
    })();
    const summary = store.reuseResults(other.sweepId, plan.sweepId, points);
    if (summary.copied > 0) process.stderr.write(`reused ${summary.copied} results of sweep ${other.name} (${other.sweepId.slice(0, 12)}) with matching point ids\n`);
    copied += summary.copied;
  }
  return copied;
}

async function resumeCommandAction(opts: { db: string; sweep?: string; workers?: string; retryFailed?: boolean; json?: boolean } & RedisFlags): Promise<number> {
  const workers = parseWorkers(opts.workers);
  beforeLocking(opts.db, (reader) => checkModelVersion(pickSweep(reader, opts.sweep), opts.db));
  const redis = await checkRedis(opts); // before anything is written
  const store = lockStore(opts.db);
  try {
    const sweep = pickSweep(store, opts.sweep);
    checkModelVersion(sweep, opts.db);
    const plan = planSweep(parseSpecText(sweep.specJson, `${opts.db} (sweep ${sweep.name})`, 'json'));
    if (plan.sweepId !== sweep.sweepId) {
      throw new DisksweepError('internal/unexpected', `stored spec of ${sweep.name} hashes to ${plan.sweepId}, not its id ${sweep.sweepId}`);
    }
    return await runPlanned(store, plan, sweep.chunkSize, opts.db, workers, opts.retryFailed === true, 0, opts.json === true, redis, opts.workers !== undefined);
  } finally {
    store.close();
  }
}

async function validateCommandAction(specFile: string, opts: { workers?: string; json?: boolean }): Promise<number> {
  const workers = parseWorkers(opts.workers);
  const plan = planSweep(loadSpecFile(specFile));
  const target = 'target_seconds' in plan.spec.chunks ? plan.spec.chunks.target_seconds : null;
  const c = await calibrate(plan, createEmbeddedTransport({ threads: Math.min(3, workers) }), target ?? 1);
  const chunkSize = 'size' in plan.spec.chunks ? plan.spec.chunks.size : c.chunkSize;
  const firstResult = c.outcomes.flatMap((o) => o.points).find((p) => p.outcome.kind === 'model');
  const sample = firstResult?.outcome.kind === 'model' ? firstResult.outcome.result : undefined;
  const perPoint = bytesPerPoint(sample?.checkpoints.length ?? 0, sample?.series.n_samples ?? 0);
  const n = plan.source.size;
  const report = {
    name: plan.spec.name,
    sweep_id: plan.sweepId,
    points: n,
    chunk_size: chunkSize,
    chunks: chunkCount(n, chunkSize),
    seconds_per_point: c.secondsPerPoint,
    cpu_seconds: c.secondsPerPoint * n,
    wall_seconds_estimate: (c.secondsPerPoint * n) / workers,
    workers,
    database_bytes_estimate: Math.round(perPoint * n),
  };
  const mb = (report.database_bytes_estimate / 1e6).toPrecision(3);
  write(opts.json === true, report, [
    `${plan.spec.name}: valid (${plan.sweepId.slice(0, 12)})`,
    `points: ${n} in ${report.chunks} chunks of ${chunkSize}`,
    `CPU time: about ${formatDuration(report.cpu_seconds)} (${(1000 * c.secondsPerPoint).toPrecision(3)} ms per model, from ${c.outcomes.length} calibration models); ` +
      `about ${formatDuration(report.wall_seconds_estimate)} on ${workers} thread${workers === 1 ? '' : 's'}`,
    `database: about ${mb} MB`,
  ].join('\n'));
  return 0;
}

async function statusCommandAction(opts: { db: string; sweep?: string; json?: boolean } & RedisFlags): Promise<number> {
  const store = openStore(opts.db, { mode: 'read' });
  try {
    const sweep = pickSweep(store, opts.sweep);
    const counts = store.statusCounts(sweep.sweepId);
    const windowMs = 10 * 60_000;
    const recent = store.finishedTimes(sweep.sweepId, Date.now() - windowMs);
    const spanS = recent.length > 1 ? (recent[recent.length - 1] - recent[0]) / 1000 : 0;
    const rate = spanS > 0 ? (recent.length - 1) / spanS : null;
    const remaining = counts.nPoints - counts.withResult;
    const reasons = store.topFailureReasons(sweep.sweepId, 5);
    const data = {
      sweep_id: sweep.sweepId, name: sweep.name, model_version: sweep.modelVersion, points: counts.nPoints,
      with_result: counts.withResult, remaining, by_status: counts.byStatus,
      points_per_s_last_10min: rate, eta_s: rate !== null && remaining > 0 ? remaining / rate : null,
      top_failure_reasons: reasons,
    };
    const inRedis = await redisStatus(opts, sweep);
    const statusLine = Object.entries(counts.byStatus).filter(([, v]) => v > 0).map(([k, v]) => `${k} ${v}`).join(', ') || 'no results yet';
    write(opts.json === true, inRedis === undefined ? data : { ...data, redis: inRedis.data }, [
      `${sweep.name} (${sweep.sweepId.slice(0, 12)}, model ${sweep.modelVersion}): ${counts.withResult}/${counts.nPoints} points have a result, ${remaining} to go`,
      `by status: ${statusLine}`,
      `throughput (last 10 min): ${rate === null ? '—' : `${rate.toPrecision(3)} points/s`}; ETA ${data.eta_s === null ? '—' : formatDuration(data.eta_s)}`,
      ...(reasons.length > 0 ? ['most common failure reasons:', ...reasons.map((r) => `  ${r.count} x ${r.status}: ${r.example ?? r.reason}`)] : []),
      ...(inRedis?.lines ?? []),
    ].join('\n'));
    return 0;
  } finally {
    store.close();
  }
}

function sweepsCommandAction(opts: { db: string; json?: boolean }): number {
  const store = openStore(opts.db, { mode: 'read' });
  try {
    const sweeps = store.listSweeps().map((s) => ({ ...s, counts: store.statusCounts(s.sweepId) }));
    write(opts.json === true, sweeps.map(({ specJson: _s, ...rest }) => rest), sweeps.length === 0 ? `${opts.db} holds no sweep` : sweeps.map((s) =>
      `${s.sweepId.slice(0, 12)}  ${s.name}  model ${s.modelVersion}  ${s.counts.withResult}/${s.nPoints} points  chunk ${s.chunkSize}  created ${new Date(s.createdAt).toISOString()}`).join('\n'));
    return 0;
  } finally {
    store.close();
  }
}

type Action<A extends unknown[]> = (...args: A) => Promise<number> | number;
const exitWith = <A extends unknown[]>(fn: Action<A>) => async (...args: A): Promise<void> => {
  process.exitCode = await fn(...args);
};

/** `status` takes the connection flags only (no lock or queue tuning). */
function withRedisStatusOptions(command: Command): Command {
  for (const opt of redisConnectionOptions()) command.addOption(opt);
  return command;
}

export function sweepCommands(): Command[] {
  return [
    new Command('validate').description('check a sweep spec and estimate its points, chunks, CPU time and database size')
      .argument('<spec>', 'sweep spec (YAML, or JSON for .json files)').addOption(workersOption()).option('--json', 'print one JSON object')
      .addHelpText('after', '\nExample:\n  disksweep validate examples/corvid-rift-cores.yaml\n\nRuns a few of the sweep\'s own models to time them; writes nothing.')
      .action(exitWith((spec: string, opts: { workers?: string; json?: boolean }) => validateCommandAction(spec, opts))),
    withRedisOptions(new Command('run').description('run a sweep on this machine into a SQLite database (resumable)')
      .argument('<spec>', 'sweep spec (YAML, or JSON for .json files)')
      .option('--db <file>', 'the SQLite database (default: <spec name>.sqlite here)').addOption(workersOption()).option('--json', 'print the summary as JSON')
      .addHelpText('after', '\nExamples:\n  disksweep run examples/corvid-rift-cores.yaml\n  disksweep run my-sweep.yaml --db runs/my-sweep.sqlite --workers 8\n\nProgress goes to stderr. Ctrl-C stops after the chunks in flight; run `disksweep resume --db FILE` to go on.\nAn edited spec run into the same database reuses every result whose point is unchanged.')
      .action(exitWith((spec: string, opts: { db?: string; workers?: string; json?: boolean } & RedisFlags) => runCommandAction(spec, opts)))),
    withRedisOptions(new Command('resume').description('run exactly the points of a stored sweep that have no result yet')
      .addOption(dbOption()).addOption(sweepOption()).addOption(workersOption())
      .option('--retry-failed', 'also rerun points whose model failed (step_limit, non_finite, ...)').option('--json', 'print the summary as JSON')
      .addHelpText('after', '\nExamples:\n  disksweep resume --db corvid-rift-cores.sqlite\n  disksweep resume --db corvid-rift-cores.sqlite --retry-failed\n\nPoints that crashed or threw (infrastructure errors) are always rerun.')
      .action(exitWith((opts: { db: string; sweep?: string; workers?: string; retryFailed?: boolean; json?: boolean } & RedisFlags) => resumeCommandAction(opts)))),
    withRedisStatusOptions(new Command('status').description('counts by status, throughput, ETA and the most common failure reasons; with --redis also workers and queues')
      .addOption(dbOption()).addOption(sweepOption()).option('--json', 'print one JSON object')
      .addHelpText('after', '\nExamples:\n  disksweep status --db corvid-rift-cores.sqlite\n  disksweep status --db corvid-rift-cores.sqlite --redis redis://queue-host:6379   (+ live workers, queued chunks)\n\nSafe while a sweep is writing (read-only).')
      .action(exitWith((opts: { db: string; sweep?: string; json?: boolean } & RedisFlags) => statusCommandAction(opts)))),
    new Command('sweeps').description('list the sweeps a database holds')
      .addOption(dbOption()).option('--json', 'print a JSON array')
      .action(exitWith((opts: { db: string; json?: boolean }) => sweepsCommandAction(opts))),
  ];
}
