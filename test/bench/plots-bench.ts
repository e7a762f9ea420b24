/**
 * The plots layer at scale, measured inside the `query` section on its synthetic 10^6-point database
 * (query-bench.ts builds it; this adds a QueryBenchExtra):
 *   map_*     `disksweep map` of solar-split over m_disk_msun x alpha_active (12 x 12 bins): binning and SVG of
 *             the section's own evaluation in process, then the built CLI end to end (process start and
 *             evaluateTargets included), wall and CPU time, median of 3; goal ≤ 2 s wall;
 *   export_*  `disksweep export --format csv` of every row to /dev/null through the CLI: rows/s and the
 *             process's peak resident set (flat in the number of rows = streamed, not materialised).
 * CPU times and peak memory come from GNU time (/usr/bin/time) when present, else from bash's `time` (no memory).
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { gridHeatMap, passGrid } from '../../orchestrator/map/pass-grid.js';
import { svgDocument } from '../../orchestrator/plots/svg.js';
import type { QueryBenchExtra } from './query-bench.js';
import { median, progress, sig } from './stats.js';
import { CLI_PATH } from './sweep-bench.js';

export const MAP_GOAL_S = 2;
const MAP_ARGS = ['--x', 'm_disk_msun', '--y', 'alpha_active', '--target', 'solar-split', '--bins', '12'];

interface ChildTiming {
  wall_s: number;
  cpu_s: number | null;
  max_rss_mb: number | null;
}

const quote = (a: string) => `'${a.replace(/'/g, `'\\''`)}'`;

/** Run the built CLI with `args` (stdout discarded) and time it. */
function timeCli(args: readonly string[]): ChildTiming {
  const command = [process.execPath, CLI_PATH, ...args].map(quote).join(' ');
  const gnuTime = existsSync('/usr/bin/time');
  const script = gnuTime ? `/usr/bin/time -f 'rusage %U %S %M' ${command} > /dev/null` : `TIMEFORMAT='rusage %U %S'; time ${command} > /dev/null`;
  const t0 = performance.now();
  const r = spawnSync('bash', ['-c', script], { encoding: 'utf8' });
  const wall = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`disksweep ${args[0]} failed (${r.status}): ${r.stderr}`);
  const m = /rusage ([\d.]+) ([\d.]+)(?: (\d+))?/.exec(r.stderr);
  return { wall_s: wall, cpu_s: m === null ? null : Number(m[1]) + Number(m[2]), max_rss_mb: m?.[3] === undefined ? null : Number(m[3]) / 1024 };
}

const med = (xs: readonly (number | null)[]): number | null => {
  const v = xs.filter((x): x is number => x !== null);
  return v.length === 0 ? null : sig(median(v), 3);
};

export const plotsBenchExtra: QueryBenchExtra = {
  name: 'plots',
  run(store, ev) {
    const t0 = performance.now();
    const grid = passGrid(ev, 'm_disk_msun', 'alpha_active', { bins: 12, gridPlan: false });
    const t1 = performance.now();
    const svg = svgDocument(gridHeatMap(grid, 'bench'));
    const t2 = performance.now();
    if (svg.length < 1000) throw new Error('map SVG unexpectedly small');
    progress('plots bench: disksweep map through the CLI (3 runs)');
    const map = [0, 1, 2].map(() => timeCli(['map', store.file, ...MAP_ARGS, '--svg', '/dev/null']));
    progress('plots bench: disksweep export --format csv through the CLI');
    const csv = timeCli(['export', store.file, '--format', 'csv', '--out', '/dev/null']);
    const mapWall = med(map.map((m) => m.wall_s)) ?? Number.NaN;
    return {
      map_grid_s: sig((t1 - t0) / 1000, 3),
      map_svg_s: sig((t2 - t1) / 1000, 3),
      map_cli_s: mapWall,
      map_cli_cpu_s: med(map.map((m) => m.cpu_s)),
      map_cli_max_rss_mb: med(map.map((m) => m.max_rss_mb)),
      map_s_target: MAP_GOAL_S,
      map_s_met: mapWall <= MAP_GOAL_S,
      export_csv_s: sig(csv.wall_s, 3),
      export_csv_cpu_s: csv.cpu_s === null ? null : sig(csv.cpu_s, 3),
      export_csv_rows_per_s: sig(ev.counts.ok / csv.wall_s, 3),
      export_csv_max_rss_mb: csv.max_rss_mb === null ? null : sig(csv.max_rss_mb, 3),
    };
  },
};
