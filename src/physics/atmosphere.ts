/**
 * The atmosphere along the sun's path: relative and absolute air mass, surface pressure from site
 * elevation, and atmospheric refraction of the sun's altitude.
 *
 * Pure functions, degrees at the interface, radians inside.
 */
import { DEG } from './constants.ts';
import { requireInRange } from './errors.ts';

/**
 * Standard sea-level pressure [Pa] of the ISO 2533:1975 / U.S. Standard Atmosphere 1976
 * (101 325 Pa, exact by definition). Reference pressure of absolute air mass.
 */
export const STANDARD_SEA_LEVEL_PRESSURE_PA = 101325;

/** ISA sea-level temperature [K], troposphere lapse rate [K/m] and the barometric exponent g0·M/(R*·L). */
const ISA_SEA_LEVEL_TEMP_K = 288.15;
const ISA_LAPSE_RATE_K_PER_M = 0.0065;
/** g0·M/(R*·L) = 9.80665 · 0.0289644 / (8.31432 · 0.0065) (U.S. Standard Atmosphere 1976 constants). */
const ISA_BAROMETRIC_EXPONENT = (9.80665 * 0.0289644) / (8.31432 * ISA_LAPSE_RATE_K_PER_M);

/**
 * Relative optical air mass after Kasten & Young (1989).
 *
 * m = 1 / [cos z + 0.50572 · (96.07995° − z)^−1.6364], z the apparent (refraction-corrected)
 * solar zenith in degrees. Equivalent to the solar-altitude form
 * m = 1 / [sin β + 0.50572 · (6.07995° + β)^−1.6364] used by the ASHRAE clear-sky model.
 *
 * @param zenithDeg Apparent solar zenith angle [°], 0..180.
 * @returns Relative air mass [-], or NaN when the sun is below the horizon (z > 90°).
 * @throws InputError when zenithDeg is not a finite number in [0, 180].
 *
 * References:
 * [1] F. Kasten and A. T. Young, "Revised optical air mass tables and approximation formula,"
 *     Appl. Opt., vol. 28, no. 22, pp. 4735–4738, 1989, doi:10.1364/AO.28.004735.
 *
 * @example
 * relativeAirMassKastenYoung1989(60); // → 1.99429
 */
export function relativeAirMassKastenYoung1989(zenithDeg: number): number {
  requireInRange(zenithDeg, 0, 180, 'zenithDeg', '°');
  if (zenithDeg > 90) return NaN;
  return 1 / (Math.cos(zenithDeg * DEG) + 0.50572 * Math.pow(96.07995 - zenithDeg, -1.6364));
}

/**
 * Air pressure [Pa] at a site elevation, from the standard atmosphere's troposphere layer.
 *
 * p = p0 · (1 − L·h / T0)^(g0·M / (R*·L)), with p0 = 101 325 Pa, T0 = 288.15 K,
 * L = 0.0065 K/m, g0 = 9.80665 m/s², M = 0.0289644 kg/mol, R* = 8.31432 J/(mol·K)
 * (exponent 5.25588). Valid in the troposphere (below 11 km); the weather, not the formula, sets
 * the actual pressure on a given day (±3 %).
 *
 * @param elevationM Site elevation above mean sea level [m], −1000..11000.
 * @returns Standard-atmosphere pressure [Pa].
 * @throws InputError outside −1000..11000 m.
 *
 * References:
 * [1] NOAA, NASA, USAF, "U.S. Standard Atmosphere, 1976," U.S. Government Printing Office,
 *     Washington, D.C., NOAA-S/T 76-1562, 1976.
 * [2] ISO 2533:1975, "Standard Atmosphere," International Organization for Standardization, 1975.
 *
 * @example
 * pressureFromElevationPa(2000); // → 79 495 Pa
 */
export function pressureFromElevationPa(elevationM: number): number {
  requireInRange(elevationM, -1000, 11000, 'elevationM', 'm', { source: 'standard-atmosphere troposphere' });
  return (
    STANDARD_SEA_LEVEL_PRESSURE_PA *
    Math.pow(1 - (ISA_LAPSE_RATE_K_PER_M * elevationM) / ISA_SEA_LEVEL_TEMP_K, ISA_BAROMETRIC_EXPONENT)
  );
}

