/**
 * `npm run bench`: how fast one model is, and how close the implicit transport kernel comes to compiled C.
 * Prints one JSON object to stdout (progress to stderr). It reports; it never fails on a slow machine.
 *
 * Sections, in this order (the kernel first, so its JIT feedback comes from the kernel alone, as in C):
 *   implicit_step    ns per cell per step of viscousStep (row assembly + Thomas solve) at n = 200 and 2000
 *   c_reference      the same loop in C (implicit-step.c, cc -O2), the ratio, and a check that C and JS agree
 *   default_infall   runModel({}): 200 cells, 5 Myr, infall start, dead zones from the ionization kernel; and the
 *                    same with active_layer = uniform (no dead zone)
 *   validation_disk  runModel({ initial_state: 'disk' })
 *   ionization       a variant of the default model without the thermal switch, an irradiated disk, the share of
 *                    model time spent in the ionization kernel (replay), and the refresh-tolerance accuracy check
 *                    per output, next to the integration's own noise floor, on the default model and the
 *                    irradiated disk (ionization-bench.ts)
 *   winds            what the photoevaporation modules cost per model (default X-ray wind; all winds on a disk),
 *                    timed on the model's own states (winds-bench.ts)
 *   sqlite_ingest, sweep_parallel_efficiency, noop_overhead, orchestrator_rss
 *                    the store and the sweep machinery (system-bench.ts)
 *   redis            the Redis transport end to end: no-op points/s, two worker processes against the embedded
 *                    transport on real models, Redis memory at the --max-queued limit (redis-bench.ts)
 *   multi_host       a Redis sweep with its two workers in two network namespaces against both on loopback:
 *                    points/s and their ratio (multihost-bench.ts; skipped unless Linux, root, ip, redis-server)
 *   query            evaluateTargets, marginals and PRIM on a synthetic 10^6-point database (query-bench.ts), with
 *                    query.plots: map and export on the same database (plots-bench.ts)
 * The JS and C step loops run in alternating rounds, so a load spike on a shared machine hits both alike.
 */
import { arch, availableParallelism, cpus, loadavg, platform } from 'node:os';
import {
  C_FLAGS,
  checkReference,
  compileReference,
  timeReference,
  type CaseCheck,
  type CompiledReference,
} from './c-reference.js';
import { makeStepTimer, type StepCaseName, type StepSamples } from './implicit-step-case.js';
import { benchIonizationShare, benchRefreshAccuracy } from './ionization-bench.js';
import { benchModel, type ModelBenchResult } from './model-bench.js';
import { benchMultiHost } from './multihost-bench.js';
import { plotsBenchExtra } from './plots-bench.js';
import { benchQuery } from './query-bench.js';
import { benchRedis } from './redis-bench.js';
import { median, progress, quantile, sig } from './stats.js';
import { benchSystem } from './system-bench.js';
import { benchWinds } from './winds-bench.js';

const GOALS = { default_model_ms_target: 100, js_over_c_target: 1.5 } as const;
/** Relative agreement C and JS must reach on every number of the check solve. */
const MATCH_TOLERANCE = 1e-12;
/** Grid sizes, and steps per timed batch (about 2·10^5 cell-steps, a millisecond or two). */
const STEP_SIZES = [
  { n: 200, reps: 1000 },
  { n: 2000, reps: 100 },
] as const;
/** Alternating JS/C rounds, and timed batches per round and language. */
const STEP_ROUNDS = 5;
const BATCHES_PER_ROUND = 61;
const CHECKS: readonly { n: number; name: StepCaseName }[] = [
  { n: 200, name: 'timed' },
  { n: 2000, name: 'timed' },
  { n: 200, name: 'branches' },
];

type SizeKey = `n_${number}`;
const sizeKey = (n: number): SizeKey => `n_${n}`;

interface StepReport {
  /** Median over all batches. */
  ns_per_cell_step: number;
  ns_per_cell_step_min: number;
  ns_per_cell_step_p90: number;
  us_per_step: number;
  steps_per_batch: number;
  batches: number;
}

function stepReport(runs: readonly StepSamples[]): StepReport {
  const samples = runs.flatMap((r) => r.nsPerCellStep);
  const { n, reps } = runs[0];
  const med = median(samples);
  return {
    ns_per_cell_step: sig(med),
    ns_per_cell_step_min: sig(Math.min(...samples)),
    ns_per_cell_step_p90: sig(quantile(samples, 0.9)),
    us_per_step: sig((med * n) / 1000),
    steps_per_batch: reps,
    batches: samples.length,
  };
}

