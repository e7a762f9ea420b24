/**
 * Physical and astronomical constants in cgs.
 *
 * Sources, one per line so a reviewer can check each against the table it came from:
 * - CODATA 2018 recommended values (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
 * - IAU 2015 Resolution B3 nominal solar values (Prša et al. 2016, AJ 152, 41).
 * - IAU 2012 Resolution B2 astronomical unit (exact, by definition).
 * - The Julian year (IAU, exactly 365.25 days of 86400 s).
 */

/** Newtonian constant of gravitation, cm^3 g^-1 s^-2 (CODATA 2018). */
export const G_CGS = 6.6743e-8;
/** Boltzmann constant, erg K^-1 (CODATA 2018, exact since the 2019 SI). */
export const K_BOLTZMANN_CGS = 1.380649e-16;
/** Electron mass, g (CODATA 2018). */
export const M_ELECTRON_CGS = 9.1093837015e-28;
/** Planck constant, erg s (CODATA 2018, exact since the 2019 SI). */
export const H_PLANCK_CGS = 6.62607015e-27;
/** Electron volt, erg (CODATA 2018, exact since the 2019 SI: 1.602176634e-19 J). */
export const ELECTRON_VOLT_CGS = 1.602176634e-12;
/** Stefan–Boltzmann constant, erg cm^-2 s^-1 K^-4 (CODATA 2018). */
export const SIGMA_SB_CGS = 5.670374419e-5;
/** Atomic mass constant u, g (CODATA 2018). */
export const ATOMIC_MASS_UNIT_CGS = 1.6605390666e-24;
/** Mass of a hydrogen atom taken as the standard atomic weight 1.00784 u (IUPAC, lower bound of the interval). */
export const M_HYDROGEN_CGS = 1.00784 * ATOMIC_MASS_UNIT_CGS;

/** Nominal solar mass parameter GM_sun, cm^3 s^-2 (IAU 2015 B3: 1.3271244e20 m^3 s^-2). */
export const GM_SUN_CGS = 1.3271244e26;
/** Solar mass, g, derived as GM_sun / G (IAU 2015 B3 recommends this route). */
export const M_SUN_CGS = GM_SUN_CGS / G_CGS;
/** Nominal solar luminosity, erg s^-1 (IAU 2015 B3: 3.828e26 W). */
export const L_SUN_CGS = 3.828e33;
/** Nominal solar radius, cm (IAU 2015 B3: 6.957e8 m). */
export const R_SUN_CGS = 6.957e10;

/** Astronomical unit, cm (IAU 2012 B2: 149 597 870 700 m exactly). */
export const AU_CGS = 1.495978707e13;
/** Julian year, s. */
export const YEAR_CGS = 365.25 * 86400;
/** One million Julian years, s. */
export const MYR_CGS = 1e6 * YEAR_CGS;
/** One day, s. */
export const DAY_CGS = 86400;

/**
 * Mean molecular weight of molecular gas of solar composition (H2 + He), μ = 2.34.
 * Common practice for protoplanetary disks (e.g. the value used throughout Hayashi 1981-type models).
 */
export const MEAN_MOLECULAR_WEIGHT = 2.34;