/**
 * Absolute (pressure-corrected) air mass.
 *
 * m_abs = m_rel · p / p0, p0 = 101 325 Pa.
 *
 * @param relativeAirMass Relative air mass [-], > 0; NaN (sun below the horizon) passes through.
 * @param pressurePa Site air pressure [Pa], 10 000..120 000.
 * @returns Absolute air mass [-] (NaN when relativeAirMass is NaN).
 * @throws InputError for a non-positive or infinite relative air mass or a pressure out of range.
 *
 * References:
 * [1] F. Kasten and A. T. Young, "Revised optical air mass tables and approximation formula,"
 *     Appl. Opt., vol. 28, no. 22, pp. 4735–4738, 1989, doi:10.1364/AO.28.004735.
 *
 * @example
 * absoluteAirMass(2, 79495); // → 1.569109
 */
export function absoluteAirMass(relativeAirMass: number, pressurePa: number): number {
  requireInRange(pressurePa, 10000, 120000, 'pressurePa', 'Pa');
  if (Number.isNaN(relativeAirMass)) return NaN;
  requireInRange(relativeAirMass, 0, Infinity, 'relativeAirMass', '', { exclusive: true });
  return (relativeAirMass * pressurePa) / STANDARD_SEA_LEVEL_PRESSURE_PA;
}

/** Angular radius of the sun [°] used by NREL SPA for the refraction cut-off (Reda & Andreas 2004). */
const SPA_SUN_RADIUS_DEG = 0.26667;
/** Refraction at the horizon [°] assumed by NREL SPA for the cut-off (Reda & Andreas 2004). */
const SPA_HORIZON_REFRACTION_DEG = 0.5667;

/**
 * Atmospheric refraction of the sun's altitude as computed by NREL SPA (Saemundsson's formula
 * scaled for pressure and temperature).
 *
 * Δe = (P / 1010) · (283 / (273 + T)) · 1.02 / (60 · tan(e0 + 10.3 / (e0 + 5.11))) [°],
 * applied only while e0 ≥ −(0.26667° + 0.5667°) (sun's upper limb at or above the refracted
 * horizon); 0 below.
 *
 * @param trueAltitudeDeg Topocentric solar altitude without refraction, e0 [°], −90..90.
 * @param pressureHpa Local air pressure [hPa], 100..1100.
 * @param tempC Local air temperature [°C], −90..60.
 * @returns Refraction correction Δe [°], to be added to e0.
 * @throws InputError for inputs out of range.
 *
 * References:
 * [1] I. Reda and A. Andreas, "Solar position algorithm for solar radiation applications,"
 *     Solar Energy, vol. 76, no. 5, pp. 577–589, 2004, eq. 42,
 *     doi:10.1016/j.solener.2003.12.003.
 * [2] T. Saemundsson, "Astronomical refraction," Sky and Telescope, vol. 72, p. 70, 1986.
 *
 * @example
 * atmosphericRefractionSpaDeg(39.872046, 820, 11); // → 0.016332
 */
export function atmosphericRefractionSpaDeg(trueAltitudeDeg: number, pressureHpa: number, tempC: number): number {
  requireInRange(trueAltitudeDeg, -90, 90, 'trueAltitudeDeg', '°');
  requireInRange(pressureHpa, 100, 1100, 'pressureHpa', 'hPa');
  requireInRange(tempC, -90, 60, 'tempC', '°C');
  return refractionSpaUncheckedDeg(trueAltitudeDeg, pressureHpa, tempC);
}

/** atmosphericRefractionSpaDeg without input checks, for callers that have validated already. */
export function refractionSpaUncheckedDeg(trueAltitudeDeg: number, pressureHpa: number, tempC: number): number {
  if (trueAltitudeDeg < -(SPA_SUN_RADIUS_DEG + SPA_HORIZON_REFRACTION_DEG)) return 0;
  const e0 = trueAltitudeDeg;
  return (
    ((pressureHpa / 1010) * (283 / (273 + tempC)) * 1.02) / (60 * Math.tan((e0 + 10.3 / (e0 + 5.11)) * DEG))
  );
}

