/**
 * `disksweep probe`: the vertical ionization structure and the MRI-active column at one radius, as a table
 * with small plots, or one JSON object (--json). Inputs are validated like `disksweep model`: every problem of
 * one call is reported together, naming the input, the value and the allowed range, and the command exits 2
 * before anything runs.
 */
import { Command } from 'commander';
import { DisksweepError } from '../../shared/errors.js';
import { parseModelParams } from '../../shared/model-params.js';
import { PROBE_INPUTS, PROBE_INPUT_NAMES, parseProbeInputs, type ProbeInputName } from '../../shared/probe-params.js';
import { runProbe } from '../../worker/probe.js';
import { paramsFromFlags, parseValue } from './param-flags.js';
import { formatProbeReport } from './probe-report.js';

const PROBE_HELP = `
Prints, from the disk surface down to the midplane at one radius: height, column from the face, density,
ionization rate by source (stellar X-rays, cosmic rays, radionuclides), electron fraction x_e, Ohmic
diffusivity eta, the activity number (magnetic Reynolds or Ohmic Elsasser number) and whether the gas is
MRI-active; then the active column Sigma_a per face and in total, and the Sigma_a the disk model's layered
transport would use for this column. The ionization parameters are the model's (see disksweep model --list):
lx_erg_s, xray_spectrum, zeta_cr_s, zeta_al26_s, zeta_k40_s, sigma_fuv_face_g_cm2, x_e_fuv, ion_chemistry, x_metal,
thermal_ionization, t_mri_k, t_mri_halfwidth_k, mri_criterion, reynolds_crit, elsasser_crit, beta_midplane,
n_z, sigma_ion_floor_g_cm2.

Examples:
  disksweep probe                                          minimum-mass solar nebula at 1 AU (1700 g/cm^2, 280 K)
  disksweep probe --r-au 5 --sigma-g-cm2 152 --t-k 125
  disksweep probe --set lx_erg_s=0 --set zeta_al26_s=0 --set reynolds_crit=1    cosmic rays only
  disksweep probe --set mri_criterion=elsasser --set beta_midplane=1e3 --json > column.json
  disksweep probe --r-au 0.1 --sigma-g-cm2 5e4 --t-k 1200 --set thermal_ionization=saha

Thermal ionization: "threshold" (the default) makes the whole column active above t_mri_k, blended over
+/- t_mri_halfwidth_k so alpha does not jump (here the switch reads --t-k; in a model it reads, by default, the
temperature the column would have if it were dead: see activity_temperature in disksweep model --list); "saha" instead computes thermally ionized potassium and sodium
(Saha equation, NIST ionization energies, Asplund et al. 2009 abundances) and adds their electrons to the
chemistry by charge neutrality; "none" leaves thermal ionization out.

Validity limit: the chemistry is grain-free (molecular ions, optionally metal atoms, and alkali metals).
Dust grains sweep up electrons and ions; with even a small abundance of small grains x_e is far lower and
active layers are far thinner than shown here.

Exit codes:
  0  success
  1  failure while running
  2  bad input: an unknown parameter, a wrong type or a value outside its range; nothing was run`;

/** Flag name of a probe input: r_au -> --r-au. */
const flagOf = (name: ProbeInputName): string => `--${name.replace(/_/g, '-')}`;
/** Commander's camel-case key of that flag: --sigma-g-cm2 -> sigmaGCm2. */
const keyOf = (name: ProbeInputName): string => name.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());

type ProbeOptions = { set: string[]; json?: boolean } & Record<string, string | string[] | boolean | undefined>;

/** Read the probe flags and the --set parameters; every problem of the call goes into one error. */
export function probeInputsFromOptions(opts: ProbeOptions): { params: ReturnType<typeof parseModelParams>; inputs: ReturnType<typeof parseProbeInputs> } {
  const problems: string[] = [];
  let code: 'input/invalid-parameter' | 'input/unknown-parameter' = 'input/invalid-parameter';
  const collect = (e: unknown): void => {
    if (!(e instanceof DisksweepError)) throw e;
    if (e.code === 'input/unknown-parameter') code = e.code;
    problems.push(...e.details);
  };
  const raw: Record<string, unknown> = {};
  for (const name of PROBE_INPUT_NAMES) {
    const text = opts[keyOf(name)];
    if (typeof text !== 'string') continue;
    const { value, problem } = parseValue(flagOf(name), PROBE_INPUTS[name], text.trim());
    if (problem !== undefined) problems.push(problem);
    else raw[name] = value;
  }
  let params: ReturnType<typeof parseModelParams> | undefined;
  let inputs: ReturnType<typeof parseProbeInputs> | undefined;
  try {
    params = parseModelParams(paramsFromFlags(opts.set));
  } catch (e) {
    collect(e);
  }
  try {
    inputs = parseProbeInputs(raw);
  } catch (e) {
    if (!(e instanceof DisksweepError)) throw e;
    // Name the flag the user typed: "r_au: must be ..." -> "--r-au: must be ...".
    problems.push(...e.details.map((d) => d.replace(/^([a-z0-9_]+):/, (_, n: string) => `${flagOf(n as ProbeInputName)}:`)));
  }
  if (problems.length > 0 || params === undefined || inputs === undefined) {
    throw new DisksweepError(code, 'invalid probe input; run `disksweep probe --help` and `disksweep model --list`', { details: problems });
  }
  return { params, inputs };
}

export function probeCommand(): Command {
  const cmd = new Command('probe').description('print the vertical ionization structure and MRI-active column at one radius (or --json)');
  for (const name of PROBE_INPUT_NAMES) {
    const p = PROBE_INPUTS[name];
    cmd.option(`${flagOf(name)} <value>`, `${p.description} [${p.unit}], default ${p.default}`);
  }
  return cmd
    .option('-s, --set <name=value>', 'set a model parameter (repeatable); see disksweep model --list', (v: string, acc: string[]) => [...acc, v], [] as string[])
    .option('--json', 'print exactly one JSON object on stdout')
    .addHelpText('after', PROBE_HELP)
    .exitOverride()
    .action((opts: ProbeOptions) => {
      const { params, inputs } = probeInputsFromOptions(opts);
      const result = runProbe(params, inputs);
      process.stdout.write((opts.json === true ? JSON.stringify(result) : formatProbeReport(result)) + '\n');
    });
}
