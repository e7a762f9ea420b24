/**
 * `disksweep model` as a process: bad input exits 2 naming the parameter, the value and the allowed range,
 * before anything runs; a good run prints one ModelResult with --json; --list documents every parameter.
 */
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { PARAM_NAMES } from '../../../shared/model-params.js';
import { modelResultSchema } from '../../../shared/model-result.js';
import { CLI_PATH, runCli } from '../../support/cli.js';

interface BadCase {
  readonly args: string[];
  /** Every fragment must appear in stderr. */
  readonly expect: string[];
}

// Each row: an invalid input and the words the error must contain (parameter, value received, what is allowed).
const BAD_INPUTS: BadCase[] = [
  { args: ['--set', 'alpha_active=2'], expect: ['alpha_active', '(0, 1]', 'got 2'] },
  { args: ['--set', 'alpha_active=0'], expect: ['alpha_active', '(0, 1]', 'got 0'] },
  { args: ['--set', 'alpha_active=abc'], expect: ['alpha_active', 'expected a number', '"abc"'] },
  { args: ['--set', 'alpah_active=0.01'], expect: ['alpah_active', 'unknown parameter', 'did you mean alpha_active'] },
  { args: ['--set', 'n_cells=100.5'], expect: ['n_cells', 'an integer in [16, 20000]', 'got 100.5'] },
  { args: ['--set', 'n_cells=8'], expect: ['n_cells', '[16, 20000]', 'got 8'] },
  { args: ['--set', 'theta=0.3'], expect: ['theta', '[0.5, 1]', 'got 0.3'] },
  { args: ['--set', 'initial_state=cloud'], expect: ['initial_state', '"infall", "disk"', '"cloud"'] },
  { args: ['--set', 'alpha_dead=0.1'], expect: ['alpha_dead', 'must not exceed alpha_active = 0.01', 'got 0.1'] },
  { args: ['--set', 'r_out_au=0.3'], expect: ['r_out_au', '[1, 1000000] AU', 'got 0.3'] },
  { args: ['--set', 'r_in_au=1', '--set', 'r_out_au=5'], expect: ['r_out_au', 'at least 10 x r_in_au = 10 AU', 'got 5'] },
  { args: ['--set', 'omega_core_s=1e-13'], expect: ['r_out_au', 'final centrifugal radius', 'omega_core_s = 1e-13', 'got 10000'] },
  { args: ['--set', 'checkpoints_myr=1,0.5'], expect: ['checkpoints_myr[1]', 'must increase strictly', '1 then 0.5'] },
  { args: ['--set', 'checkpoints_myr=1,x'], expect: ['checkpoints_myr', 'comma-separated numbers', '"x"'] },
  { args: ['--set', 't_end_myr=-1'], expect: ['t_end_myr', '(0, 100] Myr', 'got -1'] },
  { args: ['--set', 'kappa_cm2_g=-1'], expect: ['kappa_cm2_g', '[0, 10000] cm^2 g^-1', 'got -1'] },
  { args: ['--set', 'r_star_rsun=15'], expect: ['r_star_rsun', 'must lie inside r_in_au = 0.05 AU', 'got 15'] },
  { args: ['--set', 'alpha_active'], expect: ['--set alpha_active', 'expected name=value'] },
  { args: ['--set', 'm_core_msun=1', '--set', 'm_core_msun=2'], expect: ['m_core_msun', 'given twice'] },
  { args: ['--set', 'initial_state=disk', '--set', 'r1_au=5000'], expect: ['r1_au', 'r_out_au/10 = 1000 AU', 'got 5000'] },
  { args: ['--set', 'gamma_lbp=2'], expect: ['gamma_lbp', '[0, 2)', 'got 2'] },
  { args: ['--set', 't_core_k=1e400'], expect: ['t_core_k', '[5, 100] K', 'got Infinity'] },
  { args: ['--no-such-flag'], expect: ['unknown option', '--no-such-flag'] },
];

describe('disksweep model: bad input exits 2 and says what is wrong', () => {
  it.each(BAD_INPUTS)('$args', ({ args, expect: fragments }) => {
    const r = runCli(['model', ...args]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    for (const f of fragments) expect(r.stderr).toContain(f);
  });

  it('reports every problem of one call together', () => {
    const r = runCli(['model', '--set', 'alpha_active=5', '--set', 'theta=2']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('alpha_active');
    expect(r.stderr).toContain('theta');
  });
});

describe('disksweep model: good runs', () => {
  it('--json prints exactly one valid ModelResult', () => {
    const r = runCli(['model', '--json', '--set', 'initial_state=disk', '--set', 't_end_myr=0.5', '--set', 'n_cells=64']);
    expect(r.status).toBe(0);
    const parsed = modelResultSchema.parse(JSON.parse(r.stdout));
    expect(parsed.status).toBe('ok');
    expect(parsed.checkpoints.map((c) => c.t_myr)).toEqual([0.1, 0.3, 0.5]);
  });

  it('the summary shows the checkpoint table, budgets and a plot', () => {
    const r = runCli(['model', '--set', 'initial_state=disk', '--set', 't_end_myr=1', '--set', 'n_cells=64']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('status: ok');
    expect(r.stdout).toMatch(/t \[Myr\]\s+M_\* \[Msun\]/);
    expect(r.stdout).toContain('closure error');
    expect(r.stdout).toContain('* M_* [Msun]');
    expect(r.stdout).toContain('parameters changed from defaults: initial_state=disk n_cells=64 t_end_myr=1');
  });

  it('a model that ends numerically unfinished exits 3 and still prints its result', () => {
    const r = runCli(['model', '--json', '--set', 'max_steps=10', '--set', 'n_cells=32']);
    expect(r.status).toBe(3);
    expect(modelResultSchema.parse(JSON.parse(r.stdout)).status).toBe('step_limit');
  });

  it('--list names every parameter with its unit and range', () => {
    const r = runCli(['model', '--list']);
    expect(r.status).toBe(0);
    for (const name of PARAM_NAMES) expect(r.stdout).toContain(name);
    expect(r.stdout).toContain('alpha_active [1]  default 0.01; (0, 1]');
  });

  it('--help teaches with examples and exit codes', () => {
    const r = runCli(['model', '--help']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('Examples:');
    expect(r.stdout).toContain('Exit codes:');
  });

  it('a reader that closes the pipe early (`disksweep --help | head -c 10`) ends it quietly with exit 0', () => {
    // The shell pipeline itself, so the reader really closes after 10 bytes while the CLI is still writing.
    const r = spawnSync('bash', ['-c', `set -o pipefail; node "${CLI_PATH}" --help | head -c 10 >/dev/null`], { encoding: 'utf8' });
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
  });
});