interface CReport {
  available: boolean;
  reason: string | null;
  compiler: string | null;
  compiler_version: string | null;
  compile_flags: string[];
  /** One StepReport per grid size (keys as in implicit_step), null when there is no C. */
  [size: SizeKey]: StepReport | null;
  ratio_js_over_c: Record<SizeKey, number> | null;
  /** The same ratio from the fastest batch of each: less sensitive to load from other processes. */
  ratio_js_over_c_min: Record<SizeKey, number> | null;
  c_matches_js: boolean | null;
  check: { tolerance: number; cases: CaseCheck[] } | null;
}

function unavailable(reason: string): CReport {
  const sizes = Object.fromEntries(STEP_SIZES.map(({ n }) => [sizeKey(n), null]));
  return {
    available: false, reason, compiler: null, compiler_version: null, compile_flags: C_FLAGS, ...sizes,
    ratio_js_over_c: null, ratio_js_over_c_min: null, c_matches_js: null, check: null,
  };
}

/** The step loops of both languages in alternating rounds (JS alone when ref is null), then the C/JS check. */
function benchSteps(ref: CompiledReference | null): { js: Record<SizeKey, StepReport>; c: CReport | null } {
  const jsTimers = new Map(STEP_SIZES.map(({ n, reps }) => [n, makeStepTimer(n, reps)]));
  const jsRuns = new Map<number, StepSamples[]>(STEP_SIZES.map(({ n }) => [n, []]));
  const cRuns = new Map<number, StepSamples[]>(STEP_SIZES.map(({ n }) => [n, []]));
  for (let round = 0; round < STEP_ROUNDS; round++) {
    progress(`implicit step, round ${round + 1}/${STEP_ROUNDS}${ref === null ? ' (JS only)' : ' (JS, C)'}`);
    for (const { n, reps } of STEP_SIZES) {
      const timeJs = jsTimers.get(n);
      if (timeJs !== undefined) jsRuns.get(n)?.push(timeJs(BATCHES_PER_ROUND));
      if (ref !== null) cRuns.get(n)?.push(timeReference(ref, n, reps, BATCHES_PER_ROUND));
    }
  }
  const js: Record<SizeKey, StepReport> = {};
  for (const { n } of STEP_SIZES) js[sizeKey(n)] = stepReport(jsRuns.get(n) ?? []);
  if (ref === null) return { js, c: null };

  const cases = CHECKS.map(({ n, name }) => checkReference(ref, n, name));
  const matches = cases.every((k) => k.max_rel_diff <= MATCH_TOLERANCE && k.checksum_rel_diff <= MATCH_TOLERANCE);
  progress(`C reference (${ref.version}): solution ${matches ? 'agrees with' : 'DIFFERS from'} JS`);
  const timings: Record<SizeKey, StepReport> = {};
  const ratio: Record<SizeKey, number> = {};
  const ratioMin: Record<SizeKey, number> = {};
  for (const { n } of STEP_SIZES) {
    const key = sizeKey(n);
    const t = stepReport(cRuns.get(n) ?? []);
    timings[key] = t;
    ratio[key] = sig(js[key].ns_per_cell_step / t.ns_per_cell_step, 3);
    ratioMin[key] = sig(js[key].ns_per_cell_step_min / t.ns_per_cell_step_min, 3);
  }
  const c: CReport = {
    available: true, reason: null, compiler: ref.compiler, compiler_version: ref.version, compile_flags: C_FLAGS,
    ...timings, ratio_js_over_c: ratio, ratio_js_over_c_min: ratioMin, c_matches_js: matches,
    check: { tolerance: MATCH_TOLERANCE, cases },
  };
  return { js, c };
}

