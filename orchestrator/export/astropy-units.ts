/**
 * Our unit strings (the parameter table and the output registry) in astropy's string form, for the ECSV
 * header, so `Table.read(..., format='ascii.ecsv')` gives columns with units (`astropy.units.Unit(s)` parses
 * every right-hand side; the generic format writes products with spaces, powers as trailing digits and
 * negative powers after " / "). This table is the one place that knows the mapping; a unit missing here is a
 * programming error, and a test checks every registry unit has an entry.
 */
import { DisksweepError } from '../../shared/errors.js';

/** `null`: dimensionless (ECSV leaves the unit out). */
const ASTROPY_UNITS: Readonly<Record<string, string | null>> = {
  '1': null,
  AU: 'AU',
  K: 'K',
  Myr: 'Myr',
  d: 'd',
  M_sun: 'solMass',
  'M_sun/yr': 'solMass / yr',
  L_sun: 'solLum',
  R_sun: 'solRad',
  'erg s^-1': 'erg / s',
  'g cm^-2': 'g / cm2',
  'g cm^2 s^-1': 'g cm2 / s',
  'cm^2 g^-1': 'cm2 / g',
  's^-1': '1 / s',
  'cm^-2': '1 / cm2',
  yr: 'yr',
};

export function astropyUnit(unit: string): string | null {
  const u = ASTROPY_UNITS[unit];
  if (u === undefined) {
    throw new DisksweepError('internal/unexpected', `no astropy spelling for unit "${unit}": add it to orchestrator/export/astropy-units.ts`);
  }
  return u;
}
