/** The --target syntax: names, arguments, defaults, ranges, and the errors a researcher sees. */
import { describe, expect, it } from 'vitest';
import { DisksweepError } from '../../../shared/errors.js';
import { parseTarget } from '../../../orchestrator/query/targets.js';

describe('parseTarget', () => {
  it.each([
    ['solar-split', 'solar-split(f_m=0.99,f_j=0.02,t_max_myr=3)'],
    ['solar-split(f_m=0.995, t_max_myr=2)', 'solar-split(f_m=0.995,f_j=0.02,t_max_myr=2)'],
    ['accretion-window(at_myr=1,min=1e-9,max=1e-7)', 'accretion-window(at_myr=1,min=1e-9,max=1e-7,averaged=no)'],
    ['accretion-window(averaged=yes)', 'accretion-window(at_myr=1,min=1e-9,max=1e-7,averaged=yes)'],
    ['dead-zone', 'dead-zone(at_myr=1,present=yes)'],
    ['dead-zone(present=no,at_myr=0.5)', 'dead-zone(at_myr=0.5,present=no)'],
    ['dead-zone(r_out_min_au=5,r_out_max_au=30)', 'dead-zone(at_myr=1,present=yes,r_out_min_au=5,r_out_max_au=30)'],
    ['disk-fraction(max=0.05)', 'disk-fraction(at_myr=1,min=0,max=0.05)'],
    ['lifetime(min_myr=2)', 'lifetime(min_myr=2,max_myr=10)'],
    ['  solar-split()  ', 'solar-split(f_m=0.99,f_j=0.02,t_max_myr=3)'],
  ])('%s', (text, canonical) => {
    expect(parseTarget(text).text).toBe(canonical);
  });

  it.each([
    ['solar-splt', /unknown target "solar-splt" \(did you mean solar-split\?\)/],
    ['solar-split(f_mm=0.9)', /has no argument "f_mm" \(did you mean f_m\?\)/],
    ['solar-split(f_m=1.5)', /f_m must be a number > 0 and <= 1 \(1\) \(got "1.5"\)/],
    ['solar-split(f_m=0)', /f_m must be a number > 0/],
    ['solar-split(t_max_myr=abc)', /t_max_myr must be a number/],
    ['solar-split(f_m=0.9,f_m=0.8)', /given twice/],
    ['solar-split(f_m)', /expected arg=value/],
    ['solar-split(f_m=0.9', /write a target as name or name\(arg=value/],
    ['accretion-window(min=1e-7,max=1e-9)', /min \(1e-7\) is above max \(1e-9\)/],
    ['accretion-window(averaged=maybe)', /averaged takes yes or no/],
    ['dead-zone(present=no,r_out_max_au=3)', /present=no takes no edge or width bounds/],
    ["solar-split(f_m=0.9'; DROP TABLE results; --)", /expected arg=value/],
    ["solar-split(f_m=0.9';DROP)", /f_m must be a number/],
  ])('%s is refused', (text, message) => {
    let error: unknown;
    try {
      parseTarget(text);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(DisksweepError);
    expect((error as DisksweepError).code).toBe('input/invalid-target');
    expect((error as DisksweepError).message).toMatch(message);
  });
});