async function main(): Promise<void> {
  const started = performance.now();
  const loadStart = loadavg()[0];

  const compiled = compileReference();
  if ('reason' in compiled) progress(`C reference skipped: ${compiled.reason}`);
  const ref = 'reason' in compiled ? null : compiled;
  let steps: { js: Record<SizeKey, StepReport>; c: CReport | null };
  try {
    steps = benchSteps(ref);
  } catch (e) {
    if (ref === null) throw e;
    // The C side failed: report why, and time the JS alone.
    const reason = `the C reference failed to run: ${e instanceof Error ? e.message : String(e)}`;
    progress(reason);
    steps = { js: benchSteps(null).js, c: unavailable(reason) };
  } finally {
    ref?.dispose();
  }
  const implicit = steps.js;
  const c = steps.c ?? unavailable('reason' in compiled ? compiled.reason : 'unknown');

  const defaultInfall: ModelBenchResult = benchModel('default_infall', {}, { warmupRuns: 3, warmupMs: 1500, runs: 11 });
  const defaultUniform: ModelBenchResult = benchModel('default_infall_uniform', { active_layer: 'uniform' }, { warmupRuns: 8, warmupMs: 1000, runs: 31 });
  const validationDisk: ModelBenchResult = benchModel(
    'validation_disk',
    { initial_state: 'disk' },
    { warmupRuns: 8, warmupMs: 1000, runs: 51 },
  );

  // The default model (transport from ionization, thermal switch on the quiescent temperature) is timed above;
  // here the same without the thermal switch, and an irradiated disk. The self-heated switch
  // (activity_temperature=midplane) is not timed: it cycles at the inner dead-zone edge and needs millions of steps.
  const ionNoThermal = benchModel(
    'default_infall_ionization_no_thermal',
    { thermal_ionization: 'none' },
    { warmupRuns: 2, warmupMs: 1000, runs: 5 },
  );
  const ionDisk = benchModel('disk_ionization', { initial_state: 'disk', active_layer: 'ionization', kappa_cm2_g: 0 }, { warmupRuns: 3, warmupMs: 1000, runs: 9 });
  const ionization = {
    what:
      'active_layer=ionization (the default; the default model is default_infall): a variant without the thermal ' +
      'switch, and an irradiated disk; ionization_share by replaying the recorded Sigma_a; refresh accuracy = ' +
      'default ion_refresh_tol against 0 per checkpoint output (edges in grid cells), with the noise floor: ' +
      'ion_refresh_tol 0 at step_change against 0.9 x step_change',
    default_infall_ionization_no_thermal: ionNoThermal,
    disk_ionization: ionDisk,
    share_default: benchIonizationShare({}, 3),
    share_disk: benchIonizationShare({ initial_state: 'disk', active_layer: 'ionization', kappa_cm2_g: 0 }, 5),
    refresh_accuracy_default: benchRefreshAccuracy({}),
    refresh_accuracy_disk: benchRefreshAccuracy({ initial_state: 'disk', active_layer: 'ionization', kappa_cm2_g: 0 }),
  };

  const winds = {
    what: 'wind work per model (rates, cavity, predictor solve, sink) timed on the run\'s own states; share of the model median',
    default_infall: benchWinds('winds_default_infall', {}, 200),
    disk_all_winds: benchWinds(
      'winds_disk_all',
      { initial_state: 'disk', euv_wind_scale: 1, fuv_wind_mdot_msun_yr: 1e-8, t_end_myr: 5 },
      200,
    ),
  };

  const system = await benchSystem();
  const redis = await benchRedis();
  const multiHost = await benchMultiHost();
  // DISKSWEEP_BENCH_QUERY_POINTS shrinks the synthetic database for a quick look (the goals are for 10^6).
  const query = benchQuery(Number(process.env.DISKSWEEP_BENCH_QUERY_POINTS ?? 1_000_000), [plotsBenchExtra]);

  const ratios = c.ratio_js_over_c === null ? [] : Object.values(c.ratio_js_over_c);
  const worst = ratios.length === 0 ? null : Math.max(...ratios);
  const cpuList = cpus();
  const report = {
    default_infall: defaultInfall,
    default_infall_uniform: defaultUniform,
    validation_disk: validationDisk,
    ionization,
    winds,
    implicit_step: {
      what: 'viscousStep: theta = 1, zero-torque edges, lagged nu; row assembly + Thomas solve; median over batches',
      ...implicit,
    },
    c_reference: c,
    ...system.sections,
    redis,
    multi_host: multiHost,
    query: query.section,
    machine: {
      node: process.version,
      v8: process.versions.v8,
      cpu_model: cpuList.length > 0 ? cpuList[0].model.trim() : 'unknown',
      cores: cpuList.length,
      available_parallelism: availableParallelism(),
      platform: `${platform()}-${arch()}`,
      // Well above 0 means other processes competed for the cores: the timings are then noisier.
      load_average_1m_start: sig(loadStart, 3),
      load_average_1m_end: sig(loadavg()[0], 3),
    },
    goals: {
      ...GOALS,
      // The default model has its dead zones from the ionization kernel; the aim for it is "well under" this.
      default_model_ms: defaultInfall.median_ms,
      default_model_status: defaultInfall.status,
      default_model_ms_met: defaultInfall.status === 'ok' && defaultInfall.median_ms <= GOALS.default_model_ms_target,
      default_model_uniform_ms: defaultUniform.median_ms,
      default_model_uniform_ms_met: defaultUniform.median_ms <= GOALS.default_model_ms_target,
      js_over_c_worst: worst,
      js_over_c_met: worst === null ? null : worst <= GOALS.js_over_c_target,
      ...system.goals,
      ...query.goals,
    },
    bench_wall_s: sig((performance.now() - started) / 1000, 3),
  };
  process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
}

await main();
