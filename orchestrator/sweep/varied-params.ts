/**
 * Which parameters a stored sweep varies and how its spec samples them (from the stored spec's dimensions):
 * `log` for log ranges, `linear` for linear ranges, `values` for explicit lists.
 */
import { parseSpecText } from '../spec/load-spec.js';
import type { SweepRecord } from '../store/index.js';

export interface VariedParam {
  readonly name: string;
  readonly kind: 'log' | 'linear' | 'values';
}

export function variedParams(sweep: SweepRecord): VariedParam[] {
  return parseSpecText(sweep.specJson, `sweep ${sweep.name}`, 'json').dimensions.map((d) => ({ name: d.name, kind: d.kind }));
}
