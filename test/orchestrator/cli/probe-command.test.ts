/**
 * `disksweep probe` as a process: bad input exits 2 naming the input, the value and the allowed range (like
 * `disksweep model`); --json prints one object whose profile rows carry unit-suffixed fields; the table, the
 * plots and --help say what was computed and its grain-free validity limit.
 */
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';

const BAD: { args: string[]; expect: string[] }[] = [
  { args: ['--r-au', '-1'], expect: ['--r-au', '[0.001, 1000000] AU', 'got -1'] },
  { args: ['--r-au', 'far'], expect: ['--r-au', 'expected a number', '"far"'] },
  { args: ['--sigma-g-cm2', '0'], expect: ['--sigma-g-cm2', '(0, 100000000] g cm^-2', 'got 0'] },
  { args: ['--t-k', '1e5'], expect: ['--t-k', '[3, 10000] K', 'got 100000'] },
  { args: ['--m-star-msun', '50'], expect: ['--m-star-msun', '[0.01, 10] M_sun', 'got 50'] },
  { args: ['--set', 'zeta_cr_s=-1e-17'], expect: ['zeta_cr_s', '[0, 1e-13] s^-1', 'got -1e-17'] },
  { args: ['--set', 'mri_criterion=hall'], expect: ['mri_criterion', '"reynolds", "elsasser"', '"hall"'] },
  { args: ['--set', 'n_z=3'], expect: ['n_z', 'an integer in [4, 4096]', 'got 3'] },
  { args: ['--set', 'reynold_crit=10'], expect: ['reynold_crit', 'unknown parameter', 'did you mean reynolds_crit'] },
  { args: ['--no-such-flag'], expect: ['unknown option', '--no-such-flag'] },
];

describe('disksweep probe: bad input exits 2 and says what is wrong', () => {
  it.each(BAD)('$args', ({ args, expect: fragments }) => {
    const r = runCli(['probe', ...args]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    for (const f of fragments) expect(r.stderr).toContain(f);
  });

  it('reports every problem of the flags together', () => {
    const r = runCli(['probe', '--r-au', '-1', '--t-k', '1', '--set', 'reynolds_crit=0']);
    expect(r.status).toBe(2);
    for (const f of ['--r-au', '--t-k', 'reynolds_crit']) expect(r.stderr).toContain(f);
  });
});

describe('disksweep probe: good runs', () => {
  it('--json prints one object with unit-suffixed profile rows and the active column', () => {
    const r = runCli(['probe', '--json', '--r-au', '1', '--sigma-g-cm2', '1700', '--t-k', '280', '--set', 'n_z=24']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout) as {
      profile: Record<string, number | boolean>[];
      sigma_active_g_cm2: number;
      sigma_active_face_g_cm2: number;
      midplane_dead: boolean;
      inputs: Record<string, number>;
    };
    expect(out.inputs).toEqual({ r_au: 1, sigma_g_cm2: 1700, t_k: 280, m_star_msun: 1, t_myr: 0 });
    expect(out.profile).toHaveLength(24);
    expect(Object.keys(out.profile[0]).sort()).toEqual(
      ['active', 'activity', 'column_g_cm2', 'eta_cm2_s', 'n_h2_cm3', 'rho_g_cm3', 'x_e', 'z_au', 'z_over_h', 'zeta_cr_s', 'zeta_r_s', 'zeta_s', 'zeta_x_s'].sort(),
    );
    // From the face to the midplane: the column grows to Σ/2 and the height falls to 0.
    expect(out.profile[0].column_g_cm2).toBeCloseTo(1e-4, 12);
    expect(out.profile[23].column_g_cm2).toBe(850);
    expect(out.profile[23].z_au).toBe(0);
    // The default physics (X-rays, cosmic rays, 26Al, Re_crit = 100) leaves a dead midplane at 1 AU in the MMSN.
    expect(out.midplane_dead).toBe(true);
    expect(out.sigma_active_g_cm2).toBeGreaterThan(0);
    expect(out.sigma_active_g_cm2).toBe(2 * out.sigma_active_face_g_cm2);
    const lastActive = out.profile.filter((p) => p.active).at(-1)?.column_g_cm2 as number;
    expect(lastActive).toBeLessThanOrEqual(out.sigma_active_face_g_cm2);
  });

  it('the table shows the profile, the active column and two plots', () => {
    const r = runCli(['probe', '--r-au', '5', '--sigma-g-cm2', '152', '--t-k', '125']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/z \[AU\]\s+z\/H\s+column \[g cm\^-2\]/);
    expect(r.stdout).toContain('ionization active column:');
    expect(r.stdout).toContain("Sigma_a the model's transport uses:");
    expect(r.stdout).toContain('x zeta_X');
    expect(r.stdout).toContain('o Re');
    expect(r.stdout).toContain('Grain-free chemistry');
  });

  it('--help explains the thermal switch, the validity limit and gives examples', () => {
    const r = runCli(['probe', '--help']);
    expect(r.status).toBe(0);
    for (const f of ['Examples:', 'Exit codes:', 'grain-free', '"saha"', '"threshold"', '--r-au', '--sigma-g-cm2', '--t-k']) expect(r.stdout).toContain(f);
  });
});
