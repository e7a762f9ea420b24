/**
 * The inputs of `disksweep probe` besides the model parameters (which come through `--set`): where the column
 * is and what it holds. Described like the model parameters (shared/model-params.ts), so errors read the same:
 * the name, the allowed range with its unit, and the value received.
 */
import { z } from 'zod';
import { DisksweepError } from './errors.js';
import { issuesToDetails, numberParamSchema, type NumberParam } from './model-params.js';

const num = (p: Omit<NumberParam, 'kind'>): NumberParam => ({ kind: 'number', ...p });

export const PROBE_INPUTS = {
  r_au: num({ unit: 'AU', default: 1, min: 1e-3, max: 1e6, description: 'radius of the column' }),
  sigma_g_cm2: num({
    unit: 'g cm^-2', default: 1700, min: 0, max: 1e8, minExclusive: true,
    description: 'surface density (both faces); the default is the minimum-mass solar nebula at 1 AU (Hayashi 1981)',
  }),
  t_k: num({ unit: 'K', default: 280, min: 3, max: 1e4, description: 'temperature of the (vertically isothermal) column' }),
  m_star_msun: num({ unit: 'M_sun', default: 1, min: 0.01, max: 10, description: 'stellar mass (sets Omega)' }),
  t_myr: num({ unit: 'Myr', default: 0, min: 0, max: 100, description: 'time since collapse onset (26Al decay)' }),
} as const;

export type ProbeInputName = keyof typeof PROBE_INPUTS;
export const PROBE_INPUT_NAMES = Object.keys(PROBE_INPUTS) as ProbeInputName[];
export type ProbeInputs = Record<ProbeInputName, number>;

const probeSchema = z
  .object(Object.fromEntries(PROBE_INPUT_NAMES.map((n) => [n, numberParamSchema(PROBE_INPUTS[n])])) as Record<ProbeInputName, ReturnType<typeof numberParamSchema>>)
  .strict();

/** Validate the probe inputs; each problem is one detail line naming the input, the range and the value. */
export function parseProbeInputs(raw: unknown): ProbeInputs {
  const r = probeSchema.safeParse(raw);
  if (!r.success) {
    throw new DisksweepError('input/invalid-parameter', 'invalid probe inputs', { details: issuesToDetails(r.error) });
  }
  return r.data as ProbeInputs;
}
